import jstatModule from 'jstat';
import type { Estimate, SegmentRate, SteadyResult, WanderAllowance, ZeroTest } from './FitReport.js';
import { walkUpperBound, wanderAllowedVariance } from './wanderAllowance.js';
import type { ModelFit } from './ModelFit.js';
import { linearLeastSquares } from './linearLeastSquares.js';
import { correlationTimeRange, fitAngleNoiseModel, noiseInformation, type AngleNoiseModel, type NoiseParameter } from './angleNoiseModel.js';
import { kalmanGains, kalmanWhiten, whitenWithGains, type WhitenedRegression } from './stateSpaceGls.js';
import { medianInterval } from '../signal/medianInterval.js';
import { zeroTest } from './zeroTest.js';
import { minDetectableRate } from './minDetectableRate.js';
import { scaleEstimate, RPM_PER_DEG_S, REV_S_PER_DEG_S } from './units.js';
import { InputError } from '../errors.js';

const { jStat } = jstatModule;

/** Options of fitSteadyRate; every field has a default. */
export interface SteadyRateOptions {
  /** Confidence level of every interval (default 0.95). */
  level?: number;
  /** Equivalence margin for the TOST test, deg/s (default: none). */
  margin_deg_s?: number;
  /** Number of equal-duration segments for the segment rates (default: ⌊n/50⌋ clamped to 2…10). */
  segments?: number;
}

/** The noise model the steady fit settled on (see fitAngleNoiseModel) and the standard-error settings. */
export interface SteadyNoiseModel extends AngleNoiseModel {
  /** Number of batches of the jackknife standard error (df = batches − 1). */
  batches: number;
  /** Median frame interval, s. */
  frame_interval_s: number;
}

/** A steady fit: the report block plus the model-fit shape shared with the other models. */
export interface SteadyRateFit extends ModelFit<SteadyResult> {
  noise: SteadyNoiseModel;
  /** Degrees of freedom of the Student-t reference (jackknifeDfWithNoiseModel). */
  df: number;
  /** Degrees of freedom of the jackknife alone (its Satterthwaite df; df above also counts the noise model's uncertainty). */
  jackknife_df: number;
  /** The GLS standard error the noise model alone implies, deg/s (for comparison with the jackknife one). */
  model_se_deg_s: number;
  /** Segment homogeneity: p-value of an F test that all segment rates are equal (segmentHomogeneityP; null with one segment). */
  segment_p_value: number | null;
}

interface SlopeFit {
  slope: number;
  se: number;
  df: number;
  /** Intercept at relative time 0, deg relative to the first angle. */
  intercept: number;
  batches: number;
  /** Model-based standard error (classical GLS: right when the noise model is right). */
  modelSe: number;
  /** Relative jackknife bias per relative error of the whitening walk (κ, see glsSlope); 0 without a walk part or when not asked for. */
  walkKappa: number;
  /** Slope variance per unit of an added walk's diffusion, true and expected in the bias-corrected jackknife (walkSensitivity); when asked for. */
  walkSensitivity?: { trueVar: number; jackknifeVar: number };
}

/** Number of batches for the jackknife standard error of a fit on m rows: 8, fewer so each holds ≥ 5 rows, at least 2. */
export function batchCount(m: number, most = 8): number {
  return Math.max(2, Math.min(most, Math.floor(m / 5)));
}

/** Slope of the 2-column least squares from its normal-equation sums; the slope alone when the constant column has vanished. */
function slopeFromSums(s11: number, s12: number, s22: number, s1y: number, s2y: number): number {
  const det = s11 * s22 - s12 * s12;
  if (!(det > 1e-12 * s11 * s22)) return s2y / s22;
  return (s11 * s2y - s12 * s1y) / det;
}

/**
 * Satterthwaite (1946) degrees of freedom of the delete-a-batch jackknife variance when the whitened errors
 * are white: the slope change from deleting batch b is δ_b = d_bᵀε with d_b[k] = x_kᵀu_b·[k ∉ b] − x_kᵀg,
 * u_b = (G − G_b)⁻¹e₂, g = G⁻¹e₂, so the variance estimate is a quadratic form εᵀAε, A ∝ Σ_b (d_b − d̄)(d_b − d̄)ᵀ,
 * and df = (tr A)²/tr(A²) = (tr C)²/tr(C²) with C the centred B×B matrix of inner products d_bᵀd_c, each a
 * sum over batches a of (·)ᵀG_a(·). Equal, independent batches give B − 1; a trend fit leaning on its end
 * batches gets fewer. The jackknife variance is biased upward (Efron & Stein 1981) — for a trend fit by tens
 * of percent — so `scale` = Var(ω̂)/E[εᵀAε] = [G⁻¹]₂₂/tr A (≤ 1) removes that bias under the same model.
 * @param grams per-batch Gram sums [s11, s12, s22, …] (first three entries used)
 */
function jackknifeDf(grams: Float64Array[]): { df: number; scale: number } {
  const b = grams.length;
  let g11 = 0, g12 = 0, g22 = 0;
  for (const a of grams) {
    g11 += a[0]!;
    g12 += a[1]!;
    g22 += a[2]!;
  }
  const gdet = g11 * g22 - g12 * g12;
  const plain = { df: b - 1, scale: 1 };
  if (!(gdet > 0)) return plain;
  const g: [number, number] = [-g12 / gdet, g11 / gdet];
  const u: [number, number][] = grams.map((a) => {
    const r11 = g11 - a[0]!, r12 = g12 - a[1]!, r22 = g22 - a[2]!;
    const rdet = r11 * r22 - r12 * r12;
    return rdet > 0 ? [-r12 / rdet, r11 / rdet] : [Number.NaN, Number.NaN];
  });
  if (u.some((x) => !Number.isFinite(x[0]))) return plain;
  const quad = (a: Float64Array, p: [number, number], q: [number, number]): number =>
    p[0] * (a[0]! * q[0] + a[1]! * q[1]) + p[1] * (a[1]! * q[0] + a[2]! * q[1]);
  const m = new Float64Array(b * b);
  for (let i = 0; i < b; i++) {
    for (let j = i; j < b; j++) {
      let sum = 0;
      for (let a = 0; a < b; a++) {
        const p: [number, number] = a !== i ? [u[i]![0] - g[0], u[i]![1] - g[1]] : [-g[0], -g[1]];
        const q: [number, number] = a !== j ? [u[j]![0] - g[0], u[j]![1] - g[1]] : [-g[0], -g[1]];
        sum += quad(grams[a]!, p, q);
      }
      m[i * b + j] = sum;
      m[j * b + i] = sum;
    }
  }
  // centre: C = (I − J/B) M (I − J/B)
  const rowMean = new Float64Array(b);
  let all = 0;
  for (let i = 0; i < b; i++) {
    for (let j = 0; j < b; j++) rowMean[i]! += m[i * b + j]! / b;
    all += rowMean[i]! / b;
  }
  let tr = 0;
  let tr2 = 0;
  for (let i = 0; i < b; i++) {
    for (let j = 0; j < b; j++) {
      const c = m[i * b + j]! - rowMean[i]! - rowMean[j]! + all;
      if (i === j) tr += c;
      tr2 += c * c;
    }
  }
  if (!(tr2 > 0) || !(tr > 0)) return plain;
  const trA = ((b - 1) / b) * tr;
  return { df: Math.max(1, Math.min(b - 1, (tr * tr) / tr2)), scale: Math.min(1, g11 / gdet / trA) };
}

/**
 * Generalised least squares of y = c + ω·t + u on rows lo…hi−1 for the given noise model (kalmanWhiten).
 * Standard error by the delete-a-batch jackknife over B contiguous batches of the whitened rows (the block
 * jackknife for dependent data, Künsch 1989, Ann. Statist. 17:1217): ω̂_(−b) refitted without batch b,
 * Var(ω̂) ≈ (B−1)/B·Σ_b (ω̂_(−b) − ω̄)² times a design factor that removes the jackknife's upward bias, and
 * Student-t with the Satterthwaite df of that variance (jackknifeDf; at most B − 1; fixed-b inference).
 * The jackknife accounts for the high leverage of the end batches in a trend fit, which plain batch means
 * of the score do not (they under-cover by several points). Whatever slow wander the noise model misses stays
 * in the batches and widens the interval (in part: walkSensitivity). With `withWalkKappa` (whole window only:
 * it costs 4B extra whitening passes) it also returns the walk sensitivities (for wanderAllowedVariance) and κ, the relative bias the jackknife picks up per relative
 * error of the whitening walk q̂: κ = ∂ln(E[jackknife variance]/Var(ω̂))/∂ln q̂ at q̂ = q
 * = q·(trueVar − factor·jackknifeVar)/Φ, Φ the model-based slope variance. When the truth has walk q and the
 * rows are whitened with q̂, E[jackknife variance] = Φ(q̂) + (q − q̂)·factor·jackknifeVar and
 * Var(ω̂) = Φ(q̂) + (q − q̂)·trueVar (walkSensitivity), and ∂Φ/∂q = trueVar (GLS is optimal at q̂ = q).
 */
function glsSlope(t: Float64Array, y: Float64Array, lo: number, hi: number, model: AngleNoiseModel, mostBatches = 8, withWalkKappa = false): SlopeFit {
  const w = kalmanWhiten(t, y, lo, hi, model);
  const m = hi - lo;
  const fit = linearLeastSquares([w.one, w.t], w.y);
  const b = batchCount(m, mostBatches);
  // per-batch normal-equation sums, centred on the full-fit coefficients' scale for accuracy
  const sums = Array.from({ length: b }, () => new Float64Array(5));
  const total = new Float64Array(5);
  const c0 = fit.coefficients[0]!;
  const c1 = fit.coefficients[1]!;
  for (let batch = 0; batch < b; batch++) {
    const start = Math.floor((m * batch) / b);
    const end = Math.floor((m * (batch + 1)) / b);
    const acc = sums[batch]!;
    for (let k = start; k < end; k++) {
      const x1 = w.one[k]!;
      const x2 = w.t[k]!;
      const r = w.y[k]! - c0 * x1 - c1 * x2; // residual: the jackknife works on the slope's change
      acc[0]! += x1 * x1;
      acc[1]! += x1 * x2;
      acc[2]! += x2 * x2;
      acc[3]! += x1 * r;
      acc[4]! += x2 * r;
    }
    for (let j = 0; j < 5; j++) total[j]! += acc[j]!;
  }
  const leaveOut = sums.map((acc) =>
    slopeFromSums(total[0]! - acc[0]!, total[1]! - acc[1]!, total[2]! - acc[2]!, total[3]! - acc[3]!, total[4]! - acc[4]!),
  );
  const mean = leaveOut.reduce((a, v) => a + v, 0) / b;
  const varSlope = ((b - 1) / b) * leaveOut.reduce((a, v) => a + (v - mean) ** 2, 0);
  const { df, scale } = jackknifeDf(sums);
  let walkKappa = 0;
  let sensitivity: SlopeFit['walkSensitivity'];
  if (withWalkKappa) {
    const { trueVar, jackknifeVar } = walkSensitivity(t, lo, hi, model, w, b);
    sensitivity = { trueVar, jackknifeVar: scale * jackknifeVar };
    const phi = fit.inverseGram[3]!;
    if (model.walk_deg2_per_s > 0) walkKappa = phi > 0 ? (model.walk_deg2_per_s * (trueVar - scale * jackknifeVar)) / phi : 0;
  }
  return { slope: c1, se: Math.sqrt(varSlope * scale), df, intercept: c0, batches: b, modelSe: fit.se[1]!, walkKappa, ...(sensitivity ? { walkSensitivity: sensitivity } : {}) };
}

/**
 * Slope and delete-a-batch jackknife variance (before the bias factor of jackknifeDf) of a whitened series z that
 * is zero before row `from`, regressed on the whitened design whose per-batch Gram sums [s11, s12, s22] are
 * `grams` (batch b covers rows bounds[b]…bounds[b+1]−1). Only the sums Σx·z are needed: a batch's residual sums
 * are Σx·z − c0·Σx·one − c1·Σx·t.
 */
function stepJackknife(w: WhitenedRegression, grams: Float64Array[], bounds: number[], z: Float64Array, from: number): { slope: number; variance: number } {
  const b = grams.length;
  const zOne = new Float64Array(b);
  const zT = new Float64Array(b);
  let batch = 0;
  for (let k = from; k < z.length; k++) {
    while (k >= bounds[batch + 1]!) batch++;
    zOne[batch]! += w.one[k]! * z[k]!;
    zT[batch]! += w.t[k]! * z[k]!;
  }
  let s11 = 0, s12 = 0, s22 = 0, s1z = 0, s2z = 0;
  for (let i = 0; i < b; i++) {
    s11 += grams[i]![0]!;
    s12 += grams[i]![1]!;
    s22 += grams[i]![2]!;
    s1z += zOne[i]!;
    s2z += zT[i]!;
  }
  const det = s11 * s22 - s12 * s12;
  const c0 = det > 0 ? (s22 * s1z - s12 * s2z) / det : 0;
  const c1 = det > 0 ? (s11 * s2z - s12 * s1z) / det : s2z / s22;
  const leaveOut: number[] = [];
  for (let i = 0; i < b; i++) {
    const [a11, a12, a22] = [grams[i]![0]!, grams[i]![1]!, grams[i]![2]!];
    const a1r = zOne[i]! - c0 * a11 - c1 * a12;
    const a2r = zT[i]! - c0 * a12 - c1 * a22;
    leaveOut.push(c1 + slopeFromSums(s11 - a11, s12 - a12, s22 - a22, -a1r, -a2r));
  }
  const mean = leaveOut.reduce((acc, v) => acc + v, 0) / b;
  return { slope: c1, variance: ((b - 1) / b) * leaveOut.reduce((acc, v) => acc + (v - mean) ** 2, 0) };
}

/**
 * How a random walk that the noise model leaves out would show up: an extra walk of diffusion Δq (deg²/s) adds
 * Δq·trueVar to the slope's variance and Δq·jackknifeVar to the expected jackknife variance (before its bias
 * factor). The walk is a sum of independent unit steps, one per frame interval, of variance Δq·δt_k, and both
 * statistics are linear (the GLS slope) or quadratic (the jackknife) in the whitened data, so
 * trueVar = Σ_k δt_k·s_k² and jackknifeVar = Σ_k δt_k·J_k, with s_k the GLS slope and J_k the jackknife variance
 * of a unit step at frame k put through the same whitening (whitenWithGains). The sums are taken over 4 steps per
 * batch, each standing for its share of the window. Both are slope variances per unit diffusion, (deg/s)² per (deg²/s).
 */
export function walkSensitivity(t: Float64Array, lo: number, hi: number, model: AngleNoiseModel, w: WhitenedRegression, b: number): { trueVar: number; jackknifeVar: number } {
  const m = hi - lo;
  const steps = Math.min(m - 1, 4 * b);
  const gains = kalmanGains(t, lo, hi, model);
  const bounds = Array.from({ length: b + 1 }, (_, i) => Math.floor((m * i) / b));
  const grams = Array.from({ length: b }, (_, i) => {
    const g = new Float64Array(3);
    for (let k = bounds[i]!; k < bounds[i + 1]!; k++) {
      g[0]! += w.one[k]! * w.one[k]!;
      g[1]! += w.one[k]! * w.t[k]!;
      g[2]! += w.t[k]! * w.t[k]!;
    }
    return g;
  });
  const one = (): number => 1;
  let trueVar = 0;
  let jackknifeVar = 0;
  for (let j = 0; j < steps; j++) {
    const from = Math.floor((m * j) / steps);
    const to = Math.floor((m * (j + 1)) / steps);
    const at = Math.max(1, Math.floor((from + to) / 2));
    const span = t[lo + Math.min(to, m - 1)]! - t[lo + Math.min(from, m - 1)]!;
    const z = whitenWithGains(gains, one, at);
    const { slope, variance } = stepJackknife(w, grams, bounds, z, at);
    trueVar += span * slope * slope;
    jackknifeVar += span * variance;
  }
  return { trueVar, jackknifeVar };
}

/** Solves the small symmetric system a·x = b (Gaussian elimination, partial pivoting); null when a is singular. */
function solveSmall(a: Float64Array, b: Float64Array): Float64Array | null {
  const p = b.length;
  const m = Array.from({ length: p }, (_, i) => [...a.slice(i * p, i * p + p), b[i]!]);
  let scale = 0;
  for (let i = 0; i < p; i++) scale = Math.max(scale, Math.abs(a[i * p + i]!));
  for (let c = 0; c < p; c++) {
    let piv = c;
    for (let r = c + 1; r < p; r++) if (Math.abs(m[r]![c]!) > Math.abs(m[piv]![c]!)) piv = r;
    [m[c], m[piv]] = [m[piv]!, m[c]!];
    const pv = m[c]![c]!;
    if (!(Math.abs(pv) > 1e-12 * scale)) return null;
    for (let r = 0; r < p; r++) {
      if (r === c) continue;
      const f = m[r]![c]! / pv;
      for (let k = c; k <= p; k++) m[r]![k]! -= f * m[c]![k]!;
    }
  }
  return Float64Array.from(m, (row, i) => row[p]! / row[i]!);
}

/**
 * Variance of ln q̂, the log walk diffusion of the noise model, from the Whittle information of its positive
 * parameters (noiseInformation; the [ln q, ln q] element of I⁻¹, so what the window cannot tell apart from the
 * walk — the AR part — widens it). A correlation time at a bound of the fit's search range
 * (correlationTimeRange) was not estimated freely and is held fixed. Infinity when the information matrix is
 * singular; 0 without a walk.
 * @param delta_s median frame interval, s; duration_s window length, s; frames number of frames in the window
 */
export function logWalkVariance(model: AngleNoiseModel, delta_s: number, duration_s: number, frames: number): number {
  if (!(model.walk_deg2_per_s > 0)) return 0;
  const range = correlationTimeRange(duration_s, frames);
  const atBound = Math.abs(model.ar_time_s / range.max_s - 1) < 1e-9 || Math.abs(model.ar_time_s / range.min_s - 1) < 1e-9;
  const fixed: NoiseParameter[] = atBound ? ['ar_time_s'] : [];
  const { parameters, information } = noiseInformation(model, delta_s, Math.round(duration_s / delta_s) + 1, fixed);
  const unit = Float64Array.from(parameters, (name) => (name === 'walk_deg2_per_s' ? 1 : 0));
  const x = solveSmall(information, unit);
  const v = x ? x[parameters.indexOf('walk_deg2_per_s')]! : Infinity;
  return v > 0 ? v : Infinity;
}

/**
 * Degrees of freedom of the jackknife variance when the noise model that whitened its rows is itself an estimate
 * (Satterthwaite 1946: ν = 2/(relative variance of the variance estimate)). The jackknife's own sampling error
 * has relative SD √(2/ν_J) (ν_J from jackknifeDf). An error in the fitted walk q̂ moves its expectation by the
 * relative amount κ·(ln q̂ − ln q) (κ from glsSlope/walkSensitivity: a walk the model misses is seen only in part
 * by the batches, so an under-estimated walk leaves the jackknife low), with SD(ln q̂) from the Whittle
 * information (logWalkVariance; the Cramér–Rao bound, so somewhat optimistic for the variogram fit).
 * Both errors come from the same few low-frequency ordinates — a window whose walk happened to wander little
 * gives a small q̂ and small batch spreads together — so their SDs are added (full positive correlation, the
 * Cauchy–Schwarz bound) rather than their variances: ν = 2/(√(2/ν_J) + |κ|·SD(ln q̂))². This is the
 * Satterthwaite step Kenward & Roger (1997, Biometrics 53:983) apply to a variance that depends on estimated
 * covariance parameters. Equals ν_J without a walk part or when the batches see a missed walk in full (κ = 0);
 * at least 1. Conservative where the fitted walk is biased upward — in short windows the correlation-time cap of
 * fitAngleNoiseModel hands slow AR noise to the walk, and over-whitening only widens the jackknife.
 */
export function jackknifeDfWithNoiseModel(nuJackknife: number, kappa: number, logWalkVar: number): number {
  if (!(kappa !== 0) || !(logWalkVar > 0)) return nuJackknife;
  if (!Number.isFinite(logWalkVar)) return 1;
  const relativeSd = Math.sqrt(2 / nuJackknife) + Math.abs(kappa) * Math.sqrt(logWalkVar);
  return Math.min(nuJackknife, Math.max(1, 2 / (relativeSd * relativeSd)));
}

/**
 * The rate once more, allowing for a rate wander (random walk of the angle) too small for the noise model to have
 * rule out in this window: up to walkUpperBound, added by wanderAllowedVariance. When the model holds a walk, the
 * main interval already allows for the wander it found and is repeated here (bound null).
 */
function allowForHiddenWalk(t: Float64Array, y: Float64Array, whole: SlopeFit, model: AngleNoiseModel, rate: Estimate, zero: ZeroTest, df: number, level: number,
  margin_deg_s: number | undefined): WanderAllowance {
  if (model.walk_deg2_per_s > 0 || !whole.walkSensitivity) return { hidden_walk_bound_deg_per_sqrt_s: null, rate_deg_s: rate, zero_test: zero };
  const tests = { level, ...(margin_deg_s !== undefined ? { margin_deg_s } : {}) };
  const bound = walkUpperBound(t, y, 0, t.length, model, level);
  const allowed = wanderAllowedVariance(whole.se ** 2, whole.df, bound, whole.walkSensitivity);
  const se = Math.sqrt(allowed.variance);
  // the df treat the allowance as known; where that would make this interval narrower than the main one (a small
  // allowance on few df), the main df are kept, so allowing for wander never narrows the interval
  const wide = estimate(whole.slope, se, allowed.df, level);
  const narrower = wide.ci[1] - wide.ci[0] < rate.ci[1] - rate.ci[0];
  const dfAllowing = narrower ? df : allowed.df;
  return { hidden_walk_bound_deg_per_sqrt_s: Math.sqrt(bound), rate_deg_s: narrower ? estimate(whole.slope, se, df, level) : wide, zero_test: zeroTest(whole.slope, se, dfAllowing, tests) };
}

function estimate(value: number, se: number, df: number, level: number): Estimate {
  const half = jStat.studentt.inv(0.5 + level / 2, df) * se;
  return { value, se, ci: [value - half, value + half], level };
}

/**
 * p-value that all segment rates are equal, allowing for the standard errors being estimates of few df.
 * Each segment slope has a model-based variance v_s (GLS under the fitted noise model) and a jackknife
 * variance se_s² with ν_s (Satterthwaite) df. Under the null all segments share one noise process, so
 * se_s² estimates c·v_s with one common factor c (1 when the model is right, larger when it misses slow
 * structure such as flicker or pixel locking). c is pooled as ĉ = Σν_s·(se_s²/v_s)/Σν_s with ν = Σν_s df, and
 * F = Σ(ω̂_s − ω̄)²/v_s / ((k − 1)·ĉ), ω̄ the 1/v_s-weighted mean, is referred to F(k − 1, ν): the pooled-variance
 * one-way analysis of variance (e.g. Scheffé, The Analysis of Variance, 1959, §2.1; the ratio of a χ²_{k−1}/(k−1)
 * to an independent scaled χ²_ν/ν), with the variance scale estimated from within-segment (jackknife)
 * variation so a step between segments does not inflate it. Segments share no rows and are nearly
 * independent under the noise model (AR correlation links only the row pair at a boundary).
 * The former plain χ² statistic Σ(ω̂_s − ω̄)²/se_s² treated the few-df jackknife variances as known: each
 * term is then about F(1, ν_s), not χ²_1, and on steady white-noise series it fired at p < 0.01 in about a
 * quarter of the seeded replicates. Returns null when a segment has no usable standard error.
 */
export function segmentHomogeneityP(fits: readonly SegmentSlope[]): number | null {
  const pooled = poolSegments(fits);
  if (!pooled) return null;
  const k = fits.length;
  let q = 0;
  for (const f of fits) q += (f.slope - pooled.mean) ** 2 / f.modelSe ** 2;
  const stat = q / ((k - 1) * pooled.scale);
  return 1 - jStat.centralF.cdf(stat, k - 1, pooled.nu);
}

/** One segment's slope fit as the segment tests read it: slope, jackknife se with its df, and the model-based se. */
interface SegmentSlope {
  slope: number;
  se: number;
  df: number;
  modelSe: number;
}

/**
 * What both segment tests pool over two or more segments: the 1/v_s-weighted mean slope (v_s = modelSe²) and the
 * variance of that mean (1/Σ 1/v_s), the summed df ν, and the common variance factor ĉ = Σν_s·(se_s²/v_s)/ν.
 * Null when there are fewer than two segments or a segment has no usable standard error.
 */
function poolSegments(fits: readonly SegmentSlope[]): { mean: number; meanVariance: number; nu: number; scale: number } | null {
  if (fits.length < 2 || !fits.every((f) => f.se > 0 && Number.isFinite(f.se) && f.df > 0 && f.modelSe > 0 && Number.isFinite(f.modelSe))) return null;
  let sw = 0;
  let swb = 0;
  let nu = 0;
  let ratio = 0;
  for (const f of fits) {
    const v = f.modelSe ** 2;
    sw += 1 / v;
    swb += f.slope / v;
    nu += f.df;
    ratio += f.df * (f.se ** 2 / v);
  }
  return { mean: swb / sw, meanVariance: 1 / sw, nu, scale: ratio / nu };
}

/**
 * p-value of "the rate inside the segments equals the rate of the whole window": d = ω̄_within − ω̂_whole, with
 * ω̄_within the 1/v_s-weighted mean of the segment slopes. Under a steady rate both estimate it and the whole-window
 * fit is the efficient one, so Var(d) = Var(ω̄_within) − Var(ω̂_whole) (Hausman 1978, Econometrica 46:1251; from
 * memory), with model-based variances scaled by the segments' pooled jackknife factor ĉ and referred to F(1, ν) as
 * in segmentHomogeneityP. A jump of the angle between segments (a splice, a skipped turn, a tracking jump) leaves
 * every segment's slope alone but moves the whole-window slope. Also returns ω̄_within, deg/s. Null when the variances are not usable.
 */
export function withinVersusWholeP(whole: { slope: number; modelSe: number }, fits: readonly SegmentSlope[]): { p: number; within_deg_s: number } | null {
  const pooled = poolSegments(fits);
  if (!pooled) return null;
  // never below a tenth of the within variance: the two variances are estimates, and their difference can vanish
  const vDiff = Math.max(pooled.meanVariance - whole.modelSe ** 2, 0.1 * pooled.meanVariance) * pooled.scale;
  if (!(vDiff > 0) || !Number.isFinite(vDiff)) return null;
  const stat = (pooled.mean - whole.slope) ** 2 / vDiff;
  return { p: 1 - jStat.centralF.cdf(stat, 1, pooled.nu), within_deg_s: pooled.mean };
}

/** True when y is a straight line in t to within rounding (largest least-squares residual ≤ 1e-9 of the angle span, deg). */
function liesOnALine(t: Float64Array, y: Float64Array): boolean {
  const n = t.length;
  let mt = 0;
  let my = 0;
  for (let i = 0; i < n; i++) { mt += t[i]!; my += y[i]!; }
  mt /= n;
  my /= n;
  let stt = 0;
  let sty = 0;
  for (let i = 0; i < n; i++) { stt += (t[i]! - mt) ** 2; sty += (t[i]! - mt) * (y[i]! - my); }
  const b = stt > 0 ? sty / stt : 0;
  let worst = 0;
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < n; i++) {
    worst = Math.max(worst, Math.abs(y[i]! - my - b * (t[i]! - mt)));
    lo = Math.min(lo, y[i]!);
    hi = Math.max(hi, y[i]!);
  }
  return worst <= 1e-9 * Math.max(hi - lo, 1e-9);
}

/**
 * Steady rotation rate over a window, with an interval that stays honest when the angle noise is
 * autocorrelated (compression, flicker) and when the rate itself fluctuates (turbulence: the angle then
 * wanders around its trend like a random walk).
 *
 * Method: feasible generalised least squares with a fitted noise model, and a robust standard error.
 * 1. The angle noise is modelled as white + AR(1) + random walk, fitted to the empirical variogram of the
 *    angle (fitAngleNoiseModel). The variogram needs no trend fit (increments remove the rate) and tells a
 *    plateau (stationary noise) from linear growth (a wandering angle).
 * 2. GLS of angle on time for that noise model by a Kalman filter (kalmanWhiten), exact on irregular times.
 *    For white noise this is ordinary least squares (efficient: the Cramér–Rao bound); for a random walk it
 *    is the mean of the increments; in between it weighs both continuously — no switch between regimes.
 * 3. Standard error: delete-a-batch (block) jackknife over B contiguous batches of the whitened rows
 *    (glsSlope). The noise model only has to be good enough for efficiency; the interval's validity rests
 *    mostly on the batches, so slow wander the model misses still widens it — but only in part: a walk the
 *    model under-estimates leaves slowly wandering whitened rows that the batches see only in part.
 *    B = 8: fewer batches were no better in the seeded study, more under-covered under a wandering rate.
 * 4. Student-t reference with df from jackknifeDfWithNoiseModel: the jackknife's own Satterthwaite df,
 *    lowered by how uncertain the fitted walk is (Whittle information) times how much a walk error moves
 *    the jackknife (walkSensitivity). When strong AR noise hides a random walk, one 60 s window tells the
 *    two apart only through its few lowest frequencies; a window whose walk happened to wander little gives
 *    a small fitted walk and small batch spreads together, and with the jackknife df alone the interval
 *    covered about 92% (bench/RESULTS.md). White noise keeps the jackknife df (no walk part).
 * 5. A second interval, wander_allowance, for a walk too small for the variogram to find: its upper
 *    restricted-likelihood bound (walkUpperBound) times what such a walk adds to the slope's variance beyond
 *    what the batches see (wanderAllowedVariance). In between "no walk" and a clear walk the main interval
 *    covers 64–84% in the seeded study; no interval can be as narrow as it and safe against walks of any size.
 * Why not the alternatives: the mean of K segment slopes (batch means) has K² times the variance of the
 * full-window slope under white noise; Newey–West on the residuals of the plain level regression fails
 * when the angle wanders (its residuals are then integrated noise). Segment rates (same noise model, per
 * equal-duration segment) are still reported so a drifting rate can be seen, with an F homogeneity test (segmentHomogeneityP).
 * @param t_s     frame times, seconds, strictly increasing (lost frames already removed)
 * @param angle_deg unwrapped angle, degrees, counterclockwise positive
 */
export function fitSteadyRate(t_s: Float64Array, angle_deg: Float64Array, options: SteadyRateOptions = {}): SteadyRateFit {
  const level = options.level ?? 0.95;
  const n = t_s.length;
  if (n < 10) throw new InputError(`a steady rate needs at least 10 valid frames, got ${n}`);
  const t0 = t_s[0]!;
  const y0 = angle_deg[0]!;
  const t = new Float64Array(n);
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    t[i] = t_s[i]! - t0;
    y[i] = angle_deg[i]! - y0;
  }
  const delta = medianInterval(t);
  if (liesOnALine(t, y)) {
    throw new InputError('the angles lie exactly on a straight line (no measurement noise at all), so no uncertainty can be estimated; this happens with hand-made or generated tables — measured angles always carry some noise');
  }

  const model = fitAngleNoiseModel(t, y);
  const whole = glsSlope(t, y, 0, n, model, 8, true);
  const df = jackknifeDfWithNoiseModel(whole.df, whole.walkKappa, logWalkVariance(model, delta, t[n - 1]!, n));
  const rate = estimate(whole.slope, whole.se, df, level);
  const zero = zeroTest(whole.slope, whole.se, df, { level, ...(options.margin_deg_s !== undefined ? { margin_deg_s: options.margin_deg_s } : {}) });
  const wander = allowForHiddenWalk(t, y, whole, model, rate, zero, df, level, options.margin_deg_s);

  // segment rates
  let k = options.segments ?? Math.max(2, Math.min(10, Math.floor(n / 50)));
  const duration = t[n - 1]!;
  let segments: SegmentRate[] = [];
  let segmentP: number | null = null;
  let jump: { p: number; within_deg_s: number } | null = null;
  const minRows = 10;
  for (; k >= 1; k--) {
    const bounds: number[] = [0];
    for (let s = 1; s < k; s++) {
      const edge = (duration * s) / k;
      let i = bounds[bounds.length - 1]!;
      while (i < n && t[i]! < edge) i++;
      bounds.push(i);
    }
    bounds.push(n);
    let ok = true;
    for (let s = 0; s < k; s++) if (bounds[s + 1]! - bounds[s]! < minRows) ok = false;
    if (!ok) continue;
    const fits = [];
    for (let s = 0; s < k; s++) fits.push(glsSlope(t, y, bounds[s]!, bounds[s + 1]!, model, 8));
    segments = fits.map((f, s) => ({
      t0_s: t0 + t[bounds[s]!]!,
      t1_s: t0 + t[bounds[s + 1]! - 1]!,
      rate_deg_s: estimate(f.slope, f.se, f.df, level),
    }));
    if (k > 1) {
      segmentP = segmentHomogeneityP(fits);
      jump = withinVersusWholeP(whole, fits);
    }
    break;
  }

  // level residuals for diagnostics and model choice
  const intercept = whole.intercept;
  const residuals = new Float64Array(n);
  for (let i = 0; i < n; i++) residuals[i] = y[i]! - intercept - whole.slope * t[i]!;
  let rss = 0;
  for (const e of residuals) rss += e * e;

  const warnings: string[] = [];
  const alpha = 1 - level;
  if (wander.hidden_walk_bound_deg_per_sqrt_s !== null && whole.se > 0 && zero.p_value < alpha && wander.zero_test.p_value >= alpha) {
    const [lo, hi] = wander.rate_deg_s.ci;
    warnings.push(
      `the rate differs from zero only if it does not wander by about ${wander.hidden_walk_bound_deg_per_sqrt_s.toPrecision(2)} deg/√s or more, which this window is too short to rule out; allowing for such wander the ${Math.round(level * 100)}% interval is ${lo.toPrecision(3)} to ${hi.toPrecision(3)} deg/s (p = ${wander.zero_test.p_value.toPrecision(2)}) — a longer window narrows it`,
    );
  }
  if (segmentP !== null && segmentP < 0.01) {
    warnings.push(
      `the segment rates differ more than the noise explains (p ${segmentP < 0.001 ? '< 0.001' : `= ${segmentP.toPrecision(2)}`}): the rate is not steady across the window, so the interval describes the window's mean rate`,
    );
  }
  if (jump !== null && jump.p < 0.001) {
    warnings.push(
      `the rate over the whole window (${whole.slope.toPrecision(4)} deg/s) disagrees with the rate inside its segments (${jump.within_deg_s.toPrecision(4)} deg/s; p ${jump.p < 1e-6 ? '< 1e-6' : `= ${jump.p.toPrecision(2)}`}): the angle jumps somewhere (a splice in the clip, a skipped turn, a tracking jump), so the interval does not describe the rotor; look at the angle plot and preview.png`,
    );
  }
  const result: SteadyResult = {
    rate_deg_s: rate,
    rate_rpm: scaleEstimate(rate, RPM_PER_DEG_S),
    rate_rev_s: scaleEstimate(rate, REV_S_PER_DEG_S),
    segments,
    zero_test: zero,
    min_detectable_deg_s: minDetectableRate(whole.se, df, level),
    wander_allowance: wander,
    ...(segmentP !== null ? { segment_p_value: segmentP } : {}),
    noise: {
      white_sd_deg: Math.sqrt(model.white_var_deg2),
      ar_sd_deg: Math.sqrt(model.ar_var_deg2),
      ar_time_s: model.ar_time_s,
      walk_deg_per_sqrt_s: Math.sqrt(model.walk_deg2_per_s),
      batches: whole.batches,
    },
  };
  const slope = whole.slope;
  return {
    result,
    candidate: { model: 'steady', n, k: 2, rss },
    residuals_deg: residuals,
    predict_deg: (ts: number) => y0 + intercept + slope * (ts - t0),
    rate_deg_s: () => slope,
    converged: true,
    warnings,
    noise: { ...model, batches: whole.batches, frame_interval_s: delta },
    df,
    jackknife_df: whole.df,
    model_se_deg_s: whole.modelSe,
    segment_p_value: segmentP,
  };
}
