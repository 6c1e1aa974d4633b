/**
 * Spin-up from rest to a terminal rate with a first-order lag (a constant drive against viscous drag):
 *   θ(t) = θ0                                            for t ≤ t0
 *   θ(t) = θ0 + ω∞·[(t − t0) − τ·(1 − e^(−(t − t0)/τ))]     for t > t0
 * so the rate is ω(t) = ω∞·(1 − e^(−(t − t0)/τ)) after the onset t0.
 * Angles deg (counterclockwise positive as displayed), times s, ω∞ deg/s, τ s.
 * Fitted to the unwrapped angle by Levenberg–Marquardt (τ on a log scale so it stays positive), starting
 * from a grid over (t0, τ) on which θ0 and ω∞ enter linearly and are solved exactly (variable projection in
 * the sense of Golub & Pereyra 1973, used here only for start values); autocorrelation-aware intervals by
 * least squares with autoregressive errors and a bootstrap-t calibration (see fitDynamicsCurve.ts).
 */
import { InputError } from '../errors.js';
import { DynamicsFitError } from './DynamicsFitError.js';
import { dynamicsWindow } from './checkDynamicsSeries.js';
import type { SpinUpResult } from './FitReport.js';
import type { ModelFit } from './ModelFit.js';
import { type CurveModel, type DynamicsCurveOptions, fitDynamicsCurve } from './fitDynamicsCurve.js';
import { estimateFromCurve } from './curveEstimate.js';
import { batchMeansEffectiveSize } from './batchMeansEffectiveSize.js';

/** Spin-up parameters: angle at rest θ0 (deg), onset t0 (s, same clock as the data), terminal rate ω∞ (deg/s), time constant τ (s). */
export interface SpinUpParams {
  theta0_deg: number;
  onset_s: number;
  terminal_rate_deg_s: number;
  tau_s: number;
}

export interface SpinUpOptions extends DynamicsCurveOptions {
  /** Confidence level of the intervals. Default 0.95. */
  level?: number;
}

/** Angle (deg) of the spin-up model at time t (s). */
export function spinUpAngle(params: SpinUpParams): (t_s: number) => number {
  const { theta0_deg, onset_s, terminal_rate_deg_s, tau_s } = params;
  return (t_s) => {
    const d = t_s - onset_s;
    if (!(d > 0)) return theta0_deg;
    return theta0_deg + terminal_rate_deg_s * (d + tau_s * Math.expm1(-d / tau_s));
  };
}

/** Rate (deg/s) of the spin-up model at time t (s). */
export function spinUpRate(params: SpinUpParams): (t_s: number) => number {
  const { onset_s, terminal_rate_deg_s, tau_s } = params;
  return (t_s) => {
    const d = t_s - onset_s;
    if (!(d > 0)) return 0;
    return -terminal_rate_deg_s * Math.expm1(-d / tau_s);
  };
}

const NO_SPIN_UP =
  'The window shows no spin-up: the best spin-up curve reaches its terminal rate before the window starts; use the steady model or a window that includes the start.';

/** True when the spin-up with onset t0 (s, relative to the window start) and time constant τ (s) is over (5τ after onset) before the window starts. */
function spinUpOverBeforeWindow(onset_s: number, tau_s: number): boolean {
  return onset_s + 5 * tau_s < 0;
}

/** Internal parameter vector p = [θ0, t0 (relative to the window start), ω∞, ln τ]. */
const spinUpCurve: CurveModel = {
  k: 4,
  outsideWindow: (p) => (spinUpOverBeforeWindow(p[1]!, Math.exp(p[3]!)) ? NO_SPIN_UP : null),
  evaluate: (p, t, grad) => {
    const theta0 = p[0]!;
    const d = t - p[1]!;
    const omega = p[2]!;
    const tau = Math.exp(p[3]!);
    grad[0] = 1;
    if (!(d > 0)) {
      grad[1] = 0;
      grad[2] = 0;
      grad[3] = 0;
      return theta0;
    }
    const x = d / tau;
    const oneMinusE = -Math.expm1(-x);
    const shape = d - tau * oneMinusE;
    grad[1] = -omega * oneMinusE; // ∂θ/∂t0, continuous at the onset
    grad[2] = shape;
    grad[3] = omega * (d * (1 - oneMinusE) - tau * oneMinusE); // τ·∂θ/∂τ
    return theta0 + omega * shape;
  },
};

/** Start values: grid over (t0, τ) with θ0, ω∞ solved by linear least squares; returns the best few. */
function spinUpStarts(t: Float64Array, y: Float64Array, count: number): Float64Array[] {
  const n = t.length;
  const span = t[n - 1]! - t[0]!;
  const candidates: { rss: number; p: Float64Array }[] = [];
  const nOnset = 24;
  const nTau = 20;
  const g = new Float64Array(n);
  for (let a = 0; a < nOnset; a++) {
    const t0 = t[0]! - 0.2 * span + (a / (nOnset - 1)) * 1.05 * span;
    for (let b = 0; b < nTau; b++) {
      const tau = span * 10 ** (-2.7 + (3 * b) / (nTau - 1));
      let sg = 0;
      let sgg = 0;
      let sy = 0;
      let sgy = 0;
      for (let i = 0; i < n; i++) {
        const d = t[i]! - t0;
        const gi = d > 0 ? d + tau * Math.expm1(-d / tau) : 0;
        g[i] = gi;
        sg += gi;
        sgg += gi * gi;
        sy += y[i]!;
        sgy += gi * y[i]!;
      }
      const det = n * sgg - sg * sg;
      if (!(det > 1e-12 * n * sgg)) continue;
      const omega = (n * sgy - sg * sy) / det;
      const theta0 = (sy - omega * sg) / n;
      let rss = 0;
      for (let i = 0; i < n; i++) rss += (y[i]! - theta0 - omega * g[i]!) ** 2;
      candidates.push({ rss, p: Float64Array.of(theta0, t0, omega, Math.log(tau)) });
    }
  }
  candidates.sort((u, v) => u.rss - v.rss);
  return candidates.slice(0, count).map((c) => c.p);
}

/**
 * Fits the spin-up model to an unwrapped angle series.
 * @param t_s       frame times, s, strictly increasing
 * @param angle_deg unwrapped angle, deg, counterclockwise positive as displayed
 */
export function fitSpinUp(t_s: Float64Array, angle_deg: Float64Array, options: SpinUpOptions = {}): ModelFit<SpinUpResult> {
  const level = options.level ?? 0.95;
  const { tRef, t, thin } = dynamicsWindow(t_s, angle_deg, 'spin-up', options.thinnedPoints ?? 1500);
  const n = t.length;
  const starts = spinUpStarts(thin.t, thin.y, 3);
  if (starts.length === 0) throw new InputError('The spin-up fit found no usable start values; check that the angle series is not constant.');
  const out = fitDynamicsCurve(spinUpCurve, t, angle_deg, starts, options);
  const p = out.params;
  const params: SpinUpParams = { theta0_deg: p[0]!, onset_s: p[1]! + tRef, terminal_rate_deg_s: p[2]!, tau_s: Math.exp(p[3]!) };
  const est = (j: number, map: (v: number) => number = (v) => v) => estimateFromCurve(out, j, level, map);
  const terminal = est(2);
  const result: SpinUpResult = {
    onset_s: est(1, (v) => v + tRef),
    terminal_rate_deg_s: terminal,
    terminal_rate_rpm: { value: terminal.value / 6, se: terminal.se / 6, ci: [terminal.ci[0] / 6, terminal.ci[1] / 6], level },
    tau_s: est(3, Math.exp),
    theta0_deg: est(0),
  };

  if (spinUpOverBeforeWindow(p[1]!, params.tau_s)) throw new DynamicsFitError(NO_SPIN_UP);
  if (![result.onset_s, result.terminal_rate_deg_s, result.tau_s, result.theta0_deg].every((e) => Number.isFinite(e.se))) {
    throw new DynamicsFitError('The spin-up parameters cannot be told apart in this window; use a window that includes the rotor at rest and its approach to a steady rate.');
  }
  const warnings: string[] = [];
  if (!out.converged) warnings.push(`The spin-up fit did not converge (${out.reason}); treat its estimates with caution.`);
  const dtMedian = (t[n - 1]! - t[0]!) / (n - 1);
  if (params.tau_s < 2 * dtMedian) warnings.push(`The spin-up time constant (${params.tau_s.toPrecision(3)} s) is shorter than two frame intervals, so the spin-up is not resolved.`);
  if (params.onset_s < t_s[0]!) warnings.push('The fitted onset lies before the window start, so onset and resting angle are extrapolated.');
  if (params.tau_s > 0.5 * (t[n - 1]! - params.onset_s + tRef)) warnings.push('The spin-up time constant exceeds half the time after onset, so the terminal rate is extrapolated; record longer.');

  const predict_deg = spinUpAngle(params);
  return {
    result,
    candidate: { model: 'spinup', n, k: 4, rss: out.rss, n_eff: batchMeansEffectiveSize(out.residuals) },
    residuals_deg: out.residuals,
    predict_deg,
    rate_deg_s: spinUpRate(params),
    converged: out.converged,
    warnings,
  };
}
