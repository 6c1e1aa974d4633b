import { decimalsToShow } from '../decimalsToShow.js';

/** Decimal places that show a standard error to two significant digits (0–6). */
export function decimalsFor(se: number): number {
  return decimalsToShow(se, 6, 3);
}

/** A number with fixed decimals, a true minus sign, '—' for NaN and ±∞ spelled out. */
export function formatFixed(value: number | null | undefined, decimals: number): string {
  if (typeof value !== 'number' || Number.isNaN(value)) return '—';
  if (!Number.isFinite(value)) return value > 0 ? '+∞' : '−∞';
  const s = value.toFixed(decimals);
  return s.startsWith('-') ? `−${s.slice(1)}` : s;
}

/** value [lo, hi] with decimals chosen from the standard error. */
export function formatInterval(value: number, ci: readonly [number, number] | null | undefined, se: number): string {
  const d = decimalsFor(se);
  const [lo, hi] = Array.isArray(ci) ? ci : [Number.NaN, Number.NaN];
  return `${formatFixed(value, d)} [${formatFixed(lo, d)}, ${formatFixed(hi, d)}]`;
}

/** A rate in deg/s with its interval, and the same in rpm (1 rpm = 6 deg/s). */
export function formatRate(value_deg_s: number, ci_deg_s: readonly [number, number] | null | undefined, se_deg_s: number): { deg_s: string; rpm: string } {
  const ci: [number, number] = Array.isArray(ci_deg_s) ? [ci_deg_s[0], ci_deg_s[1]] : [Number.NaN, Number.NaN];
  return {
    deg_s: formatInterval(value_deg_s, ci, se_deg_s),
    rpm: formatInterval(value_deg_s / 6, [ci[0] / 6, ci[1] / 6], se_deg_s / 6),
  };
}

/** A p-value: three significant digits, '< 0.001' below that. */
export function formatP(p: number | null | undefined): string {
  if (typeof p !== 'number' || Number.isNaN(p)) return '—';
  if (p < 0.001) return '< 0.001';
  return p.toPrecision(2).replace(/^0\.(\d)$/, '0.$10');
}

/** A number to n significant digits with a true minus sign. */
export function formatSig(value: number | null | undefined, digits = 3): string {
  if (typeof value !== 'number' || Number.isNaN(value)) return '—';
  if (!Number.isFinite(value)) return value > 0 ? '+∞' : '−∞';
  const s = Math.abs(value) >= 1e5 || (Math.abs(value) < 1e-3 && value !== 0) ? value.toExponential(digits - 1) : String(Number(value.toPrecision(digits)));
  return s.startsWith('-') ? `−${s.slice(1)}` : s;
}

/** A model's name for people: steady, spin-up, coast-down. */
export function modelLabel(model: string): string {
  return model === 'spinup' ? 'spin-up' : model === 'spindown' ? 'coast-down' : model;
}
