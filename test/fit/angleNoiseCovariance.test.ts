// angleNoiseCovariance: the noise covariance the rate band uses. For weights that sum to zero (a derivative's),
// a random walk from 0 (Cov = q·min(t_a, t_b)) contributes exactly what −q·|t_a − t_b|/2 gives, because
// min(a, b) = (a + b − |a − b|)/2 (algebra; common practice, no source).
import { describe, expect, it } from 'vitest';
import { angleNoiseCovariance } from '../../src/fit/angleNoiseModel.js';

describe('angleNoiseCovariance', () => {
  it('is white at lag 0 only, AR(1) decaying with its correlation time, and −q|lag|/2 for the walk', () => {
    const m = { white_var_deg2: 0.01, ar_var_deg2: 0.04, ar_time_s: 0.5, walk_deg2_per_s: 0.2 };
    expect(angleNoiseCovariance(m, 0)).toBeCloseTo(0.05, 15);
    expect(angleNoiseCovariance(m, 0.5)).toBeCloseTo(0.04 * Math.exp(-1) - 0.05, 15);
    expect(angleNoiseCovariance(m, -0.5)).toBe(angleNoiseCovariance(m, 0.5));
  });

  it('gives a zero-sum weighting the same walk variance as the walk covariance q·min(t_a, t_b)', () => {
    const q = 0.3;
    const m = { white_var_deg2: 0, ar_var_deg2: 0, ar_time_s: 1, walk_deg2_per_s: q };
    const t = [0.1, 0.25, 0.4, 0.7, 0.75, 1.2];
    const w = [1, -2, 0.5, 3, -1.5, -1]; // sums to zero
    let exact = 0;
    let viaLag = 0;
    for (let a = 0; a < t.length; a++) {
      for (let b = 0; b < t.length; b++) {
        exact += w[a]! * w[b]! * q * Math.min(t[a]!, t[b]!);
        viaLag += w[a]! * w[b]! * angleNoiseCovariance(m, t[a]! - t[b]!);
      }
    }
    expect(viaLag).toBeCloseTo(exact, 12);
  });
});
