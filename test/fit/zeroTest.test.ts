import { describe, expect, it } from 'vitest';
import { zeroTest } from '../../src/fit/zeroTest.js';
import { minDetectableRate } from '../../src/fit/minDetectableRate.js';

// Student-t critical values from the NIST/SEMATECH e-Handbook of Statistical Methods, §1.3.6.7.2
// (upper critical values of the t distribution): t_{0.975,10} = 2.228, t_{0.95,10} = 1.812, t_{0.80,10} = 0.879
// (the 0.80 point from the classical table in Fisher & Yates; quoted from memory).
describe('zeroTest', () => {
  it('gives p = 0.05 two-sided at t = 2.228 with 10 df', () => {
    const z = zeroTest(2.228 * 0.1, 0.1, 10);
    expect(z.p_value).toBeCloseTo(0.05, 3);
    expect(z.p_sign).toBeCloseTo(0.025, 3);
    expect(z.statistic).toBeCloseTo(2.228, 10);
  });

  it('is symmetric in the sign of the rate', () => {
    expect(zeroTest(-0.3, 0.1, 10).p_value).toBeCloseTo(zeroTest(0.3, 0.1, 10).p_value, 14);
  });

  // TOST (Schuirmann 1987): equivalent at α = 0.05 when both one-sided tests reject, i.e. when
  // |rate| + t_{0.95,df}·se < margin.
  it('declares equivalence exactly when the 90% interval lies inside ±margin', () => {
    const se = 0.1;
    const inside = zeroTest(0.05, se, 10, { margin_deg_s: 0.05 + 1.812 * se + 0.002, level: 0.95 });
    const outside = zeroTest(0.05, se, 10, { margin_deg_s: 0.05 + 1.812 * se - 0.002, level: 0.95 });
    expect(inside.equivalent_to_zero).toBe(true);
    expect(outside.equivalent_to_zero).toBe(false);
    expect(inside.equivalence_p_value!).toBeLessThan(0.05);
    expect(outside.equivalence_p_value!).toBeGreaterThan(0.05);
  });
});

describe('minDetectableRate', () => {
  it('is (t_{0.975,10} + t_{0.80,10})·se = (2.228 + 0.879)·se', () => {
    expect(minDetectableRate(0.2, 10, 0.95, 0.8)).toBeCloseTo((2.228 + 0.879) * 0.2, 2);
  });
});
