import type { FitReport } from '../fit/FitReport.js';

/** The fitted model evaluated at the data times: angle (deg) and rate (deg/s). */
export interface ModelCurve {
  angle_deg: Float64Array;
  rate_deg_s: Float64Array;
  /** A sentence saying how the curve was drawn. */
  how: string;
}

/**
 * Evaluates the model of fit.json at the data times. Steady: θ = θ₀ + ω·t. Spin-up: at rest until t₀, then
 * ω(t) = ω∞(1 − e^{−(t−t₀)/τ}). Coast-down: dω/dt = −c·sgn ω − k·ω from ω₀ at the window start until it stops.
 * fit.json does not carry the angle offset of the steady and coast-down models, so θ₀ is the least-squares
 * offset over the fit window given the fitted rate terms. Returns null when the fit has no parameters.
 * @param t_s frame times, s; angle_deg tracked angle, deg (NaN when lost)
 */
export function modelCurve(fit: FitReport, t_s: Float64Array, angle_deg: Float64Array): ModelCurve | null {
  const n = t_s.length;
  const shape = new Float64Array(n);
  const rate = new Float64Array(n);
  let offsetGiven: number | null = null;
  let how: string;
  if (fit.model === 'steady' && fit.steady) {
    const w = fit.steady.rate_deg_s.value;
    const t0 = fit.window_s[0];
    for (let i = 0; i < n; i++) {
      shape[i] = w * (t_s[i]! - t0);
      rate[i] = w;
    }
    how = 'Straight line with the fitted steady rate; its offset is the least-squares value over the fit window.';
  } else if (fit.model === 'spinup' && fit.spinup) {
    const winf = fit.spinup.terminal_rate_deg_s.value;
    const tau = fit.spinup.tau_s.value;
    const onset = fit.spinup.onset_s.value;
    for (let i = 0; i < n; i++) {
      const u = t_s[i]! - onset;
      if (u <= 0) continue;
      shape[i] = winf * (u + tau * Math.expm1(-u / tau));
      rate[i] = -winf * Math.expm1(-u / tau);
    }
    offsetGiven = fit.spinup.theta0_deg.value;
    how = 'Spin-up model with the fitted onset, time constant and terminal rate.';
  } else if (fit.model === 'spindown' && fit.spindown) {
    const w0 = fit.spindown.initial_rate_deg_s.value;
    const c = fit.spindown.coulomb_deg_s2.value;
    const k = fit.spindown.viscous_per_s.value;
    const sign = Math.sign(w0) || 1;
    const a0 = Math.abs(w0);
    const t0 = fit.window_s[0];
    const stop = c > 0 ? (k > 0 ? Math.log1p((k * a0) / c) / k : a0 / c) : Infinity;
    const angleAt = (u: number): number => (k > 0 ? ((a0 + c / k) * -Math.expm1(-k * u)) / k - (c / k) * u : a0 * u - 0.5 * c * u * u);
    const rateAt = (u: number): number => (k > 0 ? (a0 + c / k) * Math.exp(-k * u) - c / k : a0 - c * u);
    const stopAngle = Number.isFinite(stop) ? angleAt(stop) : 0;
    for (let i = 0; i < n; i++) {
      const u = Math.max(0, t_s[i]! - t0);
      if (u >= stop) {
        shape[i] = sign * stopAngle;
        rate[i] = 0;
      } else {
        shape[i] = sign * angleAt(u);
        rate[i] = sign * rateAt(u);
      }
    }
    how = 'Coast-down model (dry plus viscous friction) from the fitted initial rate; its offset is the least-squares value over the fit window.';
  } else return null;
  let offset = offsetGiven;
  if (offset === null) {
    let sum = 0;
    let count = 0;
    for (let i = 0; i < n; i++) {
      if (t_s[i]! < fit.window_s[0] || t_s[i]! > fit.window_s[1] || !Number.isFinite(angle_deg[i]!)) continue;
      sum += angle_deg[i]! - shape[i]!;
      count++;
    }
    offset = count > 0 ? sum / count : 0;
  }
  const angle = new Float64Array(n);
  for (let i = 0; i < n; i++) angle[i] = shape[i]! + offset;
  return { angle_deg: angle, rate_deg_s: rate, how };
}
