import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { uniformInt } from 'pure-rand/distribution/uniformInt';
import { type Ellipse, EllipseFitFailure, fitCentredEllipse, fitEllipse } from './fitEllipse.js';
import { median, percentileInterval95, sampleSd } from './sampleSummaries.js';

export interface RobustEllipseOptions {
  /** Known centre, px: fit only the axes and orientation about it. */
  centre?: { x_px: number; y_px: number };
  /** Points further than this many robust standard deviations from the ellipse are rejected (default 4). */
  reject_sigma?: number;
  /** Never reject points closer than this, px (default 0.5). */
  min_reject_px?: number;
  /** Bootstrap resamples for the standard errors (default 200). */
  resamples?: number;
  /** At most this many points go into the bootstrap (evenly thinned; default 600). */
  bootstrap_points?: number;
  seed?: number;
}

export interface RobustEllipseFit {
  ellipse: Ellipse;
  /** 1 for a point kept in the final fit, 0 for a rejected one (same order as the input). */
  inlier: Uint8Array;
  /** RMS distance of the kept points from the ellipse, px (Sampson approximation). */
  rms_px: number;
  /** Bootstrap standard errors (0 for a quantity that was given, not fitted). */
  se: { cx_px: number; cy_px: number; axis_ratio: number; major_axis_deg: number };
  /** Bootstrap percentile intervals (2.5 %, 97.5 %) of the same quantities. */
  ci95: { cx_px: [number, number]; cy_px: [number, number]; axis_ratio: [number, number] };
}

/**
 * Ellipse fit with outlier rejection: direct least squares (Halíř–Flusser), then repeatedly drop points
 * whose Sampson distance exceeds reject_sigma × 1.4826 × MAD (a robust σ; common practice, no source) and
 * refit, until the kept set stops changing (at most 6 rounds). Standard errors come from a seeded
 * bootstrap over an evenly thinned subset of the kept points; since neighbouring frames' errors are
 * usually correlated, thinning makes the errors conservative rather than optimistic.
 */
export function fitEllipseRobust(x_px: Float64Array, y_px: Float64Array, options: RobustEllipseOptions = {}): RobustEllipseFit {
  const rejectSigma = options.reject_sigma ?? 4;
  const minReject = options.min_reject_px ?? 0.5;
  const n = x_px.length;
  const fit = (xs: ArrayLike<number>, ys: ArrayLike<number>): Ellipse =>
    options.centre ? fitCentredEllipse(xs, ys, options.centre.x_px, options.centre.y_px) : fitEllipse(xs, ys);
  const inlier = new Uint8Array(n).fill(1);
  let ellipse = fit(x_px, y_px);
  const dist = new Float64Array(n);
  for (let round = 0; round < 6; round++) {
    for (let i = 0; i < n; i++) dist[i] = Math.abs(sampsonDistance(ellipse, x_px[i], y_px[i]));
    const kept = Array.from(dist).filter((_, i) => inlier[i]);
    const sigma = 1.4826 * median(kept);
    const limit = Math.max(minReject, rejectSigma * sigma);
    let changed = false;
    for (let i = 0; i < n; i++) {
      const keep = dist[i] <= limit ? 1 : 0;
      if (keep !== inlier[i]) changed = true;
      inlier[i] = keep;
    }
    if (!changed) break;
    const { xs, ys } = select(x_px, y_px, inlier);
    ellipse = fit(xs, ys);
  }
  const { xs, ys } = select(x_px, y_px, inlier);
  let ss = 0;
  for (let i = 0; i < xs.length; i++) ss += sampsonDistance(ellipse, xs[i], ys[i]) ** 2;
  const rms = Math.sqrt(ss / Math.max(1, xs.length));

  // Bootstrap on an evenly thinned subset
  const maxPoints = options.bootstrap_points ?? 600;
  const stride = Math.max(1, Math.ceil(xs.length / maxPoints));
  const tx: number[] = [];
  const ty: number[] = [];
  for (let i = 0; i < xs.length; i += stride) {
    tx.push(xs[i]);
    ty.push(ys[i]);
  }
  const resamples = options.resamples ?? 200;
  const rng = xoroshiro128plus(options.seed ?? 1);
  const bx: number[] = [];
  const by: number[] = [];
  const br: number[] = [];
  const ba: number[] = [];
  const rx = new Float64Array(tx.length);
  const ry = new Float64Array(tx.length);
  for (let b = 0; b < resamples; b++) {
    for (let i = 0; i < tx.length; i++) {
      const k = uniformInt(rng, 0, tx.length - 1);
      rx[i] = tx[k];
      ry[i] = ty[k];
    }
    try {
      const e = fit(rx, ry);
      bx.push(e.cx_px);
      by.push(e.cy_px);
      br.push(e.semi_minor_px / e.semi_major_px);
      // keep the axis direction on the same branch as the main fit
      let d = e.major_axis_deg - ellipse.major_axis_deg;
      d -= 180 * Math.round(d / 180);
      ba.push(ellipse.major_axis_deg + d);
    } catch (err) {
      if (!(err instanceof EllipseFitFailure)) throw err;
    }
  }
  return {
    ellipse,
    inlier,
    rms_px: rms,
    se: { cx_px: options.centre ? 0 : sampleSd(bx), cy_px: options.centre ? 0 : sampleSd(by), axis_ratio: sampleSd(br), major_axis_deg: sampleSd(ba) },
    ci95: {
      cx_px: options.centre ? [ellipse.cx_px, ellipse.cx_px] : percentileInterval95(bx),
      cy_px: options.centre ? [ellipse.cy_px, ellipse.cy_px] : percentileInterval95(by),
      axis_ratio: percentileInterval95(br),
    },
  };
}

/**
 * Sampson (first-order geometric) distance of a point from an ellipse, px: Q(p) / |∇Q(p)| for the
 * ellipse's implicit form Q, normalised so that Q = 0 on the curve.
 */
export function sampsonDistance(e: Ellipse, x_px: number, y_px: number): number {
  const phi = (e.major_axis_deg * Math.PI) / 180;
  const c = Math.cos(phi);
  const s = Math.sin(phi);
  const u = x_px - e.cx_px;
  const v = -(y_px - e.cy_px);
  const p = u * c + v * s;
  const q = -u * s + v * c;
  const a2 = e.semi_major_px ** 2;
  const b2 = e.semi_minor_px ** 2;
  const Q = (p * p) / a2 + (q * q) / b2 - 1;
  const g = 2 * Math.hypot(p / a2, q / b2);
  return g > 0 ? Q / g : Math.hypot(p, q);
}

function select(x: Float64Array, y: Float64Array, keep: Uint8Array): { xs: Float64Array; ys: Float64Array } {
  let m = 0;
  for (let i = 0; i < keep.length; i++) m += keep[i];
  const xs = new Float64Array(m);
  const ys = new Float64Array(m);
  for (let i = 0, j = 0; i < keep.length; i++) {
    if (!keep[i]) continue;
    xs[j] = x[i];
    ys[j] = y[i];
    j++;
  }
  return { xs, ys };
}

/** fitEllipseRobust about the given centre (if any), or null when the points do not lie on an ellipse (too few, collinear, a hyperbola). */
export function fitPathEllipse(x_px: Float64Array, y_px: Float64Array, centre: { x_px: number; y_px: number } | null): RobustEllipseFit | null {
  try {
    return fitEllipseRobust(x_px, y_px, centre ? { centre } : {});
  } catch (err) {
    if (err instanceof EllipseFitFailure) return null;
    throw err;
  }
}
