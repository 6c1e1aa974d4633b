/**
 * Block bootstrap of autocorrelated residuals.
 *
 * Resampling: circular block bootstrap (Politis & Romano 1992), the wrap-around variant of the moving
 * block bootstrap (Künsch 1989): the resample is built from blocks of `blockLength` consecutive residuals
 * whose start points are drawn uniformly, the series treated as a circle so every point is equally likely.
 * Block length: the Politis & White (2004) rule for the circular block bootstrap, b = (2G²/D)^(1/3)·n^(1/3)
 * with D = (4/3)·g(0)² (as corrected by Patton, Politis & White 2009), evaluated for an AR(1) fitted to the
 * residuals, where G/g(0) = 2ρ/(1 − ρ²); so b = (6ρ²/(1 − ρ²)²)^(1/3)·n^(1/3). (Formulas written from memory.)
 * Seeded with pure-rand's xoroshiro128+, so the same inputs and seed give the same draws.
 */
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { uniformInt } from 'pure-rand/distribution/uniformInt';

export interface BlockBootstrapOptions {
  /** Number of bootstrap replicates. Default 199. */
  replicates?: number;
  /** Block length in samples; default chosen from the residuals by `chooseBlockLength`. */
  blockLength?: number;
  /** Seed of the random generator. Default 1. */
  seed?: number;
}

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

/**
 * Effective number of independent points of an AR(1) series with lag-1 autocorrelation ρ: n(1 − ρ)/(1 + ρ)
 * (the variance inflation of a mean, e.g. Bayley & Hammersley 1946; negative ρ is treated as 0), at least 2.
 */
export function effectiveSampleSize(n: number, rho: number): number {
  const r = Math.min(Math.max(rho, 0), 0.999);
  return Math.max(2, Math.min(n, (n * (1 - r)) / (1 + r)));
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

/**
 * Runs `replicates` circular block bootstrap resamples of `residuals` through `statistic` (e.g. a refit
 * of the model to fitted + resampled residuals) and returns the statistic's draws, row r = replicate r
 * (rows for which the statistic returned null, e.g. a refit that failed, are dropped).
 */
export function blockBootstrap(
  residuals: Float64Array,
  options: BlockBootstrapOptions,
  statistic: (resampled: Float64Array) => Float64Array | null,
): { draws: Float64Array[]; blockLength: number; failed: number } {
  const replicates = options.replicates ?? 199;
  const blockLength = options.blockLength ?? chooseBlockLength(residuals);
  const sampler = circularBlockSampler(residuals, blockLength, options.seed ?? 1);
  const buffer = new Float64Array(residuals.length);
  const draws: Float64Array[] = [];
  let failed = 0;
  for (let r = 0; r < replicates; r++) {
    sampler.resample(buffer);
    const value = statistic(buffer);
    if (value === null || value.some((v) => !Number.isFinite(v))) failed++;
    else draws.push(value);
  }
  return { draws, blockLength: sampler.blockLength, failed };
}

/** Sample standard deviation of component j of the draws. */
export function drawStandardDeviation(draws: Float64Array[], j: number): number {
  const m = draws.length;
  if (m < 2) return NaN;
  let mean = 0;
  for (const d of draws) mean += d[j]!;
  mean /= m;
  let ss = 0;
  for (const d of draws) ss += (d[j]! - mean) ** 2;
  return Math.sqrt(ss / (m - 1));
}

/** Quantile q (0…1) of a sample by linear interpolation between order statistics (Hyndman & Fan 1996, type 7). */
export function sampleQuantile(values: Float64Array, q: number): number {
  const sorted = Float64Array.from(values).sort();
  const h = (sorted.length - 1) * q;
  const lo = Math.floor(h);
  const hi = Math.min(sorted.length - 1, lo + 1);
  return sorted[lo]! + (h - lo) * (sorted[hi]! - sorted[lo]!);
}
