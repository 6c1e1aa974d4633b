/**
 * Inverse of a small symmetric positive-definite matrix (row-major, size m×m) by Gauss–Jordan
 * elimination with partial pivoting; returns null when it is singular to working precision.
 */
export function invertSmallMatrix(a: Float64Array, m: number): Float64Array | null {
  const w = Float64Array.from(a);
  const inv = new Float64Array(m * m);
  for (let i = 0; i < m; i++) inv[i * m + i] = 1;
  let maxAbs = 0;
  for (const v of w) maxAbs = Math.max(maxAbs, Math.abs(v));
  for (let c = 0; c < m; c++) {
    let piv = c;
    for (let r = c + 1; r < m; r++) if (Math.abs(w[r * m + c]!) > Math.abs(w[piv * m + c]!)) piv = r;
    const pv = w[piv * m + c]!;
    if (!(Math.abs(pv) > 1e-13 * maxAbs)) return null;
    if (piv !== c) {
      for (let k = 0; k < m; k++) {
        [w[c * m + k], w[piv * m + k]] = [w[piv * m + k]!, w[c * m + k]!];
        [inv[c * m + k], inv[piv * m + k]] = [inv[piv * m + k]!, inv[c * m + k]!];
      }
    }
    for (let k = 0; k < m; k++) {
      w[c * m + k]! /= pv;
      inv[c * m + k]! /= pv;
    }
    for (let r = 0; r < m; r++) {
      if (r === c) continue;
      const f = w[r * m + c]!;
      if (f === 0) continue;
      for (let k = 0; k < m; k++) {
        w[r * m + k]! -= f * w[c * m + k]!;
        inv[r * m + k]! -= f * inv[c * m + k]!;
      }
    }
  }
  return inv;
}
