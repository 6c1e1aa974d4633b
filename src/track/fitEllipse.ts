import { EigenvalueDecomposition, Matrix, inverse } from 'ml-matrix';

/**
 * An ellipse in full-frame pixels of the displayed video (x right, y down).
 * `major_axis_deg` is the direction of the major axis, counterclockwise from +x as displayed, in (-90, 90].
 */
export interface Ellipse {
  cx_px: number;
  cy_px: number;
  semi_major_px: number;
  semi_minor_px: number;
  major_axis_deg: number;
}

/** Thrown inside the track stage when points do not determine an ellipse (too few, collinear, a hyperbola). */
export class EllipseFitFailure extends Error {}

/**
 * Direct least-squares ellipse fit: Fitzgibbon, Pilu & Fisher (1999), in the numerically stable
 * form of Halíř & Flusser (1998), "Numerically stable direct least squares fitting of ellipses".
 * Points are centred and scaled to unit RMS radius before fitting; the result is mapped back.
 * @param x_px point x, px (image x right)
 * @param y_px point y, px (image y down)
 */
export function fitEllipse(x_px: ArrayLike<number>, y_px: ArrayLike<number>): Ellipse {
  const n = x_px.length;
  if (n < 5 || y_px.length !== n) throw new EllipseFitFailure(`an ellipse needs at least 5 points, got ${n}`);
  const { mx, my, s } = normalisation(x_px, y_px);
  // Scatter blocks S1 = D1ᵀD1, S2 = D1ᵀD2, S3 = D2ᵀD2 with D1 = [x², xy, y²], D2 = [x, y, 1], summed in plain arrays (row-major 3×3)
  const s1 = new Float64Array(9);
  const s2 = new Float64Array(9);
  const s3 = new Float64Array(9);
  const d1 = [0, 0, 0];
  const d2 = [0, 0, 1];
  for (let i = 0; i < n; i++) {
    const x = (x_px[i] - mx) / s;
    const y = (y_px[i] - my) / s;
    d1[0] = x * x;
    d1[1] = x * y;
    d1[2] = y * y;
    d2[0] = x;
    d2[1] = y;
    for (let r = 0; r < 3; r++) {
      for (let c = 0; c < 3; c++) {
        s1[3 * r + c] += d1[r] * d1[c];
        s2[3 * r + c] += d1[r] * d2[c];
        s3[3 * r + c] += d2[r] * d2[c];
      }
    }
  }
  const S1 = squareMatrix(s1);
  const S2 = squareMatrix(s2);
  const S3 = squareMatrix(s3);
  let S3inv: Matrix;
  try {
    S3inv = inverse(S3);
  } catch {
    throw new EllipseFitFailure('the points are collinear');
  }
  const T = S3inv.mmul(S2.transpose()).mul(-1);
  const M = S1.clone().add(S2.mmul(T));
  // Premultiply by inv(C1), C1 = [[0,0,2],[0,-1,0],[2,0,0]]
  const Mc = new Matrix(3, 3);
  for (let c = 0; c < 3; c++) {
    Mc.set(0, c, M.get(2, c) / 2);
    Mc.set(1, c, -M.get(1, c));
    Mc.set(2, c, M.get(0, c) / 2);
  }
  const eig = new EigenvalueDecomposition(Mc);
  const V = eig.eigenvectorMatrix;
  let best = -1;
  let bestCond = 0;
  for (let k = 0; k < 3; k++) {
    if (Math.abs(eig.imaginaryEigenvalues[k]) > 1e-12 * Math.max(1, Math.abs(eig.realEigenvalues[k]))) continue;
    const a = V.get(0, k);
    const b = V.get(1, k);
    const c = V.get(2, k);
    const cond = 4 * a * c - b * b;
    if (cond > bestCond) {
      bestCond = cond;
      best = k;
    }
  }
  if (best < 0) throw new EllipseFitFailure('the points do not lie on an ellipse');
  const a1 = [V.get(0, best), V.get(1, best), V.get(2, best)];
  const a2 = T.mmul(Matrix.columnVector(a1)).to1DArray();
  const e = conicToEllipse(a1[0], a1[1], a1[2], a2[0], a2[1], a2[2]);
  return {
    cx_px: e.cx_px * s + mx,
    cy_px: e.cy_px * s + my,
    semi_major_px: e.semi_major_px * s,
    semi_minor_px: e.semi_minor_px * s,
    major_axis_deg: e.major_axis_deg,
  };
}

/**
 * Ellipse with a known centre: linear least squares for A u² + B uv + C v² = 1, u = x − cx, v = y − cy.
 * Needs far less arc than a free fit, since the centre is not estimated.
 */
export function fitCentredEllipse(x_px: ArrayLike<number>, y_px: ArrayLike<number>, cx_px: number, cy_px: number): Ellipse {
  const n = x_px.length;
  if (n < 3) throw new EllipseFitFailure(`a centred ellipse needs at least 3 points, got ${n}`);
  let s2 = 0;
  for (let i = 0; i < n; i++) s2 += (x_px[i] - cx_px) ** 2 + (y_px[i] - cy_px) ** 2;
  const s = Math.sqrt(s2 / n) || 1;
  const ata = new Float64Array(9);
  const atb = [0, 0, 0];
  const row = [0, 0, 0];
  for (let i = 0; i < n; i++) {
    const u = (x_px[i] - cx_px) / s;
    const v = (y_px[i] - cy_px) / s;
    row[0] = u * u;
    row[1] = u * v;
    row[2] = v * v;
    for (let r = 0; r < 3; r++) {
      atb[r] += row[r];
      for (let c = 0; c < 3; c++) ata[3 * r + c] += row[r] * row[c];
    }
  }
  const AtA = squareMatrix(ata);
  const Atb = Matrix.columnVector(atb);
  let p: number[];
  try {
    p = inverse(AtA).mmul(Atb).to1DArray();
  } catch {
    throw new EllipseFitFailure('the points do not determine an ellipse about the given centre');
  }
  const e = conicToEllipse(p[0], p[1], p[2], 0, 0, -1);
  return {
    cx_px,
    cy_px,
    semi_major_px: e.semi_major_px * s,
    semi_minor_px: e.semi_minor_px * s,
    major_axis_deg: e.major_axis_deg,
  };
}

/**
 * Geometric form of the conic A x² + B xy + C y² + D x + E y + F = 0 (image coordinates, y down).
 * Throws EllipseFitFailure when the conic is not a real ellipse.
 */
export function conicToEllipse(A: number, B: number, C: number, D: number, E: number, F: number): Ellipse {
  if (A + C < 0) return conicToEllipse(-A, -B, -C, -D, -E, -F);
  const det = 4 * A * C - B * B;
  if (!(det > 0)) throw new EllipseFitFailure('the conic is not an ellipse');
  const cx = (B * E - 2 * C * D) / det;
  const cy = (B * D - 2 * A * E) / det;
  const F0 = F + (D * cx + E * cy) / 2;
  // Eigen-decomposition of the quadratic form [[A, B/2], [B/2, C]]
  const tr = A + C;
  const diff = Math.hypot(A - C, B);
  const l1 = (tr - diff) / 2; // smaller eigenvalue → major axis
  const l2 = (tr + diff) / 2;
  const r1 = -F0 / l1;
  const r2 = -F0 / l2;
  if (!(r1 > 0 && r2 > 0)) throw new EllipseFitFailure('the conic is an imaginary ellipse');
  // Major-axis direction: eigenvector of l1, in image coordinates (y down)
  let ex: number;
  let ey: number;
  if (Math.abs(B) > 1e-15 * (Math.abs(A) + Math.abs(C))) {
    ex = B / 2;
    ey = l1 - A;
  } else if (A <= C) {
    ex = 1;
    ey = 0;
  } else {
    ex = 0;
    ey = 1;
  }
  let deg = (Math.atan2(-ey, ex) * 180) / Math.PI; // counterclockwise as displayed
  if (deg <= -90) deg += 180;
  if (deg > 90) deg -= 180;
  return { cx_px: cx, cy_px: cy, semi_major_px: Math.sqrt(r1), semi_minor_px: Math.sqrt(r2), major_axis_deg: deg };
}

/** A 3×3 ml-matrix from nine numbers in row-major order. */
function squareMatrix(v: Float64Array): Matrix {
  return new Matrix([[v[0], v[1], v[2]], [v[3], v[4], v[5]], [v[6], v[7], v[8]]]);
}

function normalisation(x: ArrayLike<number>, y: ArrayLike<number>): { mx: number; my: number; s: number } {
  const n = x.length;
  let mx = 0;
  let my = 0;
  for (let i = 0; i < n; i++) {
    mx += x[i];
    my += y[i];
  }
  mx /= n;
  my /= n;
  let s2 = 0;
  for (let i = 0; i < n; i++) s2 += (x[i] - mx) ** 2 + (y[i] - my) ** 2;
  const s = Math.sqrt(s2 / n);
  return { mx, my, s: s > 0 ? s : 1 };
}
