import { invertSmallMatrix } from './solveSymmetric.js';

/** Options of savitzkyGolayCoefficients. */
export interface SavitzkyGolayCoefficientsOptions {
  /** m: the window has 2m + 1 equally spaced points (default 2, i.e. 5 points). */
  halfWidth?: number;
  /** Degree of the local polynomial (default 2). */
  order?: number;
  /** 0 = smoothed value, 1 = first derivative, … (default 0). */
  derivative?: number;
}

/**
 * Savitzky–Golay convolution coefficients for equally spaced samples at unit spacing (Savitzky & Golay 1964,
 * corrected by Steinier, Termonia & Deltour 1972): c_j, j = −m…m, such that Σ c_j·y_{i+j} is the d-th
 * derivative at i of the least-squares polynomial of the given order through the window. Divide a
 * derivative's coefficients by spacing^d for another spacing.
 */
export function savitzkyGolayCoefficients(options: SavitzkyGolayCoefficientsOptions = {}): Float64Array {
  const m = options.halfWidth ?? 2;
  const q = options.order ?? 2;
  const d = options.derivative ?? 0;
  if (!Number.isInteger(m) || m < 1) throw new RangeError(`halfWidth must be a positive integer, got ${m}`);
  if (!Number.isInteger(q) || q < 0 || q > 2 * m) throw new RangeError(`order must be an integer from 0 to ${2 * m}, got ${q}`);
  if (!Number.isInteger(d) || d < 0 || d > q) throw new RangeError(`derivative must be an integer from 0 to ${q}, got ${d}`);
  const p = q + 1;
  const gram = new Float64Array(p * p);
  for (let j = -m; j <= m; j++) {
    for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) gram[a * p + b]! += j ** (a + b);
  }
  const inv = invertSmallMatrix(gram, p);
  if (!inv) throw new RangeError('Savitzky–Golay normal equations are singular');
  let factorial = 1;
  for (let k = 2; k <= d; k++) factorial *= k;
  const c = new Float64Array(2 * m + 1);
  for (let j = -m; j <= m; j++) {
    let s = 0;
    for (let b = 0; b < p; b++) s += inv[d * p + b]! * j ** b;
    c[j + m] = factorial * s;
  }
  return c;
}
