/**
 * Coast-down of a freely spinning rotor against Coulomb (constant) and viscous (rate-proportional) friction:
 *   dω/dt = −c·sign(ω) − k·ω,   ω(ts) = ω0,
 * c in deg/s², k in 1/s, angles deg counterclockwise positive as displayed, times s. With u = |ω|,
 * s = sign(ω0), t' = t − ts and x = k·t' the closed form is
 *   u(t)  = u0·e^(−x) − c·t'·φ1(x)
 *   θ(t)  = θs + ω0·t'·φ1(x) − s·c·t'²·φ2(x)
 * with φ1(x) = (1 − e^(−x))/x and φ2(x) = (x − 1 + e^(−x))/x², evaluated by their Taylor series near x = 0,
 * so pure Coulomb friction (k → 0) needs no division by zero. The rotor stops at
 *   t_stop = ts + (u0/c)·ln(1 + k·u0/c)/(k·u0/c)      (c > 0; never when c ≤ 0 or 1 + k·u0/c ≤ 0)
 * and stays at rest after it (Coulomb friction holds it). The window start is ts (the fit does not estimate
 * when the drive was cut: choose the window from the cut onwards).
 * Fitted by Levenberg–Marquardt with autoregressive errors (fitDynamicsCurve.ts); start values from a grid
 * over k and the apparent stop time on which θs, ω0 and s·c enter linearly.
 */
import type { SpinDownResult } from './FitReport.js';
import type { ModelFit } from './ModelFit.js';
import { type CurveModel, type DynamicsCurveOptions, fitDynamicsCurve } from './fitDynamicsCurve.js';
import { estimateFromCurve } from './curveEstimate.js';
import { batchMeansEffectiveSize } from './batchMeansEffectiveSize.js';
import { dynamicsWindow } from './checkDynamicsSeries.js';
import { InputError } from '../errors.js';
import { DynamicsFitError } from './DynamicsFitError.js';
import { coastDownNotEligible } from './coastDownEligibility.js';

/** Coast-down parameters: window start ts (s), angle there θs (deg), rate there ω0 (deg/s, signed), Coulomb c (deg/s²), viscous k (1/s). */
export interface CoastDownParams {
  start_s: number;
  theta_start_deg: number;
  initial_rate_deg_s: number;
  coulomb_deg_s2: number;
  viscous_per_s: number;
}

export interface CoastDownOptions extends DynamicsCurveOptions {
  /** Confidence level of the intervals. Default 0.95. */
  level?: number;
}

const SERIES_LIMIT = 0.5;
const SERIES_TERMS = 18;
/** Taylor coefficients in z = −x: φ1 = Σ z^n/(n+1)!, φ2 = Σ z^n/(n+2)!. */
const PHI1_COEF = Array.from({ length: SERIES_TERMS }, (_, n) => 1 / factorial(n + 1));
const PHI2_COEF = Array.from({ length: SERIES_TERMS }, (_, n) => 1 / factorial(n + 2));

function factorial(n: number): number {
  let f = 1;
  for (let i = 2; i <= n; i++) f *= i;
  return f;
}

/** Σ coef[n]·z^n (value) and Σ n·coef[n]·z^(n−1) (slope in z), by Horner's rule. */
function hornerWithSlope(coef: number[], z: number): [number, number] {
  let value = coef[coef.length - 1]!;
  let slope = 0;
  for (let n = coef.length - 2; n >= 0; n--) {
    slope = slope * z + value;
    value = value * z + coef[n]!;
  }
  return [value, slope];
}

/** φ1(x) = (1 − e^(−x))/x and dφ1/dx, with φ1(0) = 1 (series near 0). */
export function phi1(x: number): [number, number] {
  if (Math.abs(x) < SERIES_LIMIT) {
    const [v, dz] = hornerWithSlope(PHI1_COEF, -x);
    return [v, -dz];
  }
  const em = Math.expm1(-x);
  return [-em / x, -(1 - (1 + x) * (em + 1)) / (x * x)];
}

/** φ2(x) = (x − 1 + e^(−x))/x² and dφ2/dx, with φ2(0) = 1/2 (series near 0). */
export function phi2(x: number): [number, number] {
  if (Math.abs(x) < SERIES_LIMIT) {
    const [v, dz] = hornerWithSlope(PHI2_COEF, -x);
    return [v, -dz];
  }
  const em = Math.expm1(-x);
  return [(x + em) / (x * x), (2 - x - (x + 2) * (em + 1)) / (x * x * x)];
}

/** ln(1 + y)/y, with the value 1 at y = 0. */
function log1pOverY(y: number): number {
  if (Math.abs(y) < 1e-5) return 1 - y / 2 + (y * y) / 3;
  return Math.log1p(y) / y;
}

/** Time after the window start (s) at which the coast-down stops, or Infinity if it never does. */
export function coastDownStopAfter_s(u0_deg_s: number, coulomb_deg_s2: number, viscous_per_s: number): number {
  if (!(coulomb_deg_s2 > 0)) return Infinity;
  if (u0_deg_s <= 0) return 0;
  const y = (viscous_per_s * u0_deg_s) / coulomb_deg_s2;
  if (y <= -1) return Infinity;
  return (u0_deg_s / coulomb_deg_s2) * log1pOverY(y);
}

/** Angle (deg) of the coast-down model at time t (s). */
export function coastDownAngle(params: CoastDownParams): (t_s: number) => number {
  const { start_s, theta_start_deg, initial_rate_deg_s: w0, coulomb_deg_s2: c, viscous_per_s: k } = params;
  const s = Math.sign(w0);
  const stop = coastDownStopAfter_s(Math.abs(w0), c, k);
  return (t_s) => {
    const tp = Math.min(t_s - start_s, stop);
    const x = k * tp;
    return theta_start_deg + w0 * tp * phi1(x)[0] - s * c * tp * tp * phi2(x)[0];
  };
}

/** Rate (deg/s) of the coast-down model at time t (s); 0 after the stop. */
export function coastDownRate(params: CoastDownParams): (t_s: number) => number {
  const { start_s, initial_rate_deg_s: w0, coulomb_deg_s2: c, viscous_per_s: k } = params;
  const s = Math.sign(w0);
  const stop = coastDownStopAfter_s(Math.abs(w0), c, k);
  return (t_s) => {
    const tp = t_s - start_s;
    if (tp >= stop) return 0;
    const x = k * tp;
    return s * (Math.abs(w0) * Math.exp(-x) - c * tp * phi1(x)[0]);
  };
}

/** φ1, φ1', φ2, φ2' at x into out[0..3] without allocating (hot loop of the fit). */
function phiAll(x: number, out: Float64Array): void {
  if (Math.abs(x) < SERIES_LIMIT) {
    const z = -x;
    let v1 = PHI1_COEF[SERIES_TERMS - 1]!;
    let s1 = 0;
    let v2 = PHI2_COEF[SERIES_TERMS - 1]!;
    let s2 = 0;
    for (let n = SERIES_TERMS - 2; n >= 0; n--) {
      s1 = s1 * z + v1;
      v1 = v1 * z + PHI1_COEF[n]!;
      s2 = s2 * z + v2;
      v2 = v2 * z + PHI2_COEF[n]!;
    }
    out[0] = v1;
    out[1] = -s1;
    out[2] = v2;
    out[3] = -s2;
    return;
  }
  const em = Math.expm1(-x);
  const e = em + 1;
  const x2 = x * x;
  out[0] = -em / x;
  out[1] = -(1 - (1 + x) * e) / x2;
  out[2] = (x + em) / x2;
  out[3] = (2 - x - (x + 2) * e) / (x2 * x);
}

const PHI_SCRATCH = new Float64Array(4);

/** The stop time of the last (u0, c, k) asked for: the fit evaluates the curve at every point for the same parameters. */
const lastStop = { u0: NaN, c: NaN, k: NaN, after_s: NaN };

/** coastDownStopAfter_s, remembered for the last parameters. */
function stopAfterRemembered(u0: number, c: number, k: number): number {
  if (u0 !== lastStop.u0 || c !== lastStop.c || k !== lastStop.k) {
    lastStop.u0 = u0;
    lastStop.c = c;
    lastStop.k = k;
    lastStop.after_s = coastDownStopAfter_s(u0, c, k);
  }
  return lastStop.after_s;
}

/** Internal parameter vector p = [θs, ω0, c, k], time relative to the window start. */
const coastDownCurve: CurveModel = {
  k: 4,
  evaluate: (p, t, grad) => {
    const w0 = p[1]!;
    const c = p[2]!;
    const k = p[3]!;
    const s = w0 < 0 ? -1 : 1;
    const u0 = Math.abs(w0);
    // After the stop the angle is frozen at θ(t_stop); since dθ/dt = 0 there, its gradient is the
    // fixed-time gradient at t_stop (envelope theorem).
    const tp = Math.min(t, stopAfterRemembered(u0, c, k));
    phiAll(k * tp, PHI_SCRATCH);
    const f1 = PHI_SCRATCH[0]!;
    const f2 = PHI_SCRATCH[2]!;
    const tp2 = tp * tp;
    grad[0] = 1;
    grad[1] = tp * f1;
    grad[2] = -s * tp2 * f2;
    grad[3] = s * (u0 * tp2 * PHI_SCRATCH[1]! - c * tp2 * tp * PHI_SCRATCH[3]!);
    return p[0]! + w0 * tp * f1 - s * c * tp2 * f2;
  },
};

/**
 * Start values: grid over k and an apparent stop time T; θs, ω0, s·c by linear least squares on t ≤ T.
 * Per k the basis t·φ1(kt), −t²·φ2(kt) is computed once; the normal equations grow point by point and are
 * solved at each T, and each candidate's RSS reuses the basis (the curve is linear in θs, ω0, s·c up to its stop).
 */
function coastDownStarts(t: Float64Array, y: Float64Array, count: number): Float64Array[] {
  const n = t.length;
  const span = t[n - 1]!;
  const candidates: { rss: number; p: Float64Array }[] = [];
  const grad = new Float64Array(4);
  const row = Float64Array.of(1, 0, 0);
  const basis1 = new Float64Array(n);
  const basis2 = new Float64Array(n);
  const kValues = [0];
  for (let a = 0; a < 14; a++) kValues.push((0.03 * 10 ** (a / 4.5)) / span);
  for (const k of kValues) {
    for (let i = 0; i < n; i++) {
      phiAll(k * t[i]!, PHI_SCRATCH);
      basis1[i] = t[i]! * PHI_SCRATCH[0]!;
      basis2[i] = -t[i]! * t[i]! * PHI_SCRATCH[2]!;
    }
    // normal equations for basis [1, t·φ1(kt), −t²·φ2(kt)] over the points t ≤ T, grown as T increases
    const ata = new Float64Array(9);
    const atb = new Float64Array(3);
    let m = 0;
    for (let b = 1; b <= 10; b++) {
      const tEnd = (b / 10) * span;
      for (; m < n && t[m]! <= tEnd; m++) {
        row[1] = basis1[m]!;
        row[2] = basis2[m]!;
        for (let r = 0; r < 3; r++) {
          atb[r] = atb[r]! + row[r]! * y[m]!;
          for (let c2 = 0; c2 < 3; c2++) ata[r * 3 + c2] = ata[r * 3 + c2]! + row[r]! * row[c2]!;
        }
      }
      if (m < 6) continue;
      const sol = solve3(ata, atb);
      if (!sol) continue;
      const w0 = sol[1]!;
      const c = sol[2]! * (w0 < 0 ? -1 : 1);
      const p = Float64Array.of(sol[0]!, w0, c, k);
      // before the stop the curve is sol·basis; after it, frozen at its value at the stop
      const stop = coastDownStopAfter_s(Math.abs(w0), c, k);
      const frozen = stop < span ? coastDownCurve.evaluate(p, stop, grad) : NaN;
      let rss = 0;
      for (let i = 0; i < n; i++) {
        const f = t[i]! < stop ? sol[0]! + w0 * basis1[i]! + sol[2]! * basis2[i]! : frozen;
        rss += (y[i]! - f) ** 2;
      }
      if (Number.isFinite(rss)) candidates.push({ rss, p });
    }
  }
  candidates.sort((u, v) => u.rss - v.rss);
  return candidates.slice(0, count).map((c) => c.p);
}

/** Solves a symmetric positive semi-definite 3×3 system by Cramer's rule; null when (nearly) singular. */
function solve3(a: Float64Array, b: Float64Array): Float64Array | null {
  const det = (m: ArrayLike<number>) =>
    m[0]! * (m[4]! * m[8]! - m[5]! * m[7]!) - m[1]! * (m[3]! * m[8]! - m[5]! * m[6]!) + m[2]! * (m[3]! * m[7]! - m[4]! * m[6]!);
  const d = det(a);
  // Hadamard's bound for a positive semi-definite matrix: det ≤ a00·a11·a22; near 0 relative to it is singular.
  if (!(Math.abs(d) > 1e-12 * Math.abs(a[0]! * a[4]! * a[8]!))) return null;
  const out = new Float64Array(3);
  for (let col = 0; col < 3; col++) {
    const m = Float64Array.from(a);
    for (let r = 0; r < 3; r++) m[r * 3 + col] = b[r]!;
    out[col] = det(m) / d;
  }
  return out;
}

/**
 * Fits the coast-down model to an unwrapped angle series that starts when the drive is cut.
 * @param t_s       frame times, s, strictly increasing; the first time is the model's start ts
 * @param angle_deg unwrapped angle, deg, counterclockwise positive as displayed
 */
export function fitCoastDown(t_s: Float64Array, angle_deg: Float64Array, options: CoastDownOptions = {}): ModelFit<SpinDownResult> {
  const level = options.level ?? 0.95;
  const { tRef, t, thin } = dynamicsWindow(t_s, angle_deg, 'coast-down', options.thinnedPoints ?? 1500);
  const n = t.length;
  const starts = coastDownStarts(thin.t, thin.y, 3);
  if (starts.length === 0) throw new InputError('The coast-down fit found no usable start values; check that the angle series is not constant.');
  const out = fitDynamicsCurve(coastDownCurve, t, angle_deg, starts, { ...options, level });
  const p = out.params;
  const params: CoastDownParams = { start_s: tRef, theta_start_deg: p[0]!, initial_rate_deg_s: p[1]!, coulomb_deg_s2: p[2]!, viscous_per_s: p[3]! };
  const initial = estimateFromCurve(out, 1, level);
  const stopAfter = coastDownStopAfter_s(Math.abs(params.initial_rate_deg_s), params.coulomb_deg_s2, params.viscous_per_s);
  const result: SpinDownResult = {
    initial_rate_deg_s: initial,
    initial_rate_rpm: { value: initial.value / 6, se: initial.se / 6, ci: [initial.ci[0] / 6, initial.ci[1] / 6], level },
    coulomb_deg_s2: estimateFromCurve(out, 2, level),
    viscous_per_s: estimateFromCurve(out, 3, level),
    stop_s: stopAfter <= t[n - 1]! ? tRef + stopAfter : null,
  };
  if (![result.initial_rate_deg_s, result.coulomb_deg_s2, result.viscous_per_s].every((e) => Number.isFinite(e.se))) {
    throw new DynamicsFitError('The coast-down parameters cannot be told apart in this window (Coulomb and viscous friction are confounded); use a window that starts when the drive is cut and lasts until the rotor slows clearly.');
  }
  const warnings: string[] = [];
  if (!out.converged) warnings.push(`The coast-down fit did not converge (${out.reason}); treat its estimates with caution.`);
  if (params.coulomb_deg_s2 < 0 || params.viscous_per_s < 0) {
    warnings.push('The fitted friction is negative (the rotor seems to gain speed), so the coast-down model does not describe this window.');
  }
  const excluded = coastDownNotEligible(params, { coulomb_deg_s2: result.coulomb_deg_s2.ci[1], viscous_per_s: result.viscous_per_s.ci[1] });
  return {
    result,
    candidate: { model: 'spindown', n, k: 4, rss: out.rss, n_eff: batchMeansEffectiveSize(out.residuals), ...(excluded ? { excluded } : {}) },
    residuals_deg: out.residuals,
    predict_deg: coastDownAngle(params),
    rate_deg_s: coastDownRate(params),
    converged: out.converged,
    warnings,
  };
}
