import jstatModule from 'jstat';
import { localPolynomialAt, windowAround, type LocalPolynomialPoint } from './localPolynomialFit.js';
import { autocorrelation, longRunVarianceRatio } from './longRunVariance.js';
import { InputError } from '../errors.js';
import { medianInterval } from './medianInterval.js';

const { jStat } = jstatModule;

/** Options of smoothRate; every field has a default. */
export interface SmoothRateOptions {
  /** Half-width of the local window, seconds; default: chosen from the data (see smoothRate). */
  halfWidth_s?: number;
  /** Degree of the local polynomial (default 2). */
  order?: number;
  /** Confidence level of the pointwise band (default 0.95). */
  level?: number;
  /** At most this many output rows; longer series are evaluated at every k-th sample (default 20 000). */
  maxRows?: number;
  /**
   * The angle noise's covariance at a time lag, deg² (lag in s), when a noise model is known (e.g. the steady
   * fit's white + AR + random walk; a walk enters as −q·|lag|/2, exact for weights that sum to zero, as a
   * derivative's do). The band then uses each rate's exact variance wᵀCw instead of the residual-based
   * inflation, which the local fits themselves damp.
   */
  noiseCovariance?: (lag_s: number) => number;
}

/** Rows at which the model-based band factor is computed: at most this many, spread over the output rows. */
const COVARIANCE_ROWS = 40;

/** The smoothed angle and its derivative (the rows of rate.csv) with a pointwise band. */
export interface SmoothedRate {
  t_s: Float64Array;
  angle_deg: Float64Array;
  rate_deg_s: Float64Array;
  lo_deg_s: Float64Array;
  hi_deg_s: Float64Array;
  halfWidth_s: number;
  order: number;
  level: number;
  /** White-noise standard deviation of the angle around the local fits, deg. */
  noiseSd_deg: number;
  /** Long-run/plain variance ratio of the residuals used to widen the band (≥ 1). */
  bandInflation: number;
  /** How the window was chosen, in words. */
  windowRule: string;
}

const CV_POINTS = 4000;
const DIAGNOSTIC_BLOCK = 2000;

/** Indices at which residual diagnostics are computed: all samples, or 5 contiguous blocks of 2000 spread across a long series. */
function diagnosticIndices(n: number, maxRows: number): Int32Array {
  if (n <= maxRows) return Int32Array.from({ length: n }, (_, i) => i);
  const blocks = 5;
  const out: number[] = [];
  for (let b = 0; b < blocks; b++) {
    const start = Math.floor(((n - DIAGNOSTIC_BLOCK) * b) / (blocks - 1));
    for (let k = 0; k < DIAGNOSTIC_BLOCK; k++) out.push(start + k);
  }
  return Int32Array.from(out);
}

/** Evaluates the local fit at each index (sorted ascending), reusing the previous window as a hint. */
function evaluate(t_s: Float64Array, y: Float64Array, indices: ArrayLike<number>, h: number, order: number): (LocalPolynomialPoint | null)[] {
  const out: (LocalPolynomialPoint | null)[] = [];
  let hint: [number, number] | undefined;
  for (let k = 0; k < indices.length; k++) {
    const i = indices[k]!;
    const win = windowAround(t_s, i, h, order + 2, hint);
    hint = win;
    out.push(localPolynomialAt(t_s, y, i, win[0], win[1], h, order));
  }
  return out;
}

/**
 * h-block cross-validation score of a half-width (Burman, Chow & Nolan 1994, Biometrika 81:351): mean of
 * (y_i − ŷ_{−i})² where ŷ_{−i} is the local fit without the samples within `hole` of i. With hole = 0 this
 * is leave-one-out; a hole as long as the noise's correlation keeps the fit from following correlated noise.
 */
function crossValidation(t_s: Float64Array, y: Float64Array, indices: Int32Array, h: number, order: number, hole: number): number {
  let s = 0;
  let m = 0;
  let hint: [number, number] | undefined;
  for (let k = 0; k < indices.length; k++) {
    const i = indices[k]!;
    const win = windowAround(t_s, i, h, order + 2 + 2 * hole, hint);
    hint = win;
    const f = localPolynomialAt(t_s, y, i, win[0], win[1], h, order, hole);
    if (!f) continue;
    s += (y[i]! - f.value) ** 2;
    m++;
  }
  return m > 0 ? s / m : Infinity;
}

/** Lags (in samples) over which residuals stay correlated: the first lag whose autocorrelation falls below 0.2, at most 30. */
function correlationLength(res: ArrayLike<number>): number {
  const acf = autocorrelation(res, 30);
  const k = acf.findIndex((r) => r < 0.2);
  return k < 0 ? 30 : k;
}

/**
 * Median over up to COVARIANCE_ROWS output rows of Var(rate) under the noise covariance C, wᵀCw with w the
 * derivative's weights (found by fitting unit vectors: the local fit is linear in the data), divided by the
 * white-noise variance σ̂²·Σw² the band would otherwise start from.
 */
function modelVarianceRatio(t_s: Float64Array, outIdx: number[], h: number, order: number, cov: (lag_s: number) => number, white_var: number): number {
  const step = Math.max(1, Math.floor(outIdx.length / COVARIANCE_ROWS));
  const unit = new Float64Array(t_s.length);
  const ratios: number[] = [];
  for (let r = Math.floor(step / 2); r < outIdx.length; r += step) {
    const i = outIdx[r]!;
    const [lo, hi] = windowAround(t_s, i, h, order + 2);
    const w = new Float64Array(hi - lo + 1);
    let ok = true;
    for (let j = lo; j <= hi && ok; j++) {
      unit[j] = 1;
      const f = localPolynomialAt(t_s, unit, i, lo, hi, h, order);
      unit[j] = 0;
      if (!f || !Number.isFinite(f.rate)) ok = false;
      else w[j - lo] = f.rate;
    }
    if (!ok) continue;
    let v = 0;
    let ww = 0;
    for (let a = 0; a < w.length; a++) {
      ww += w[a]! * w[a]!;
      for (let b = 0; b < w.length; b++) v += w[a]! * w[b]! * cov(t_s[lo + a]! - t_s[lo + b]!);
    }
    if (ww > 0) ratios.push(v / (white_var * ww));
  }
  if (ratios.length === 0) return Number.NaN;
  ratios.sort((x, y) => x - y);
  return ratios[Math.floor(ratios.length / 2)]!;
}

/**
 * Smoothed angle and rotation rate by local polynomials in real time (the Savitzky–Golay filter on
 * possibly non-uniform frame times), with a pointwise band.
 * Window rule (when halfWidth_s is not given): among half-widths of (order+1+l)·δ·1.5^k (δ the median frame
 * interval) up to the smaller of 250·δ and a quarter of the series, the one with the least h-block
 * cross-validation error (crossValidation), scored on at most 4000 samples; the hole l is the residual
 * correlation length of the widest window (l = 0, plain leave-one-out, for white noise). Plain
 * leave-one-out would follow autocorrelated noise and pick far too narrow a window.
 * Band: rate ± t·σ̂·√(rateFactor·r), σ̂² = mean(e_i²)/mean(1 − H_ii) (unbiased for a local least-squares fit)
 * and r ≥ 1 the long-run-to-plain variance ratio of the residuals (the larger of the Bartlett estimate with
 * Andrews' bandwidth and the AR(1) ratio (1 + ρ₁)/(1 − ρ₁)), so the band widens for autocorrelated noise;
 * given a noise covariance (options.noiseCovariance), r is instead the model's exact variance of the rate
 * over σ̂²·rateFactor (modelVarianceRatio). The band covers noise, not the smoothing bias of a window that is too wide.
 * @param t_s frame times, seconds, strictly increasing
 * @param angle_deg unwrapped angle, degrees
 */
export function smoothRate(t_s: Float64Array, angle_deg: Float64Array, options: SmoothRateOptions = {}): SmoothedRate {
  const order = options.order ?? 2;
  const level = options.level ?? 0.95;
  const maxRows = Math.max(10, options.maxRows ?? 20000);
  const n = t_s.length;
  if (n < order + 2) throw new InputError(`smoothing a rate needs at least ${order + 2} samples, got ${n}`);
  const delta = medianInterval(t_s);
  const diag = diagnosticIndices(n, maxRows);

  let h: number;
  let hole = 0;
  let windowRule: string;
  if (options.halfWidth_s !== undefined) {
    if (!(options.halfWidth_s > 0)) throw new InputError(`the smoothing half-width must be positive, got ${options.halfWidth_s} s`);
    h = options.halfWidth_s;
    windowRule = `half-width ${h} s as given`;
  } else {
    const strideCv = Math.max(1, Math.floor(diag.length / CV_POINTS));
    const cvIdx = diag.filter((_, k) => k % strideCv === 0);
    const hMax = Math.max((order + 1) * delta, Math.min(250 * delta, (t_s[n - 1]! - t_s[0]!) / 4));
    // pilot: residual correlation length of the widest window sets the hole of the h-block CV
    const pilotIdx = diag.length > 2 * DIAGNOSTIC_BLOCK ? diag.slice(0, 2 * DIAGNOSTIC_BLOCK) : diag;
    const pilot = evaluate(t_s, angle_deg, pilotIdx, hMax, order);
    const pilotRes: number[] = [];
    pilot.forEach((f, k) => {
      if (f) pilotRes.push(angle_deg[pilotIdx[k]!]! - f.value);
    });
    hole = correlationLength(pilotRes);
    let best = Infinity;
    const hMin = (order + 1 + hole) * delta;
    h = Math.min(hMin, hMax);
    for (let cand = h; cand <= hMax * 1.0001; cand *= 1.5) {
      const score = crossValidation(t_s, angle_deg, cvIdx, cand, order, hole);
      if (score < best) {
        best = score;
        h = cand;
      }
    }
    windowRule = `half-width ${round(h)} s (${Math.round(h / delta)} frame intervals) chosen by h-block cross-validation leaving out ±${hole} neighbours`;
  }

  // Residual scale and band inflation from the diagnostic samples
  const diagFits = evaluate(t_s, angle_deg, diag, h, order);
  const res: number[] = [];
  let sumE2 = 0;
  let sumOneMinusH = 0;
  diagFits.forEach((f, k) => {
    if (!f) return;
    const e = angle_deg[diag[k]!]! - f.value;
    res.push(e);
    sumE2 += e * e;
    sumOneMinusH += 1 - f.valueFactor;
  });
  const noiseSd = sumOneMinusH > 0 ? Math.sqrt(sumE2 / sumOneMinusH) : 0;
  // long-run/plain variance ratio: the larger of the Bartlett estimate and the AR(1) value (1 + ρ)/(1 − ρ),
  // because the Bartlett estimate is biased low for strong correlation (Andrews 1991, §6)
  const rho1 = Math.min(0.99, Math.max(0, autocorrelation(res, 1)[0] ?? 0));
  let inflation = Math.max(1, longRunVarianceRatio(res), (1 + rho1) / (1 - rho1));

  const stride = Math.max(1, Math.ceil(n / maxRows));
  const outIdx: number[] = [];
  for (let i = 0; i < n; i += stride) outIdx.push(i);
  if (outIdx[outIdx.length - 1] !== n - 1) outIdx.push(n - 1);
  const fits = evaluate(t_s, angle_deg, outIdx, h, order);
  if (options.noiseCovariance && noiseSd > 0) {
    const ratio = modelVarianceRatio(t_s, outIdx, h, order, options.noiseCovariance, noiseSd * noiseSd);
    if (Number.isFinite(ratio) && ratio > 0) inflation = ratio;
  }
  const tq = jStat.studentt.inv(0.5 + level / 2, Math.max(1, n - order - 1));
  const m = outIdx.length;
  const result: SmoothedRate = {
    t_s: new Float64Array(m),
    angle_deg: new Float64Array(m),
    rate_deg_s: new Float64Array(m),
    lo_deg_s: new Float64Array(m),
    hi_deg_s: new Float64Array(m),
    halfWidth_s: h,
    order,
    level,
    noiseSd_deg: noiseSd,
    bandInflation: inflation,
    windowRule,
  };
  let k = 0;
  for (let j = 0; j < m; j++) {
    const f = fits[j];
    if (!f || !Number.isFinite(f.rate)) continue;
    const half = tq * noiseSd * Math.sqrt(f.rateFactor * inflation);
    result.t_s[k] = t_s[outIdx[j]!]!;
    result.angle_deg[k] = f.value;
    result.rate_deg_s[k] = f.rate;
    result.lo_deg_s[k] = f.rate - half;
    result.hi_deg_s[k] = f.rate + half;
    k++;
  }
  if (k < m) {
    for (const key of ['t_s', 'angle_deg', 'rate_deg_s', 'lo_deg_s', 'hi_deg_s'] as const) result[key] = result[key].slice(0, k);
  }
  return result;
}

function round(x: number): number {
  return Number(x.toPrecision(3));
}
