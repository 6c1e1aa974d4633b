import { invertSmallMatrix } from './solveSymmetric.js';

/** The local polynomial fit at one sample: smoothed value, first derivative, and their variance factors. */
export interface LocalPolynomialPoint {
  /** Fitted value at t_i (units of y). */
  value: number;
  /** Fitted first derivative at t_i (units of y per second). */
  rate: number;
  /** Leverage H_ii of the centre point: Var(value) = σ²·valueFactor for white noise of variance σ². */
  valueFactor: number;
  /** Var(rate) = σ²·rateFactor for white noise (1/s²). */
  rateFactor: number;
}

/**
 * Least-squares polynomial of the given order in real time t (not sample index) through the samples with
 * |t_j − t_i| ≤ halfWidth_s, evaluated at t_i: the Savitzky–Golay filter generalised to non-uniform time
 * (on equally spaced samples it reproduces the Savitzky–Golay coefficients). Windows are truncated at the
 * ends of the data and widened to the nearest samples when they hold fewer than order + 2 points.
 * Times are used relative to t_i and scaled by the half-width, values relative to y_i, so hour-long
 * series keep full precision.
 * @param lo,hi the window as an index range [lo, hi] (inclusive) containing i, found by the caller
 * @param hole  leave out samples with |j − i| ≤ hole (h-block cross-validation; default −1: keep all)
 */
export function localPolynomialAt(
  t_s: ArrayLike<number>,
  y: ArrayLike<number>,
  i: number,
  lo: number,
  hi: number,
  halfWidth_s: number,
  order: number,
  hole = -1,
): LocalPolynomialPoint | null {
  const p = order + 1;
  const moments = new Float64Array(2 * order + 1);
  const rhs = new Float64Array(p);
  const ti = t_s[i]!;
  const yi = y[i]!;
  const inv = 1 / halfWidth_s;
  if (order === 2) {
    // unrolled for the common local quadratic
    let m0 = 0, m1 = 0, m2 = 0, m3 = 0, m4 = 0, r0 = 0, r1 = 0, r2 = 0;
    for (let j = lo; j <= hi; j++) {
      if (j >= i - hole && j <= i + hole) continue;
      const u = (t_s[j]! - ti) * inv;
      const u2 = u * u;
      const dy = y[j]! - yi;
      m0 += 1;
      m1 += u;
      m2 += u2;
      m3 += u2 * u;
      m4 += u2 * u2;
      r0 += dy;
      r1 += u * dy;
      r2 += u2 * dy;
    }
    moments.set([m0, m1, m2, m3, m4]);
    rhs.set([r0, r1, r2]);
  } else {
    for (let j = lo; j <= hi; j++) {
      if (j >= i - hole && j <= i + hole) continue;
      const u = (t_s[j]! - ti) * inv;
      const dy = y[j]! - yi;
      let pw = 1;
      for (let k = 0; k < moments.length; k++) {
        moments[k]! += pw;
        if (k < p) rhs[k]! += pw * dy;
        pw *= u;
      }
    }
  }
  const gram = new Float64Array(p * p);
  for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) gram[a * p + b] = moments[a + b]!;
  const g = invertSmallMatrix(gram, p);
  if (!g) return null;
  let b0 = 0;
  let b1 = 0;
  for (let k = 0; k < p; k++) {
    b0 += g[k]! * rhs[k]!;
    if (p > 1) b1 += g[p + k]! * rhs[k]!;
  }
  return {
    value: yi + b0,
    rate: b1 * inv,
    valueFactor: g[0]!,
    rateFactor: p > 1 ? g[p + 1]! * inv * inv : Number.NaN,
  };
}

/** Index window [lo, hi] around i with |t_j − t_i| ≤ h, widened to hold at least minPoints samples. */
export function windowAround(t_s: ArrayLike<number>, i: number, h: number, minPoints: number, hint?: [number, number]): [number, number] {
  const n = t_s.length;
  const ti = t_s[i]!;
  let lo = hint ? Math.min(hint[0], i) : i;
  let hi = hint ? Math.max(hint[1], i) : i;
  while (lo > 0 && ti - t_s[lo - 1]! <= h) lo--;
  while (lo < i && ti - t_s[lo]! > h) lo++;
  while (hi < n - 1 && t_s[hi + 1]! - ti <= h) hi++;
  while (hi > i && t_s[hi]! - ti > h) hi--;
  while (hi - lo + 1 < minPoints && (lo > 0 || hi < n - 1)) {
    const left = lo > 0 ? ti - t_s[lo - 1]! : Infinity;
    const right = hi < n - 1 ? t_s[hi + 1]! - ti : Infinity;
    if (left <= right) lo--;
    else hi++;
  }
  return [lo, hi];
}
