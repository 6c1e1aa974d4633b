import type { AngleNoiseModel } from './angleNoiseModel.js';

/** The whitened regression y* = c·one* + ω·t* + e* produced by kalmanWhiten (innovations divided by their SD). */
export interface WhitenedRegression {
  one: Float64Array;
  t: Float64Array;
  y: Float64Array;
}

/**
 * Whitens the regression y_k = c + ω·t_k + u_k, u = white + AR(1) + random walk (an AngleNoiseModel), by a
 * Kalman filter on the noise state (AR part, walk part) run over y and over both regressors with the same
 * gains: the standardised innovations turn generalised least squares into ordinary least squares
 * (Harvey, Forecasting, Structural Time Series Models and the Kalman Filter, 1989, §3.4; the
 * "diffuse regression" form of Kalman GLS). Irregular times are exact: the AR coefficient over Δt is
 * exp(−Δt/τ_c) and the walk variance q·Δt. The walk starts at 0 (its level is absorbed by c) and the AR
 * part from its stationary distribution.
 * @param lo,hi row range [lo, hi)
 */
export function kalmanWhiten(t: Float64Array, y: Float64Array, lo: number, hi: number, model: AngleNoiseModel): WhitenedRegression {
  const gains = kalmanGains(t, lo, hi, model);
  return {
    one: whitenWithGains(gains, () => 1),
    t: whitenWithGains(gains, (i) => t[lo + i]!),
    y: whitenWithGains(gains, (i) => y[lo + i]!),
  };
}

/** The per-row Kalman quantities of kalmanWhiten for one noise model and time grid (relative row index). */
export interface KalmanGains {
  /** AR coefficient from the previous row (0 on the first). */
  phi: Float64Array;
  /** Gains of the AR and walk states. */
  gainAr: Float64Array;
  gainWalk: Float64Array;
  /** Innovation SD, deg. */
  sd: Float64Array;
}

/** The Kalman gains and innovation SDs of the noise state on rows [lo, hi): the covariance recursion of kalmanWhiten, shared by every series it whitens. */
export function kalmanGains(t: Float64Array, lo: number, hi: number, model: AngleNoiseModel): KalmanGains {
  const m = hi - lo;
  const out: KalmanGains = { phi: new Float64Array(m), gainAr: new Float64Array(m), gainWalk: new Float64Array(m), sd: new Float64Array(m) };
  const s2 = model.ar_var_deg2;
  const q = model.walk_deg2_per_s;
  const total = model.white_var_deg2 + s2 + q * Math.max(0, t[hi - 1]! - t[lo]!);
  // a tiny white floor keeps every innovation variance positive (e.g. a pure random walk's first frame)
  const r = Math.max(model.white_var_deg2, 1e-10 * total, Number.MIN_VALUE);
  let p11 = s2;
  let p12 = 0;
  let p22 = 0;
  for (let k = lo; k < hi; k++) {
    const i = k - lo;
    if (k > lo) {
      const dt = t[k]! - t[k - 1]!;
      const phi = s2 > 0 ? Math.exp(-dt / model.ar_time_s) : 0;
      p11 = phi * phi * p11 + s2 * (1 - phi * phi);
      p12 = phi * p12;
      p22 = p22 + q * dt;
      out.phi[i] = phi;
    }
    const h1 = p11 + p12;
    const h2 = p12 + p22;
    const f = h1 + h2 + r;
    const k1 = h1 / f;
    const k2 = h2 / f;
    out.sd[i] = Math.sqrt(f);
    out.gainAr[i] = k1;
    out.gainWalk[i] = k2;
    const n11 = p11 - k1 * h1;
    const n12 = p12 - k1 * h2;
    const n22 = p22 - k2 * h2;
    p11 = n11;
    p12 = n12;
    p22 = n22;
  }
  return out;
}

/**
 * Whitens the series that is 0 before relative row `from` and `y` (relative rows) from there on, with gains
 * from kalmanGains: the same standardised innovations kalmanWhiten gives for it (zero before `from`).
 */
export function whitenWithGains(gains: KalmanGains, y: (i: number) => number, from = 0): Float64Array {
  const m = gains.sd.length;
  const out = new Float64Array(m);
  let a = 0;
  let w = 0;
  for (let i = from; i < m; i++) {
    if (i > from) a *= gains.phi[i]!;
    const e = y(i) - a - w;
    out[i] = e / gains.sd[i]!;
    a += gains.gainAr[i]! * e;
    w += gains.gainWalk[i]! * e;
  }
  return out;
}

/**
 * Restricted (REML) log-likelihood of the trend regression y_k = c + ω·t_k + u_k under a noise model, up to a
 * constant: −½[Σ_k ln F_k + ln det(X*ᵀX*) + RSS*], with F_k the Kalman innovation variances (kalmanGains), X* the
 * whitened design [1, t] and RSS* the whitened least-squares residual sum — the prediction-error decomposition of
 * the Gaussian likelihood (Harvey 1989, §3.4) with the regression coefficients integrated out (Patterson &
 * Thompson 1971, Biometrika 58:545). Rows [lo, hi).
 */
export function restrictedLogLikelihood(t: Float64Array, y: Float64Array, lo: number, hi: number, model: AngleNoiseModel): number {
  const gains = kalmanGains(t, lo, hi, model);
  // the three whitenings of whitenWithGains (constant, time, angle) in one pass, summed as they go
  let a1 = 0, w1 = 0, a2 = 0, w2 = 0, a3 = 0, w3 = 0;
  let logF = 0, s11 = 0, s12 = 0, s22 = 0, s1y = 0, s2y = 0, syy = 0;
  for (let i = 0; i < hi - lo; i++) {
    const phi = gains.phi[i]!;
    const ka = gains.gainAr[i]!;
    const kw = gains.gainWalk[i]!;
    const sd = gains.sd[i]!;
    a1 *= phi; a2 *= phi; a3 *= phi;
    const e1 = 1 - a1 - w1;
    const e2 = t[lo + i]! - t[lo]! - a2 - w2;
    const e3 = y[lo + i]! - a3 - w3;
    a1 += ka * e1; w1 += kw * e1;
    a2 += ka * e2; w2 += kw * e2;
    a3 += ka * e3; w3 += kw * e3;
    const x1 = e1 / sd;
    const x2 = e2 / sd;
    const z = e3 / sd;
    logF += 2 * Math.log(sd);
    s11 += x1 * x1;
    s12 += x1 * x2;
    s22 += x2 * x2;
    s1y += x1 * z;
    s2y += x2 * z;
    syy += z * z;
  }
  const det = s11 * s22 - s12 * s12;
  const c0 = (s22 * s1y - s12 * s2y) / det;
  const c1 = (s11 * s2y - s12 * s1y) / det;
  const rss = syy - c0 * s1y - c1 * s2y;
  return -0.5 * (logF + Math.log(det) + rss);
}
