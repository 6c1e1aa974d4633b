/**
 * Effective number of independent points in a residual series by batch means: with B contiguous batches of
 * m points, the integrated autocorrelation time is τ ≈ m·Var(batch means)/Var(points), and n_eff = n/τ
 * (the batch-means estimator of the long-run variance, e.g. Flegal & Jones 2010; 20–30 batches is common
 * practice, no source). Unlike the lag-1 AR(1) formula this also sees slow wander (a random walk in the
 * angle), which lag-1 correlation hides. Result between 2 and n.
 */
export function batchMeansEffectiveSize(residuals: ArrayLike<number>, batches = 10): number {
  const n = residuals.length;
  const b = Math.min(batches, Math.floor(n / 4));
  if (b < 4) return n;
  const m = Math.floor(n / b);
  let mean = 0;
  for (let i = 0; i < b * m; i++) mean += residuals[i]!;
  mean /= b * m;
  let ssPoints = 0;
  for (let i = 0; i < b * m; i++) ssPoints += (residuals[i]! - mean) ** 2;
  const varPoints = ssPoints / (b * m - 1);
  let ssBatches = 0;
  for (let j = 0; j < b; j++) {
    let s = 0;
    for (let i = j * m; i < (j + 1) * m; i++) s += residuals[i]!;
    ssBatches += (s / m - mean) ** 2;
  }
  const varBatches = ssBatches / (b - 1);
  if (!(varPoints > 0)) return n;
  const tau = Math.max(1, (m * varBatches) / varPoints);
  return Math.max(2, Math.min(n, n / tau));
}
