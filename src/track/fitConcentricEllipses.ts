import { Matrix, solve } from 'ml-matrix';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { uniformInt } from 'pure-rand/distribution/uniformInt';
import { EllipseFitFailure, type Ellipse } from './fitEllipse.js';
import type { RobustEllipseOptions } from './fitEllipseRobust.js';
import { median, percentileInterval95, sampleSd } from './sampleSummaries.js';

/** One marker's path: points in full-frame px (x right, y down). */
export interface MarkerPath {
  x_px: Float64Array;
  y_px: Float64Array;
}

/** The same settings as the one-path robust fit (the bootstrap's point budget counts all markers together). */
export type ConcentricEllipsesOptions = RobustEllipseOptions;

export interface ConcentricEllipsesFit {
  /** One ellipse per marker: shared centre, axis ratio and major-axis direction; own size. */
  ellipses: Ellipse[];
  /** semi-minor / semi-major, shared. */
  axis_ratio: number;
  /** Per marker: 1 for a point kept in the final fit, 0 for a rejected one (input order). */
  inlier: Uint8Array[];
  /** RMS Sampson distance of the kept points from their ellipse, px. */
  rms_px: number;
  /** Bootstrap standard errors (0 for the centre when it was given). */
  se: { cx_px: number; cy_px: number; axis_ratio: number; major_axis_deg: number };
  /** Bootstrap percentile intervals (2.5 %, 97.5 %). */
  ci95: { cx_px: [number, number]; cy_px: [number, number]; axis_ratio: [number, number] };
}

/**
 * Shape of the shared ellipses: centre (px) and the symmetric form M = [[1 + α, β], [β, 1 − α]] in centred
 * coordinates (u right, v up); marker k's path is uᵀ M u = s_k² (s_k px). α = β = 0 is a circle, so the
 * parameters stay smooth through a square-on view.
 */
interface Shape {
  cx: number;
  cy: number;
  alpha: number;
  beta: number;
  s: number[];
}

/**
 * Concentric ellipses with one centre and one axis ratio and orientation, one size per marker, fitted to
 * several markers' paths together (the view of a rigid rotor under a distant camera). Start: a linear
 * least-squares fit of concentric circles x² + y² + D x + E y + F_k = 0 (Kåsa's circle fit with one F per
 * marker); then Levenberg–Marquardt on the Sampson distances (Q / |∇Q|; common practice, no source) with a
 * numerical Jacobian; points beyond reject_sigma × 1.4826 × MAD (at least min_reject_px) are dropped and the
 * fit repeated until the kept set stops changing (at most 6 rounds). Standard errors: a seeded bootstrap that
 * resamples each marker's kept points (evenly thinned) separately.
 */
export function fitConcentricEllipses(paths: MarkerPath[], options: ConcentricEllipsesOptions = {}): ConcentricEllipsesFit {
  const m = paths.length;
  if (m === 0) throw new EllipseFitFailure('no marker paths to fit');
  for (const p of paths) if (p.x_px.length < 3) throw new EllipseFitFailure(`a marker path needs at least 3 points, got ${p.x_px.length}`);
  const rejectSigma = options.reject_sigma ?? 4;
  const minReject = options.min_reject_px ?? 0.5;
  const centre = options.centre;
  const inlier = paths.map((p) => new Uint8Array(p.x_px.length).fill(1));
  let shape = refine(paths, inlier, startShape(paths, inlier, centre), centre, 30);
  for (let round = 0; round < 6; round++) {
    const all: number[] = [];
    const dists = paths.map((p, k) => Float64Array.from(p.x_px, (x, i) => Math.abs(sampson(shape, k, x, p.y_px[i]))));
    dists.forEach((d, k) => d.forEach((v, i) => { if (inlier[k][i]) all.push(v); }));
    const limit = Math.max(minReject, rejectSigma * 1.4826 * median(all));
    let changed = false;
    dists.forEach((d, k) => d.forEach((v, i) => {
      const keep = v <= limit ? 1 : 0;
      if (keep !== inlier[k][i]) changed = true;
      inlier[k][i] = keep;
    }));
    if (!changed) break;
    for (const mask of inlier) if (mask.reduce((s, v) => s + v, 0) < 3) throw new EllipseFitFailure('too few points stay on a marker path');
    shape = refine(paths, inlier, shape, centre, 30);
  }
  let ss = 0;
  let kept = 0;
  paths.forEach((p, k) => p.x_px.forEach((x, i) => {
    if (!inlier[k][i]) return;
    ss += sampson(shape, k, x, p.y_px[i]) ** 2;
    kept++;
  }));

  // bootstrap: each marker's kept points resampled on their own, from an evenly thinned subset
  const total = kept;
  const stride = Math.max(1, Math.ceil(total / (options.bootstrap_points ?? 600)));
  const thin: MarkerPath[] = paths.map((p, k) => {
    const xs: number[] = [];
    const ys: number[] = [];
    let c = 0;
    p.x_px.forEach((x, i) => {
      if (inlier[k][i] && c++ % stride === 0) {
        xs.push(x);
        ys.push(p.y_px[i]);
      }
    });
    return { x_px: Float64Array.from(xs), y_px: Float64Array.from(ys) };
  });
  const rng = xoroshiro128plus(options.seed ?? 1);
  const main = toEllipses(shape);
  const bx: number[] = [];
  const by: number[] = [];
  const br: number[] = [];
  const ba: number[] = [];
  const resampled: MarkerPath[] = thin.map((p) => ({ x_px: new Float64Array(p.x_px.length), y_px: new Float64Array(p.x_px.length) }));
  const all1 = thin.map((p) => new Uint8Array(p.x_px.length).fill(1));
  for (let b = 0; b < (options.resamples ?? 200); b++) {
    thin.forEach((p, k) => {
      for (let i = 0; i < p.x_px.length; i++) {
        const j = uniformInt(rng, 0, p.x_px.length - 1);
        resampled[k].x_px[i] = p.x_px[j];
        resampled[k].y_px[i] = p.y_px[j];
      }
    });
    const e = toEllipses(refine(resampled, all1, shape, centre, 8))[0];
    bx.push(e.cx_px);
    by.push(e.cy_px);
    br.push(e.semi_minor_px / e.semi_major_px);
    let d = e.major_axis_deg - main[0].major_axis_deg;
    d -= 180 * Math.round(d / 180);
    ba.push(main[0].major_axis_deg + d);
  }
  return {
    ellipses: main,
    axis_ratio: main[0].semi_minor_px / main[0].semi_major_px,
    inlier,
    rms_px: Math.sqrt(ss / Math.max(1, kept)),
    se: { cx_px: centre ? 0 : sampleSd(bx), cy_px: centre ? 0 : sampleSd(by), axis_ratio: sampleSd(br), major_axis_deg: sampleSd(ba) },
    ci95: {
      cx_px: centre ? [centre.x_px, centre.x_px] : percentileInterval95(bx),
      cy_px: centre ? [centre.y_px, centre.y_px] : percentileInterval95(by),
      axis_ratio: percentileInterval95(br),
    },
  };
}

/** Linear least-squares concentric circles: x² + y² + D x + E y + F_k = 0 (or, about a known centre, the mean radius per marker). */
function startShape(paths: MarkerPath[], inlier: Uint8Array[], centre: { x_px: number; y_px: number } | undefined): Shape {
  const m = paths.length;
  let mx = 0;
  let my = 0;
  let n = 0;
  paths.forEach((p) => p.x_px.forEach((x, i) => { mx += x; my += p.y_px[i]; n++; }));
  mx /= n;
  my /= n;
  let cx: number;
  let cy: number;
  if (centre) {
    cx = centre.x_px;
    cy = centre.y_px;
  } else {
    const AtA = Matrix.zeros(m + 2, m + 2);
    const Atb = Matrix.zeros(m + 2, 1);
    const row = new Float64Array(m + 2);
    paths.forEach((p, k) => p.x_px.forEach((x0, i) => {
      if (!inlier[k][i]) return;
      const x = x0 - mx;
      const y = p.y_px[i] - my;
      row.fill(0);
      row[0] = x;
      row[1] = y;
      row[2 + k] = 1;
      const b = -(x * x + y * y);
      for (let r = 0; r < m + 2; r++) {
        if (row[r] === 0) continue;
        Atb.set(r, 0, Atb.get(r, 0) + row[r] * b);
        for (let c = 0; c < m + 2; c++) if (row[c] !== 0) AtA.set(r, c, AtA.get(r, c) + row[r] * row[c]);
      }
    }));
    const sol = solve(AtA, Atb).to1DArray();
    cx = mx - sol[0] / 2;
    cy = my - sol[1] / 2;
    if (!Number.isFinite(cx) || !Number.isFinite(cy)) throw new EllipseFitFailure('the marker paths do not determine a centre');
  }
  const s = paths.map((p, k) => {
    let r = 0;
    let c = 0;
    p.x_px.forEach((x, i) => { if (inlier[k][i]) { r += Math.hypot(x - cx, p.y_px[i] - cy); c++; } });
    return r / Math.max(1, c);
  });
  return { cx, cy, alpha: 0, beta: 0, s };
}

/** Sampson distance of a point (px) from marker k's ellipse of the shape, px. */
function sampson(sh: Shape, k: number, x_px: number, y_px: number): number {
  const u = x_px - sh.cx;
  const v = -(y_px - sh.cy);
  const mu = (1 + sh.alpha) * u + sh.beta * v;
  const mv = sh.beta * u + (1 - sh.alpha) * v;
  const g = 2 * Math.hypot(mu, mv);
  const q = u * mu + v * mv - sh.s[k] * sh.s[k];
  return g > 0 ? q / g : Math.hypot(u, v);
}

/** Levenberg–Marquardt on the Sampson distances of the kept points, numerical Jacobian (central differences). */
function refine(paths: MarkerPath[], inlier: Uint8Array[], start: Shape, centre: { x_px: number; y_px: number } | undefined, iterations: number): Shape {
  const m = paths.length;
  const free = centre ? ['alpha', 'beta'] : ['cx', 'cy', 'alpha', 'beta'];
  const np = free.length + m;
  const pack = (sh: Shape): number[] => [...free.map((f) => sh[f as 'cx'] as number), ...sh.s];
  const unpack = (p: number[]): Shape => {
    const sh: Shape = { cx: start.cx, cy: start.cy, alpha: 0, beta: 0, s: p.slice(free.length) };
    free.forEach((f, i) => { (sh as unknown as Record<string, number>)[f] = p[i]; });
    return sh;
  };
  const pts: { k: number; x: number; y: number }[] = [];
  paths.forEach((p, k) => p.x_px.forEach((x, i) => { if (inlier[k][i]) pts.push({ k, x, y: p.y_px[i] }); }));
  const residuals = (p: number[]): Float64Array => {
    const sh = unpack(p);
    return Float64Array.from(pts, (q) => sampson(sh, q.k, q.x, q.y));
  };
  const cost = (r: Float64Array): number => r.reduce((s, v) => s + v * v, 0);
  let p = pack(start);
  let r = residuals(p);
  let c = cost(r);
  let lambda = 1e-3;
  const scale = Math.max(1, ...start.s);
  for (let it = 0; it < iterations; it++) {
    const J = new Matrix(pts.length, np);
    for (let j = 0; j < np; j++) {
      // centre and sizes in px; alpha, beta are dimensionless
      const h = j < free.length && free[j].startsWith('c') ? 1e-3 : j < free.length ? 1e-6 : 1e-3;
      const hi = [...p];
      const lo = [...p];
      hi[j] += h;
      lo[j] -= h;
      const rh = residuals(hi);
      const rl = residuals(lo);
      for (let i = 0; i < pts.length; i++) J.set(i, j, (rh[i] - rl[i]) / (2 * h));
    }
    const JtJ = J.transpose().mmul(J);
    const Jtr = J.transpose().mmul(Matrix.columnVector(Array.from(r)));
    let improved = false;
    for (let tries = 0; tries < 8; tries++) {
      const A = JtJ.clone();
      for (let j = 0; j < np; j++) A.set(j, j, A.get(j, j) * (1 + lambda) + 1e-12 * scale);
      let step: number[];
      try {
        step = solve(A, Jtr).to1DArray();
      } catch {
        lambda *= 10;
        continue;
      }
      const next = p.map((v, j) => v - step[j]);
      const sh = unpack(next);
      if (!(Math.hypot(sh.alpha, sh.beta) < 0.99) || sh.s.some((v) => !(v > 0))) {
        lambda *= 10;
        continue;
      }
      const rn = residuals(next);
      const cn = cost(rn);
      if (cn < c) {
        const small = Math.max(...step.map(Math.abs)) < 1e-9 * scale;
        p = next;
        r = rn;
        const done = c - cn < 1e-12 * c || small;
        c = cn;
        lambda = Math.max(1e-9, lambda / 10);
        improved = true;
        if (done) return unpack(p);
        break;
      }
      lambda *= 10;
    }
    if (!improved) break;
  }
  return unpack(p);
}

/** The shape as one Ellipse per marker (major axis CCW as displayed, in (−90, 90]). */
function toEllipses(sh: Shape): Ellipse[] {
  const mAbs = Math.hypot(sh.alpha, sh.beta);
  // eigenvalues of M: 1 − |(α, β)| along the major axis, 1 + |(α, β)| across it
  let deg = mAbs > 0 ? (Math.atan2(-sh.beta, -sh.alpha) / 2) * (180 / Math.PI) : 0;
  if (deg <= -90) deg += 180;
  if (deg > 90) deg -= 180;
  return sh.s.map((s) => ({
    cx_px: sh.cx,
    cy_px: sh.cy,
    semi_major_px: s / Math.sqrt(1 - mAbs),
    semi_minor_px: s / Math.sqrt(1 + mAbs),
    major_axis_deg: deg,
  }));
}
