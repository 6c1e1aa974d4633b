import { compensatedSumOfSquares } from '../signal/compensatedSum.js';
import { RevtraceError } from '../errors.js';

/** Ordinary least squares y ≈ Σ_j b_j·X_j, solved by Householder QR on equilibrated columns. */
export interface LinearLeastSquaresFit {
  /** b_j, in the units of y per unit of column j. */
  coefficients: Float64Array;
  /** Classical standard errors σ̂·√[(XᵀX)⁻¹]_jj. */
  se: Float64Array;
  /** y − Xb. */
  residuals: Float64Array;
  /** Residual sum of squares (compensated). */
  rss: number;
  /** n − p. */
  df: number;
  /** σ̂ = √(rss/df) (NaN when df = 0). */
  residualSd: number;
  /** (XᵀX)⁻¹, p×p, row-major; multiply by a variance (or sandwich it) to get covariances. */
  inverseGram: Float64Array;
}

/** Raised when the design columns are linearly dependent (or a column is all zero). */
export class RankDeficientError extends RevtraceError {}

/**
 * Linear least squares by Householder QR (Golub & Van Loan, Matrix Computations, §5.3): each column
 * is first scaled to unit norm (equilibration, which keeps ill-conditioned designs such as the NIST
 * Longley data to ~10 digits), then R b = Qᵀy is back-substituted and (XᵀX)⁻¹ = R⁻¹R⁻ᵀ is formed.
 * @param columns the p design columns, each of length n (include a column of ones for an intercept)
 * @param y       the n responses
 */
export function linearLeastSquares(columns: ArrayLike<number>[], y: ArrayLike<number>): LinearLeastSquaresFit {
  const p = columns.length;
  const n = y.length;
  if (p === 0 || n < p) throw new RevtraceError(`least squares needs at least ${p} rows, got ${n}`);
  // A: column-major copy, scaled columns
  const a: Float64Array[] = [];
  const scale = new Float64Array(p);
  for (let j = 0; j < p; j++) {
    const col = Float64Array.from(columns[j]!);
    if (col.length !== n) throw new RevtraceError('least squares design columns and response differ in length');
    const norm = Math.sqrt(compensatedSumOfSquares(col));
    if (!(norm > 0) || !Number.isFinite(norm)) throw new RankDeficientError(`design column ${j + 1} is zero or not finite`);
    for (let i = 0; i < n; i++) col[i]! /= norm;
    scale[j] = norm;
    a.push(col);
  }
  const qty = Float64Array.from(y);
  const rdiag = new Float64Array(p);
  for (let k = 0; k < p; k++) {
    const ak = a[k]!;
    // 2-norm with scaling (no overflow/underflow; columns are already of unit norm)
    let big = 0;
    for (let i = k; i < n; i++) big = Math.max(big, Math.abs(ak[i]!));
    let ss = 0;
    if (big > 0) for (let i = k; i < n; i++) ss += (ak[i]! / big) ** 2;
    let norm = big * Math.sqrt(ss);
    if (!(norm > 1e-13)) throw new RankDeficientError(`design column ${k + 1} depends linearly on the others`);
    if (ak[k]! > 0) norm = -norm;
    // v = a_k[k:] − norm·e_1, stored in place; H = I − 2vvᵀ/vᵀv
    ak[k]! -= norm;
    let vtv = 0;
    for (let i = k; i < n; i++) vtv += ak[i]! * ak[i]!;
    const apply = (col: Float64Array): void => {
      let dot = 0;
      for (let i = k; i < n; i++) dot += ak[i]! * col[i]!;
      const f = (2 * dot) / vtv;
      for (let i = k; i < n; i++) col[i]! -= f * ak[i]!;
    };
    for (let j = k + 1; j < p; j++) apply(a[j]!);
    apply(qty);
    rdiag[k] = norm;
  }
  // R (upper triangle): R[k][k] = rdiag[k], R[k][j] = a[j][k] for j > k
  const r = (k: number, j: number): number => (k === j ? rdiag[k]! : a[j]![k]!);
  const bScaled = new Float64Array(p);
  for (let k = p - 1; k >= 0; k--) {
    let s = qty[k]!;
    for (let j = k + 1; j < p; j++) s -= r(k, j) * bScaled[j]!;
    bScaled[k] = s / r(k, k);
  }
  // R⁻¹ (upper triangular)
  const rinv = new Float64Array(p * p);
  for (let c = 0; c < p; c++) {
    for (let k = c; k >= 0; k--) {
      let s = k === c ? 1 : 0;
      for (let j = k + 1; j <= c; j++) s -= r(k, j) * rinv[j * p + c]!;
      rinv[k * p + c] = s / r(k, k);
    }
  }
  const coefficients = new Float64Array(p);
  for (let j = 0; j < p; j++) coefficients[j] = bScaled[j]! / scale[j]!;
  const inverseGram = new Float64Array(p * p);
  for (let i = 0; i < p; i++) {
    for (let j = 0; j < p; j++) {
      let s = 0;
      for (let k = Math.max(i, j); k < p; k++) s += rinv[i * p + k]! * rinv[j * p + k]!;
      inverseGram[i * p + j] = s / (scale[i]! * scale[j]!);
    }
  }
  const residuals = new Float64Array(n);
  for (let i = 0; i < n; i++) residuals[i] = y[i]!;
  for (let j = 0; j < p; j++) {
    const col = columns[j]!;
    const b = coefficients[j]!;
    for (let i = 0; i < n; i++) residuals[i]! -= col[i]! * b;
  }
  const rss = compensatedSumOfSquares(residuals);
  const df = n - p;
  const residualSd = df > 0 ? Math.sqrt(rss / df) : Number.NaN;
  const se = new Float64Array(p);
  for (let j = 0; j < p; j++) se[j] = residualSd * Math.sqrt(inverseGram[j * p + j]!);
  return { coefficients, se, residuals, rss, df, residualSd, inverseGram };
}
