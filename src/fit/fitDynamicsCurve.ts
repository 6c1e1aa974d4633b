/**
 * Shared engine of the spin-up and coast-down fits: nonlinear least squares with autoregressive errors.
 *
 * 1. Levenberg–Marquardt from candidate starts (first on a thinned copy of the series, then on every point).
 * 2. An AR(P) model of the residuals, P chosen by AIC (see autoregressiveErrors.ts); P = 0 means white
 *    residuals and the ordinary covariance s²(JᵀJ)⁻¹ is used.
 * 3. Otherwise feasible generalised least squares: alternately re-estimate φ from the residuals and refit the
 *    curve to the whitened residuals a_t = e_t − Σφ_j·e_{t−j} (Cochrane & Orcutt 1949), which converges to
 *    the joint conditional least-squares estimate of curve and AR parameters. The covariance of the curve
 *    parameters is s_a²(J_aᵀJ_a)⁻¹ from the whitened problem, s_a² = Σa²/(n − P − k − P) (the AR
 *    coefficients count as fitted parameters), and intervals use Student's t with that many degrees of freedom.
 * 4. Up to `bootstrapMaxPoints` points, the interval half-widths are recalibrated by a bootstrap-t with an
 *    autoregressive sieve (see withBootstrap below); longer series are fitted to bin means (see below).
 * Our coverage study (bench/spinUpCoverage.mjs) motivated step 4: without it, 95% intervals covered about 90%
 * of the time on 360-point series with AR(1) noise of lag-1 correlation 0.8.
 */
import { repeatFreeRows } from './repeatFreeRows.js';
import { levenbergMarquardt, type LeastSquaresProblem, type LevenbergMarquardtResult } from './levenbergMarquardt.js';
import { chooseAutoregressiveOrder, fitAutoregression, whiten } from './autoregressiveErrors.js';
import { chooseBlockLength, circularBlockSampler, monteCarloCriticalValue } from './blockBootstrap.js';
import { DynamicsFitError } from './DynamicsFitError.js';

/** A curve with k parameters: `evaluate` returns the value at time t (s, relative to the window start) and fills ∂value/∂p into `grad`. */
export interface CurveModel {
  k: number;
  evaluate: (p: Float64Array, t: number, grad: Float64Array) => number;
  /**
   * Optional: why the curve with parameters p cannot describe the window (one sentence), or null. Asked of
   * the first-pass fit when it stopped at its iteration limit (still drifting along a flat valley towards
   * the edge of the parameter space) and of the fit with autoregressive errors before its bootstrap; a
   * reason ends the fit with a DynamicsFitError, saving work whose result would be thrown away.
   */
  outsideWindow?: (p: Float64Array) => string | null;
}

export interface DynamicsCurveOptions {
  /** Confidence level the bootstrap-t quantiles are computed for. Default 0.95. */
  level?: number;
  /** Bootstrap-t replicates (0 turns the bootstrap off). Default 199. */
  replicates?: number;
  /** Seed of the bootstrap. Default 1. */
  seed?: number;
  /** Longest series that gets the bootstrap-t calibration; longer ones are fitted to bin means with Student's t. Default 5000. */
  bootstrapMaxPoints?: number;
  /** Bins used for series longer than `bootstrapMaxPoints`. Default 2000. */
  binnedPoints?: number;
  /** Largest AR order tried for the residuals. Default 8. */
  maxArOrder?: number;
  /** Points kept for the start-value search and the first LM pass. Default 1500. */
  thinnedPoints?: number;
}

export interface DynamicsCurveFit {
  /** Curve parameters (internal scale of the model). */
  params: Float64Array;
  /** Covariance of the parameters, row-major k×k. */
  covariance: Float64Array;
  /** Degrees of freedom for Student-t intervals. */
  dof: number;
  /** Raw residuals y − f(t), same length as the data. */
  residuals: Float64Array;
  /** Σ residuals². */
  rss: number;
  /** AR coefficients of the residuals (empty when white). */
  phi: Float64Array;
  converged: boolean;
  reason: string;
  /** Per parameter, the bootstrap quantile of |t*| at the requested level (null: use Student's t at `dof`). */
  tQuantile: Float64Array | null;
  /** How the bootstrap went (null when not run). */
  bootstrap: { replicates: number; failed: number; blockLength: number } | null;
}

/** Iterations of the first pass on the thinned series: each start is screened with the first few, the best continues. */
const PRE_ITERATIONS = 200;
const PRE_SCREEN_ITERATIONS = 30;

/**
 * Convergence tolerances for statistical fits: parameters to ~1e-6 of their scale, far below their standard
 * errors (the defaults of levenbergMarquardt are tighter, for reference problems such as NIST StRD).
 */
const STATISTICAL_TOLERANCE = { ftol: 1e-12, xtol: 1e-9 };

/** Residuals y − f(t) of `model` with parameters p at every point, into `out`. */
function curveResiduals(model: CurveModel, p: Float64Array, t: Float64Array, y: Float64Array, out: Float64Array): void {
  const grad = new Float64Array(model.k);
  for (let i = 0; i < t.length; i++) out[i] = y[i]! - model.evaluate(p, t[i]!, grad);
}

/**
 * The least-squares problem of fitting `model` to (t, y). `evaluate` yields the gradient with every value,
 * so the residual pass keeps the Jacobian and a Jacobian request at the same parameters (Levenberg–Marquardt
 * asks for one after each accepted step) is a copy, not a second pass over the data.
 */
export function curveProblem(model: CurveModel, t: Float64Array, y: Float64Array): LeastSquaresProblem {
  const n = t.length;
  const k = model.k;
  const grad = new Float64Array(k);
  const kept = new Float64Array(n * k);
  const keptAt = new Float64Array(k).fill(NaN);
  const isKept = (p: Float64Array) => {
    for (let j = 0; j < k; j++) if (p[j] !== keptAt[j]) return false;
    return true;
  };
  return {
    n,
    residuals: (p, r) => {
      keptAt.fill(NaN);
      for (let i = 0; i < n; i++) {
        r[i] = y[i]! - model.evaluate(p, t[i]!, grad);
        for (let j = 0; j < k; j++) kept[j * n + i] = grad[j]!;
      }
      keptAt.set(p);
    },
    jacobian: (p, jac) => {
      if (isKept(p)) {
        jac.set(kept);
        return;
      }
      for (let i = 0; i < n; i++) {
        model.evaluate(p, t[i]!, grad);
        for (let j = 0; j < k; j++) jac[j * n + i] = grad[j]!;
      }
    },
  };
}

/** The problem of fitting `model` to (t, y) with AR(φ) errors: residuals and Jacobian whitened, n − P rows. */
function whitenedProblem(model: CurveModel, t: Float64Array, y: Float64Array, phi: Float64Array): LeastSquaresProblem {
  const n = t.length;
  const k = model.k;
  const order = phi.length;
  const m = n - order;
  const raw = curveProblem(model, t, y);
  const e = new Float64Array(n);
  const g = new Float64Array(n * k);
  return {
    n: m,
    residuals: (p, r) => {
      raw.residuals(p, e);
      whiten(e, phi, r);
    },
    jacobian: (p, jac) => {
      raw.jacobian(p, g);
      for (let j = 0; j < k; j++) whiten(g.subarray(j * n, (j + 1) * n), phi, jac, j * m);
    },
  };
}

/** Every m-th point so that at most `maxPoints` remain (always keeps the last point). */
export function thinSeries(t: Float64Array, y: Float64Array, maxPoints: number): { t: Float64Array; y: Float64Array } {
  const n = t.length;
  if (n <= maxPoints) return { t, y };
  const step = Math.ceil(n / maxPoints);
  const count = Math.ceil(n / step);
  const tt = new Float64Array(count);
  const yy = new Float64Array(count);
  for (let i = 0, j = 0; j < count; i += step, j++) {
    tt[j] = t[Math.min(i, n - 1)]!;
    yy[j] = y[Math.min(i, n - 1)]!;
  }
  tt[count - 1] = t[n - 1]!;
  yy[count - 1] = y[n - 1]!;
  return { t: tt, y: yy };
}

/** Fewest points left after dropping repeats for the repeat-free fit to be used. */
const MIN_AFTER_REPEATS = 20;

/**
 * Fits `model` to (t, y) from the best of `starts`, then refits with autoregressive errors.
 * A value exactly equal to the one before it is left out of the fit (the first of a run is kept): a moving or
 * noisy marker never repeats its angle to the last digit, a compressed video's still picture does (the codec
 * repeats the block), and such frames carry no noise, so a rotor at rest before a spin-up or after a coast-down
 * made the noise look smaller than it is (on 12 seeded crf-23 spin-ups the 95 % intervals held onset, terminal
 * rate and τ 4, 7 and 5 times; without the repeats 9, 8 and 8). Residuals and rss are returned for every point.
 * @param t times, s, relative to the window start, increasing
 * @param y observed values (angle, deg)
 */
export function fitDynamicsCurve(model: CurveModel, t: Float64Array, y: Float64Array, starts: Float64Array[], options: DynamicsCurveOptions = {}): DynamicsCurveFit {
  const keep = repeatFreeRows(y);
  if (keep.length === y.length || keep.length < MIN_AFTER_REPEATS) return fitDistinctPoints(model, t, y, starts, options);
  const fit = fitDistinctPoints(model, Float64Array.from(keep, (i) => t[i]!), Float64Array.from(keep, (i) => y[i]!), starts, options);
  const residuals = new Float64Array(y.length);
  curveResiduals(model, fit.params, t, y, residuals);
  let rss = 0;
  for (const e of residuals) rss += e * e;
  return { ...fit, residuals, rss };
}

/** fitDynamicsCurve on points taken as they are. */
function fitDistinctPoints(model: CurveModel, t: Float64Array, y: Float64Array, starts: Float64Array[], options: DynamicsCurveOptions): DynamicsCurveFit {
  const n = t.length;
  const k = model.k;
  const thin = thinSeries(t, y, options.thinnedPoints ?? 1500);
  const thinProblem = curveProblem(model, thin.t, thin.y);
  const preOptions = { covariance: false, ftol: 1e-12, xtol: 1e-10 };
  // Every start gets a short run and only the best one continues to the full budget of 200 iterations: a
  // start that drifts along a flat valley (e.g. a spin-up fitted to a steady series) then costs its
  // budget once instead of once per start.
  let pre: LevenbergMarquardtResult | null = null;
  for (const start of starts) {
    try {
      const run = levenbergMarquardt(thinProblem, start, { ...preOptions, maxIterations: PRE_SCREEN_ITERATIONS });
      if (!pre || run.rss < pre.rss) pre = run;
    } catch {
      // the model is not finite at this start: skip it
    }
  }
  let best: Float64Array = pre ? pre.params : starts[0]!;
  if (pre && !pre.converged) {
    try {
      const more = levenbergMarquardt(thinProblem, pre.params, { ...preOptions, maxIterations: PRE_ITERATIONS - PRE_SCREEN_ITERATIONS });
      best = more.params;
      const reason = more.converged ? null : (model.outsideWindow?.(best) ?? null);
      if (reason) throw new DynamicsFitError(reason);
    } catch (err) {
      if (err instanceof DynamicsFitError) throw err;
      // keep the screened parameters
    }
  }
  if (n > (options.bootstrapMaxPoints ?? 5000)) {
    // Long series: fit with AR errors to bin means (cheap, and for a smooth curve the bins keep nearly all
    // the information), comparing each bin mean with the curve's average over the bin (2-point
    // Gauss–Legendre), so binning adds no bias; then residuals on every point.
    const bins = binSeries(t, y, options.binnedPoints ?? 2000);
    const coarse = fitWithArErrors(binAveragedModel(model, bins.from_s, bins.to_s), bins.index, bins.y, best, options.maxArOrder ?? 8);
    if (!coarse) throw new RangeError('The model is not finite at the best start.');
    const residuals = new Float64Array(n);
    curveResiduals(model, coarse.params, t, y, residuals);
    let rss = 0;
    for (let i = 0; i < n; i++) rss += residuals[i]! * residuals[i]!;
    return { ...coarse, residuals, rss };
  }
  const fit = fitWithArErrors(model, t, y, best, options.maxArOrder ?? 8);
  if (!fit) throw new RangeError('The model is not finite at the best start.');
  // The bootstrap recalibrates intervals only: a curve that cannot describe the window, or parameters
  // without a finite standard error, are final without it.
  const outside = model.outsideWindow?.(fit.params) ?? null;
  if (outside) throw new DynamicsFitError(outside);
  for (let j = 0; j < k; j++) if (!Number.isFinite(fit.covariance[j * k + j]!)) return fit;
  return withBootstrap(model, t, fit, options);
}

/**
 * Consecutive bins of equal point count (at most `maxBins`): mean y, the time span each bin's samples
 * represent ([first − h/2, last + h/2] with h the bin's mean spacing), and the bin index 0…count−1.
 */
export function binSeries(t: Float64Array, y: Float64Array, maxBins: number): { index: Float64Array; y: Float64Array; from_s: Float64Array; to_s: Float64Array } {
  const n = t.length;
  const size = Math.ceil(n / maxBins);
  const count = Math.ceil(n / size);
  const index = new Float64Array(count);
  const yb = new Float64Array(count);
  const from_s = new Float64Array(count);
  const to_s = new Float64Array(count);
  for (let b = 0; b < count; b++) {
    const first = b * size;
    const last = Math.min(n, first + size) - 1;
    let sy = 0;
    for (let i = first; i <= last; i++) sy += y[i]!;
    yb[b] = sy / (last - first + 1);
    const h = last > first ? (t[last]! - t[first]!) / (last - first) : 0;
    from_s[b] = t[first]! - h / 2;
    to_s[b] = t[last]! + h / 2;
    index[b] = b;
  }
  return { index, y: yb, from_s, to_s };
}

/** The curve averaged over bin b's time span by 2-point Gauss–Legendre quadrature; its "time" argument is the bin index b. */
function binAveragedModel(model: CurveModel, from_s: Float64Array, to_s: Float64Array): CurveModel {
  const g1 = new Float64Array(model.k);
  const node = 1 / (2 * Math.sqrt(3));
  return {
    k: model.k,
    evaluate: (p, b, grad) => {
      const mid = (from_s[b]! + to_s[b]!) / 2;
      const half = (to_s[b]! - from_s[b]!) * node;
      const v1 = model.evaluate(p, mid - half, g1);
      const v2 = model.evaluate(p, mid + half, grad);
      for (let j = 0; j < model.k; j++) grad[j] = (grad[j]! + g1[j]!) / 2;
      return (v1 + v2) / 2;
    },
  };
}

/** Largest AR order tried for the residuals of a k-parameter curve fitted to n points: `maxArOrder`, and at most one per 20 residual degrees of freedom. */
function arOrderCap(n: number, k: number, maxArOrder: number): number {
  return Math.min(maxArOrder, Math.floor((n - k) / 20));
}

/** From a start: OLS fit, AR order, then feasible GLS; null when the model cannot be evaluated. */
function fitWithArErrors(model: CurveModel, t: Float64Array, y: Float64Array, start: Float64Array, maxArOrder: number, maxIterations = 100): DynamicsCurveFit | null {
  const n = t.length;
  const k = model.k;
  let ols: LevenbergMarquardtResult;
  try {
    ols = levenbergMarquardt(curveProblem(model, t, y), start, { maxIterations, ...STATISTICAL_TOLERANCE });
  } catch {
    return null;
  }
  const order = chooseAutoregressiveOrder(ols.residuals, arOrderCap(n, k, maxArOrder));
  let sumSqY = 0;
  for (let i = 0; i < n; i++) sumSqY += y[i]! * y[i]!;
  // An exact fit (residuals at rounding level) carries no information about the noise: keep the OLS answer.
  if (order === 0 || ols.rss <= 1e-24 * sumSqY) {
    return { params: ols.params, covariance: ols.covariance, dof: ols.dof, residuals: ols.residuals, rss: ols.rss, phi: new Float64Array(0), converged: ols.converged, reason: ols.reason, tQuantile: null, bootstrap: null };
  }
  let p = ols.params;
  let e = ols.residuals;
  let phi = fitAutoregression(e, order);
  let gls: LevenbergMarquardtResult = ols;
  for (let round = 0; round < 8; round++) {
    gls = levenbergMarquardt(whitenedProblem(model, t, y, phi), p, { maxIterations: round === 0 ? maxIterations : 30, ...STATISTICAL_TOLERANCE });
    p = gls.params;
    e = new Float64Array(n);
    curveResiduals(model, p, t, y, e);
    const next = fitAutoregression(e, order);
    let change = 0;
    for (let j = 0; j < order; j++) change = Math.max(change, Math.abs(next[j]! - phi[j]!));
    phi = next;
    if (change < 1e-3) break;
  }
  const m = n - order;
  const dof = m - k - order;
  // The whitened LM covariance used s² = Σa²/(m − k); count the AR coefficients as fitted too.
  const covariance = gls.covariance.map((v) => (v * (m - k)) / dof);
  let rss = 0;
  for (let i = 0; i < n; i++) rss += e[i]! * e[i]!;
  return { params: p, covariance, dof, residuals: e, rss, phi, converged: gls.converged, reason: gls.reason, tQuantile: null, bootstrap: null };
}

/**
 * Bootstrap-t calibration of the intervals (Efron & Tibshirani 1993, ch. 12; symmetric form, Hall 1988) with
 * an autoregressive sieve bootstrap of the noise (Kreiss 1992; Bühlmann 1997): each replicate rebuilds noise
 * from an AR driven by circular-block-resampled innovations (blocks keep any dependence the AR model
 * missed; the block length is chosen from the innovations and is 1 when they are white), adds it to the
 * fitted curve and repeats the whole fit, AR order selection included; |t*| = |q* − q̂|/se* gives the
 * interval half-width in units of se, read off as the ⌈(B + 1)·level⌉-th smallest of the B values
 * (monteCarloCriticalValue in blockBootstrap.ts).
 *
 * Generating order. The sieve's order must be allowed to grow with n (Bühlmann 1997) so that the bootstrap
 * world holds the weak long-lag dependence that the AIC order of a short series often misses. Tracking noise
 * is typically a slow AR wander plus white measurement noise, an ARMA(1,1) whose AR(∞) coefficients beyond
 * the first are small but add up: with lag-1 correlation 0.8 and 360 points AIC picks AR(1) for a third of
 * the series, and those understate the noise's low-frequency power and so the standard errors. A bootstrap
 * world generated from that same AR(1) cannot reproduce the understatement (there, AR(1) is the truth), so
 * its |t*| quantiles are too small exactly when they most need to be large. The noise is therefore generated
 * from an AR of the largest order the selection may pick (when the residuals are not white), while every
 * refit selects its own order by AIC as the original fit did.
 *
 * Persistence. In short series the curve absorbs part of the slow noise, so fitted AR coefficients
 * understate its persistence. As in Kilian's (1998) bootstrap-after-bootstrap, a first stage of B/4
 * replicates measures how the persistence estimate Σφ̂ (as the fit computes it: AIC order) falls short of
 * the generator's Σφ, and the second stage simulates from the generator's coefficients scaled so that its Σφ
 * exceeds the observed Σφ̂ by that shortfall (capped at Σφ = 0.98 to stay stationary); with a generator of
 * the selected order this is exactly Kilian's correction, and in general it is one step of indirect
 * inference (Gouriéroux, Monfort & Renault 1993): the bootstrap world is chosen so that the fit's own
 * persistence estimate is, on average, what was observed.
 *
 * Uncertain persistence. That correction fixes the persistence's mean shortfall, but the observed Σφ̂ is one
 * draw from a wide sampling distribution, and a world fixed at its corrected value ignores that spread. It
 * matters because the spread is coupled with the estimate's error: a series in which the curve absorbed
 * much slow noise has both a large error and a low Σφ̂, so its single world is too weakly correlated and
 * its critical value too small. Each stage-2 replicate r therefore simulates from the generator scaled to
 * Σφ̂ + Σφ_gen − Σφ̂*_{r'}, with Σφ̂*_{r'} the persistence estimate of stage-1 replicate r' = r mod (stage-1
 * count): the stage-1 deviations reflected about the observed value, as the basic bootstrap reflects a
 * parameter's bootstrap deviations (Davison & Hinkley 1997, §5.2; from memory). Their mean is Kilian's
 * corrected value, so on average nothing moves; |t*| is pooled over these worlds, i.e. the critical value
 * is averaged over the nuisance parameter's estimated sampling distribution instead of taken at its point
 * estimate. The combination is ours (no published source), checked by bench/spinUpCoverage.mjs: in a
 * world built from the true noise and curve the same |t*| quantile covers τ in 94.7% / 93.5% (seed sets 1
 * and 2, AR(1) ρ = 0.9 plus white noise, 1000 series each), the plug-in world 93.3% / 92.8%, this mixture
 * 93.6% / 93.6%; figures and rejected alternatives in bench/RESULTS.md.
 */
function withBootstrap(model: CurveModel, t: Float64Array, fit: DynamicsCurveFit, options: DynamicsCurveOptions): DynamicsCurveFit {
  const n = t.length;
  const k = model.k;
  const replicates = options.replicates ?? 199;
  if (replicates < 20 || n > (options.bootstrapMaxPoints ?? 5000)) return fit;
  const level = options.level ?? 0.95;
  const maxArOrder = options.maxArOrder ?? 8;
  const selected = fit.phi.length;
  const order = selected === 0 ? 0 : Math.max(selected, arOrderCap(n, k, maxArOrder));
  const generator = order === selected ? fit.phi : fitAutoregression(fit.residuals, order);
  const innovations = new Float64Array(n - order);
  whiten(fit.residuals, generator, innovations);
  let mean = 0;
  for (const a of innovations) mean += a;
  mean /= innovations.length;
  for (let i = 0; i < innovations.length; i++) innovations[i] = innovations[i]! - mean;
  const sampler = circularBlockSampler(innovations, chooseBlockLength(innovations), options.seed ?? 1);
  const burn = Math.min(200, 10 * Math.max(order, 1));
  const drawn = new Float64Array(innovations.length);
  const fitted = new Float64Array(n);
  const grad = new Float64Array(k);
  for (let i = 0; i < n; i++) fitted[i] = model.evaluate(fit.params, t[i]!, grad);
  const yStar = new Float64Array(n);
  const noise = new Float64Array(n + burn);

  /** One replicate: noise from AR(phi), refit; null when the refit fails. */
  const replicate = (phi: Float64Array): DynamicsCurveFit | null => {
    let cursor = drawn.length;
    for (let i = 0; i < n + burn; i++) {
      if (cursor === drawn.length) {
        sampler.resample(drawn);
        cursor = 0;
      }
      let v = drawn[cursor++]!;
      for (let j = 0; j < phi.length && i - j - 1 >= 0; j++) v += phi[j]! * noise[i - j - 1]!;
      noise[i] = v;
    }
    for (let i = 0; i < n; i++) yStar[i] = fitted[i]! + noise[burn + i]!;
    return fitWithArErrors(model, t, yStar, fit.params, maxArOrder, 50);
  };
  const sum = (phi: Float64Array) => phi.reduce((a, b) => a + b, 0);

  // Stage 1: shortfall of the fit's persistence estimate Σφ̂ against the generator's Σφ.
  let phi = generator;
  const sumHat = sum(fit.phi);
  const sumGenerator = sum(generator);
  const persistence: number[] = [];
  if (order > 0 && sumHat > 0 && sumGenerator > 0) {
    let total = 0;
    let count = 0;
    const stage1 = Math.max(20, Math.floor(replicates / 4));
    for (let r = 0; r < stage1; r++) {
      const f = replicate(generator);
      if (f) {
        total += sum(f.phi);
        persistence.push(sum(f.phi));
        count++;
      }
    }
    const shortfall = count > 0 ? sumGenerator - total / count : 0;
    const target = Math.min(0.98, sumHat + shortfall);
    if (target > 0) phi = generator.map((v) => (v * target) / sumGenerator);
  }
  /** Generator of stage-2 replicate r: scaled to persistence Σφ̂ + Σφ_gen − Σφ̂*_{r'} (stage-1 draw r' = r mod count), within [0, 0.98]. */
  const worldOf = (r: number): Float64Array => {
    if (persistence.length === 0) return phi;
    const target = Math.min(0.98, Math.max(0, sumHat + sumGenerator - persistence[r % persistence.length]!));
    return generator.map((v) => (v * target) / sumGenerator);
  };

  // Stage 2: bootstrap-t.
  const tAbs: Float64Array[] = Array.from({ length: k }, () => new Float64Array(replicates));
  let used = 0;
  let failed = 0;
  for (let r = 0; r < replicates; r++) {
    const f = replicate(worldOf(r));
    if (!f) {
      failed++;
      continue;
    }
    let ok = true;
    for (let j = 0; j < k; j++) {
      const v = Math.abs(f.params[j]! - fit.params[j]!) / Math.sqrt(f.covariance[j * k + j]!);
      if (!Number.isFinite(v)) ok = false;
      tAbs[j]![used] = v;
    }
    if (ok) used++;
    else failed++;
  }
  if (used < 20) return fit;
  const tQuantile = new Float64Array(k);
  for (let j = 0; j < k; j++) tQuantile[j] = monteCarloCriticalValue(tAbs[j]!.subarray(0, used), level);
  return { ...fit, tQuantile, bootstrap: { replicates: used, failed, blockLength: sampler.blockLength } };
}
