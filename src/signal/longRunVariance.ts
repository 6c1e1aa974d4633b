/**
 * Andrews (1991) automatic bandwidth for the Bartlett kernel with an AR(1) plug-in:
 * S = 1.1447·(α̂(1)·n)^{1/3}, α̂(1) = 4ρ̂²/((1−ρ̂)²(1+ρ̂)²), ρ̂ the lag-1 autocorrelation of x
 * (clamped to [−0.97, 0.97] as is common practice, no source). Returns S ≥ 1, at most n/2.
 */
export function andrewsBandwidth(x: ArrayLike<number>): number {
  const n = x.length;
  if (n < 3) return 1;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += (x[i]! - mean) / (i + 1);
  let c0 = 0;
  let c1 = 0;
  for (let i = 0; i < n; i++) {
    const d = x[i]! - mean;
    c0 += d * d;
    if (i > 0) c1 += d * (x[i - 1]! - mean);
  }
  const rho = c0 > 0 ? Math.max(-0.97, Math.min(0.97, c1 / c0)) : 0;
  const alpha1 = (4 * rho * rho) / ((1 - rho) ** 2 * (1 + rho) ** 2);
  const s = 1.1447 * Math.cbrt(alpha1 * n);
  return Math.max(1, Math.min(n / 2, s));
}

/**
 * Heteroskedasticity- and autocorrelation-consistent covariance Ω = Γ₀ + Σ_{h≥1} (1 − h/S)(Γ_h + Γ_hᵀ)
 * of p series z_a (Newey & West 1987, Bartlett kernel; bandwidth S from andrewsBandwidth).
 * The series are used as given (the caller removes their mean when it should be removed).
 * @returns Ω as a row-major p×p array, in units of z² (sums, not averages: Ω ≈ Var(Σ_k z_k))
 */
export function bartlettCovariance(z: ArrayLike<number>[], bandwidth: number): Float64Array {
  const p = z.length;
  const n = p > 0 ? z[0]!.length : 0;
  const omega = new Float64Array(p * p);
  const maxLag = Math.min(n - 1, Math.ceil(bandwidth) - 1);
  for (let h = 0; h <= maxLag; h++) {
    const w = h === 0 ? 1 : 1 - h / bandwidth;
    if (w <= 0) break;
    for (let a = 0; a < p; a++) {
      const za = z[a]!;
      for (let b = 0; b < p; b++) {
        const zb = z[b]!;
        let s = 0;
        for (let k = h; k < n; k++) s += za[k]! * zb[k - h]!;
        if (h === 0) omega[a * p + b]! += s;
        else {
          omega[a * p + b]! += w * s;
          omega[b * p + a]! += w * s;
        }
      }
    }
  }
  return omega;
}

/** Ratio of the Bartlett long-run variance of x (mean removed) to its plain variance: 1 for white noise, >1 for positive autocorrelation. */
export function longRunVarianceRatio(x: ArrayLike<number>): number {
  const n = x.length;
  if (n < 3) return 1;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += (x[i]! - mean) / (i + 1);
  const d = new Float64Array(n);
  for (let i = 0; i < n; i++) d[i] = x[i]! - mean;
  let c0 = 0;
  for (const v of d) c0 += v * v;
  if (!(c0 > 0)) return 1;
  const lrv = bartlettCovariance([d], andrewsBandwidth(d))[0]!;
  return lrv / c0;
}

/** Autocorrelation of x (mean removed) at lags 1…maxLag. */
export function autocorrelation(x: ArrayLike<number>, maxLag: number): number[] {
  const n = x.length;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += (x[i]! - mean) / (i + 1);
  let c0 = 0;
  for (let i = 0; i < n; i++) c0 += (x[i]! - mean) ** 2;
  const out: number[] = [];
  for (let h = 1; h <= maxLag && h < n; h++) {
    let s = 0;
    for (let i = h; i < n; i++) s += (x[i]! - mean) * (x[i - h]! - mean);
    out.push(c0 > 0 ? s / c0 : 0);
  }
  return out;
}
