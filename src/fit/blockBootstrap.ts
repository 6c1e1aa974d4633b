/**
 * Block bootstrap of autocorrelated residuals.
 *
 * Resampling: circular block bootstrap (Politis & Romano 1992), the wrap-around variant of the moving
 * block bootstrap (Künsch 1989): the resample is built from blocks of `blockLength` consecutive residuals
 * whose start points are drawn uniformly, the series treated as a circle so every point is equally likely.
 * Block length: the Politis & White (2004) rule for the circular block bootstrap, b = (2G²/D)^(1/3)·n^(1/3)
 * with D = (4/3)·g(0)² (as corrected by Patton, Politis & White 2009), evaluated for an AR(1) fitted to the
 * residuals, where G/g(0) = 2ρ/(1 − ρ²); so b = (6ρ²/(1 − ρ²)²)^(1/3)·n^(1/3). (Formulas written from memory.)
 * Seeded with pure-rand's xoroshiro128+, so the same inputs and seed give the same draws. fitDynamicsCurve.ts uses it
 * to resample the innovations of its autoregressive sieve bootstrap.
 */
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { uniformInt } from 'pure-rand/distribution/uniformInt';

/** Lag-1 autocorrelation of a series about its mean (dimensionless; 0 for fewer than 3 points). */
export function lag1Autocorrelation(x: ArrayLike<number>): number {
  const n = x.length;
  if (n < 3) return 0;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += x[i]!;
  mean /= n;
  let c0 = 0;
  let c1 = 0;
  for (let i = 0; i < n; i++) {
    const d = x[i]! - mean;
    c0 += d * d;
    if (i + 1 < n) c1 += d * (x[i + 1]! - mean);
  }
  return c0 > 0 ? c1 / c0 : 0;
}

/** Block length (samples) for the circular block bootstrap of `residuals`, by the Politis–White AR(1) plug-in rule; between 1 and n/4. */
export function chooseBlockLength(residuals: ArrayLike<number>): number {
  const n = residuals.length;
  const rho = Math.min(Math.max(lag1Autocorrelation(residuals), 0), 0.995);
  const ratio = (2 * rho) / (1 - rho * rho);
  const b = Math.cbrt(1.5 * ratio * ratio) * Math.cbrt(n);
  return Math.max(1, Math.min(Math.floor(n / 4), Math.round(b)));
}

/** A seeded source of block start indices. */
export interface BlockSampler {
  /** Fills `out` (length n) with a circular block resample of `residuals` (length n). */
  resample: (out: Float64Array) => void;
  blockLength: number;
}

/** A seeded circular block resampler of `residuals` with the given block length. */
export function circularBlockSampler(residuals: Float64Array, blockLength: number, seed: number): BlockSampler {
  const n = residuals.length;
  const b = Math.max(1, Math.min(n, Math.round(blockLength)));
  const rng = xoroshiro128plus(seed);
  return {
    blockLength: b,
    resample: (out) => {
      let i = 0;
      while (i < n) {
        let s = uniformInt(rng, 0, n - 1);
        for (let j = 0; j < b && i < n; j++, i++) {
          out[i] = residuals[s]!;
          s = s + 1 === n ? 0 : s + 1;
        }
      }
    },
  };
}

/** Quantile q (0…1) of a sample by linear interpolation between order statistics (Hyndman & Fan 1996, type 7). */
export function sampleQuantile(values: Float64Array, q: number): number {
  const sorted = Float64Array.from(values).sort();
  const h = (sorted.length - 1) * q;
  const lo = Math.floor(h);
  const hi = Math.min(sorted.length - 1, lo + 1);
  return sorted[lo]! + (h - lo) * (sorted[hi]! - sorted[lo]!);
}

/**
 * Critical value from B Monte Carlo draws of a statistic (e.g. |t*| of a bootstrap-t): the ⌈(B + 1)·level⌉-th
 * smallest draw (the largest when that rank exceeds B). With the observed statistic exchangeable with the
 * draws, it falls at or below this value with probability ⌈(B + 1)·level⌉/(B + 1) ≥ level, e.g. exactly 0.95
 * for B = 199 (Davison & Hinkley 1997, §2.4 and §5.2; from memory), where interpolating between order
 * statistics (sampleQuantile) gives about 189.1/200 = 0.9455.
 */
export function monteCarloCriticalValue(draws: Float64Array, level: number): number {
  const sorted = Float64Array.from(draws).sort();
  const rank = Math.min(sorted.length, Math.ceil((sorted.length + 1) * level - 1e-9));
  return sorted[Math.max(1, rank) - 1]!;
}
