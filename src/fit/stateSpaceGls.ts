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
