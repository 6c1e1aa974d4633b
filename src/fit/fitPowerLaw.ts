import { InputError } from '../errors.js';
import type { Estimate } from './FitReport.js';
import { studentQuantile } from './compareDirections.js';

export interface PowerLawOptions {
  /** Confidence level of the intervals, default 0.95. */
  level?: number;
}

/** |rate| = a·setting^b fitted on logs. */
export interface PowerLawFit {
  /** Prefactor a, in deg/s per (setting unit)^b; ci from the interval on ln a. */
  a: { value: number; ci: [number, number] };
  /** Exponent b with its standard error and t interval on n − 2 df (NaN when n = 2). */
  b: Estimate;
  ln_a: { value: number; se: number };
  n: number;
  /** Coefficient of determination on the log scale. */
  r2_log: number;
  /** Residual standard deviation of ln|rate|. */
  residual_sd_log: number;
  method: string;
}

/**
 * Power law |ω| = a·s^b by ordinary least squares of ln|ω| on ln s (each point weighted equally).
 * @param setting_values settings s, all > 0 (e.g. pump flow in L/min)
 * @param rate_abs_deg_s |ω| in deg/s, all > 0
 */
export function fitPowerLaw(setting_values: ArrayLike<number>, rate_abs_deg_s: ArrayLike<number>, options: PowerLawOptions = {}): PowerLawFit {
  const level = options.level ?? 0.95;
  const n = setting_values.length;
  if (rate_abs_deg_s.length !== n) throw new InputError(`A power-law fit got ${n} settings but ${rate_abs_deg_s.length} rates; give one rate per setting.`);
  if (n < 2) throw new InputError(`A power-law fit needs at least two points, got ${n}.`);
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const s = setting_values[i]!;
    const r = rate_abs_deg_s[i]!;
    if (!(s > 0) || !(r > 0) || !Number.isFinite(s) || !Number.isFinite(r)) {
      throw new InputError(`A power-law fit needs positive settings and rates; point ${i + 1} has setting ${s} and |rate| ${r}.`);
    }
    x[i] = Math.log(s);
    y[i] = Math.log(r);
  }
  let mx = 0;
  let my = 0;
  for (let i = 0; i < n; i++) {
    mx += x[i]!;
    my += y[i]!;
  }
  mx /= n;
  my /= n;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    const dx = x[i]! - mx;
    const dy = y[i]! - my;
    sxx += dx * dx;
    sxy += dx * dy;
    syy += dy * dy;
  }
  if (!(sxx > 0)) throw new InputError('A power-law fit needs at least two different settings.');
  const b = sxy / sxx;
  const lnA = my - b * mx;
  let rss = 0;
  for (let i = 0; i < n; i++) rss += (y[i]! - lnA - b * x[i]!) ** 2;
  const df = n - 2;
  const s2 = df > 0 ? rss / df : Number.NaN;
  const seB = Math.sqrt(s2 / sxx);
  const seLnA = Math.sqrt(s2 * (1 / n + (mx * mx) / sxx));
  const t = df > 0 ? studentQuantile(1 - (1 - level) / 2, df) : Number.NaN;
  return {
    a: { value: Math.exp(lnA), ci: [Math.exp(lnA - t * seLnA), Math.exp(lnA + t * seLnA)] },
    b: { value: b, se: seB, ci: [b - t * seB, b + t * seB], level },
    ln_a: { value: lnA, se: seLnA },
    n,
    r2_log: syy > 0 ? 1 - rss / syy : 1,
    residual_sd_log: Math.sqrt(s2),
    method: `Ordinary least squares of ln|rate| on ln(setting), ${n} runs, each weighted equally; t interval on ${df} df.`,
  };
}
