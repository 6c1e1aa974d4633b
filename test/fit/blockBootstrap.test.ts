import { describe, expect, it } from 'vitest';
import { Matrix, solve } from 'ml-matrix';
import { sampleCorrelation } from 'simple-statistics';
import { chooseBlockLength, circularBlockSampler, lag1Autocorrelation, monteCarloCriticalValue, sampleQuantile } from '../../src/fit/blockBootstrap.js';
import { chooseAutoregressiveOrder, fitAutoregression } from '../../src/fit/autoregressiveErrors.js';
import { batchMeansEffectiveSize } from '../../src/fit/batchMeansEffectiveSize.js';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';

function gaussianSource(seed: number): () => number {
  const rng = xoroshiro128plus(seed);
  return () => Math.sqrt(-2 * Math.log(uniformFloat64(rng) || 1e-300)) * Math.cos(2 * Math.PI * uniformFloat64(rng));
}

/** Invented test input: an AR(p) series with the given coefficients and unit innovations. */
function arSeries(phi: number[], n: number, seed: number): Float64Array {
  const gauss = gaussianSource(seed);
  const x = new Float64Array(n + 200);
  for (let i = 0; i < x.length; i++) {
    let v = gauss();
    for (let j = 0; j < phi.length && i - j - 1 >= 0; j++) v += phi[j]! * x[i - j - 1]!;
    x[i] = v;
  }
  return x.subarray(200);
}

describe('circular block bootstrap', () => {
  it('builds each resample from blocks of consecutive values, wrapping at the end, deterministically per seed', () => {
    const x = Float64Array.from({ length: 20 }, (_, i) => i);
    const a = new Float64Array(20);
    const b = new Float64Array(20);
    circularBlockSampler(x, 5, 42).resample(a);
    circularBlockSampler(x, 5, 42).resample(b);
    expect(Array.from(a)).toEqual(Array.from(b));
    for (let block = 0; block < 4; block++) {
      for (let j = 1; j < 5; j++) expect(a[block * 5 + j]).toBe((a[block * 5 + j - 1]! + 1) % 20);
    }
    const c = new Float64Array(20);
    circularBlockSampler(x, 5, 43).resample(c);
    expect(Array.from(c)).not.toEqual(Array.from(a));
  });

  // Reference: Politis & Romano (1992), circular block bootstrap of the mean (from memory): with n = k·b,
  // E*[mean*] = mean and Var*[mean*] = (1/n)·Σ_{|h|<b} (1 − |h|/b)·γ̃(h), γ̃ the circular autocovariance.
  it('matches the closed-form bootstrap variance of the mean', () => {
    const n = 200;
    const b = 10;
    const x = arSeries([0.6], n, 3);
    let mean = 0;
    for (const v of x) mean += v;
    mean /= n;
    const circ = (h: number) => {
      let s = 0;
      for (let i = 0; i < n; i++) s += (x[i]! - mean) * (x[(i + h + n) % n]! - mean);
      return s / n;
    };
    let expected = 0;
    for (let h = -(b - 1); h <= b - 1; h++) expected += (1 - Math.abs(h) / b) * circ(h);
    expected /= n;
    const sampler = circularBlockSampler(x, b, 9);
    const resample = new Float64Array(n);
    const means = new Float64Array(4000);
    for (let r = 0; r < means.length; r++) {
      sampler.resample(resample);
      let s = 0;
      for (const v of resample) s += v;
      means[r] = s / n;
    }
    let m = 0;
    for (const v of means) m += v;
    m /= means.length;
    let vv = 0;
    for (const v of means) vv += (v - m) ** 2;
    vv /= means.length - 1;
    // Monte Carlo: 4000 draws give the variance to about ±2.2% (1 sd); allow 4 sd.
    expect(Math.abs(vv - expected) / expected).toBeLessThan(0.09);
    expect(Math.abs(m - mean)).toBeLessThan(4 * Math.sqrt(expected / 4000));
  });

  it('chooses short blocks for white noise and longer ones for strongly correlated noise', () => {
    const white = arSeries([], 1000, 5);
    const strong = arSeries([0.9], 1000, 5);
    const mild = arSeries([0.5], 1000, 5);
    expect(chooseBlockLength(white)).toBeLessThanOrEqual(2);
    expect(chooseBlockLength(strong)).toBeGreaterThan(chooseBlockLength(mild));
    expect(chooseBlockLength(strong)).toBeLessThanOrEqual(250);
  });

  // Reference library: simple-statistics sampleCorrelation of (x_t, x_{t+1}) — equal to our lag-1
  // autocorrelation up to the O(1/n) difference between the two normalisations.
  it('estimates the lag-1 autocorrelation like simple-statistics', () => {
    const x = arSeries([0.7], 5000, 8);
    const ref = sampleCorrelation(Array.from(x.subarray(0, -1)), Array.from(x.subarray(1)));
    expect(lag1Autocorrelation(x)).toBeCloseTo(ref, 2);
  });

  // Reference: for AR(1) the integrated autocorrelation time is (1 + ρ)/(1 − ρ) (textbook result), so batch
  // means of a long AR(0.5) series give n_eff ≈ n/3; a random walk gives far fewer.
  it('estimates the effective sample size by batch means', () => {
    const x = arSeries([0.5], 60000, 17);
    expect(batchMeansEffectiveSize(x) / 20000).toBeGreaterThan(0.6);
    expect(batchMeansEffectiveSize(x) / 20000).toBeLessThan(1.6);
    const walk = arSeries([1], 60000, 18);
    expect(batchMeansEffectiveSize(walk)).toBeLessThan(100);
  });

  // Reference: Davison & Hinkley (1997), §2.4 and §5.2 (from memory): with B = 199 draws the 95% critical
  // value is the (B + 1)·0.95 = 190th smallest; with B = 99, the 95th; a rank past B gives the largest draw.
  it('takes the ⌈(B + 1)·level⌉-th smallest draw as the Monte Carlo critical value', () => {
    const draws199 = Float64Array.from({ length: 199 }, (_, i) => 199 - i);
    expect(monteCarloCriticalValue(draws199, 0.95)).toBe(190);
    const draws99 = Float64Array.from({ length: 99 }, (_, i) => (i * 37) % 99);
    expect(monteCarloCriticalValue(draws99, 0.95)).toBe(94);
    expect(monteCarloCriticalValue(Float64Array.of(3, 1, 2), 0.99)).toBe(3);
  });

  it('computes type-7 sample quantiles (the default of R and NumPy)', () => {
    expect(sampleQuantile(Float64Array.of(4, 1, 3, 2), 0.5)).toBe(2.5);
    expect(sampleQuantile(Float64Array.of(1, 2, 3, 4, 5), 0.9)).toBeCloseTo(4.6, 12);
  });
});

describe('autoregressive model of residuals', () => {
  // Reference library: ml-matrix solve (least squares) on the lagged design matrix.
  it('fits AR coefficients by conditional least squares like ml-matrix', () => {
    const x = arSeries([0.5, 0.3], 2000, 12);
    const phi = fitAutoregression(x, 2);
    const rows: number[][] = [];
    const rhs: number[][] = [];
    for (let t = 2; t < x.length; t++) {
      rows.push([x[t - 1]!, x[t - 2]!]);
      rhs.push([x[t]!]);
    }
    const ref = solve(new Matrix(rows), new Matrix(rhs));
    expect(phi[0]).toBeCloseTo(ref.get(0, 0), 10);
    expect(phi[1]).toBeCloseTo(ref.get(1, 0), 10);
    expect(phi[0]).toBeCloseTo(0.5, 1);
    expect(phi[1]).toBeCloseTo(0.3, 1);
  });

  it('chooses order 0 for white noise and at least 2 for an AR(2) series', () => {
    expect(chooseAutoregressiveOrder(arSeries([], 2000, 13), 8)).toBe(0);
    expect(chooseAutoregressiveOrder(arSeries([0.5, 0.3], 2000, 14), 8)).toBeGreaterThanOrEqual(2);
  });
});
