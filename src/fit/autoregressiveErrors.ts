/**
 * Autoregressive models of fit residuals, for regression with autocorrelated errors.
 *
 * Tracking noise on an angle series is autocorrelated (camera shake, bubbles, slow lighting changes), so
 * ordinary least-squares standard errors are too small. We model the residual e_t as an AR(P) process
 * e_t = φ_1·e_{t−1} + … + φ_P·e_{t−P} + a_t with white innovations a_t, choose P by Akaike's criterion on
 * Yule–Walker fits (Levinson–Durbin recursion; Brockwell & Davis 1991, §5.1 and §9.3), and estimate φ by
 * conditional least squares. Whitening a_t = e_t − Σφ_j·e_{t−j} turns the fit into one with white errors
 * (feasible generalised least squares, iterated as in Cochrane & Orcutt 1949).
 * Indices are sample indices: the series is treated as evenly spaced in frame order.
 */
import { householderQr } from './levenbergMarquardt.js';

/** Sample autocovariances γ(0…maxLag) of a series about its mean. */
export function autocovariance(x: ArrayLike<number>, maxLag: number): Float64Array {
  const n = x.length;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += x[i]!;
  mean /= n;
  const out = new Float64Array(maxLag + 1);
  for (let lag = 0; lag <= maxLag; lag++) {
    let s = 0;
    for (let i = lag; i < n; i++) s += (x[i]! - mean) * (x[i - lag]! - mean);
    out[lag] = s / n;
  }
  return out;
}

/**
 * AR order 0…maxOrder minimising AIC = n·ln σ²_p + 2p, with σ²_p the Yule–Walker innovation variance
 * from the Levinson–Durbin recursion.
 */
export function chooseAutoregressiveOrder(e: ArrayLike<number>, maxOrder: number): number {
  const n = e.length;
  const maxP = Math.max(0, Math.min(maxOrder, Math.floor(n / 10)));
  const gamma = autocovariance(e, maxP);
  if (!(gamma[0]! > 0)) return 0;
  let sigma2 = gamma[0]!;
  let best = 0;
  let bestAic = n * Math.log(sigma2);
  let phi = new Float64Array(0);
  for (let p = 1; p <= maxP; p++) {
    let acc = gamma[p]!;
    for (let j = 1; j < p; j++) acc -= phi[j - 1]! * gamma[p - j]!;
    const kappa = acc / sigma2;
    const next = new Float64Array(p);
    for (let j = 1; j < p; j++) next[j - 1] = phi[j - 1]! - kappa * phi[p - j - 1]!;
    next[p - 1] = kappa;
    phi = next;
    sigma2 *= 1 - kappa * kappa;
    if (!(sigma2 > 0)) break;
    const aic = n * Math.log(sigma2) + 2 * p;
    if (aic < bestAic) {
      bestAic = aic;
      best = p;
    }
  }
  return best;
}

/** AR(P) coefficients φ_1…φ_P of e by conditional least squares (regress e_t on e_{t−1…t−P}, t ≥ P). */
export function fitAutoregression(e: ArrayLike<number>, order: number): Float64Array {
  const n = e.length;
  const m = n - order;
  if (order === 0 || m <= order) return new Float64Array(order);
  const a = new Float64Array(m * order);
  const b = new Float64Array(m);
  for (let j = 0; j < order; j++) for (let t = order; t < n; t++) a[j * m + t - order] = e[t - j - 1]!;
  for (let t = order; t < n; t++) b[t - order] = e[t]!;
  const r = householderQr(a, m, order, b);
  const phi = new Float64Array(order);
  for (let i = order - 1; i >= 0; i--) {
    let s = b[i]!;
    for (let l = i + 1; l < order; l++) s -= r[i * order + l]! * phi[l]!;
    const d = r[i * order + i]!;
    phi[i] = d !== 0 ? s / d : 0;
  }
  return phi;
}

/** Whitened values a_t = x_t − Σ_j φ_j·x_{t−j} for t = P…n−1 (length n − P), written into `out`. */
export function whiten(x: ArrayLike<number>, phi: Float64Array, out: Float64Array, outOffset = 0): void {
  const order = phi.length;
  const n = x.length;
  for (let t = order; t < n; t++) {
    let s = x[t]!;
    for (let j = 0; j < order; j++) s -= phi[j]! * x[t - j - 1]!;
    out[outOffset + t - order] = s;
  }
}
