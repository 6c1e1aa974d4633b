import { describe, expect, it } from 'vitest';
import { compareDirections, deltaRatioInterval, fiellerInterval, type RateEstimate } from '../../src/fit/compareDirections.js';
import { seededRandom } from '../../src/synth/seededRandom.js';

const est = (value_deg_s: number, se_deg_s: number, df = Infinity): RateEstimate => ({ value_deg_s, se_deg_s, df });

describe('fiellerInterval (Fieller 1954)', () => {
  // Fieller's set reduces to the delta-method interval when the denominator is known precisely
  // (common practice, no source: both become N/D ± z·se_N/|D|).
  it('approaches the delta-method interval when the denominator is precise', () => {
    const n = est(-2.4, 0.3);
    const d = est(60, 1e-6);
    const f = fiellerInterval(n, d);
    const dm = deltaRatioInterval(n, d);
    expect(f.kind).toBe('bounded');
    expect(f.bounds[0]).toBeCloseTo(dm.ci[0], 9);
    expect(f.bounds[1]).toBeCloseTo(dm.ci[1], 9);
    // z(0.975) = 1.959964 (standard normal table)
    expect(dm.ci[1]).toBeCloseTo(-2.4 / 60 + 1.959964 * 0.3 / 60, 6);
  });

  // Defining property (Fieller 1954): the end points are where (N − ρD)² / (se_N² + ρ² se_D²) = t².
  it('puts its end points where the Fieller statistic equals the critical value', () => {
    const n = est(-3.1, 0.8, 12);
    const d = est(42, 6, 20);
    const f = fiellerInterval(n, d);
    // t(0.975, 12) = 2.179 (Student t table, smaller of the two df)
    for (const rho of f.bounds) {
      const stat = (n.value_deg_s - rho * d.value_deg_s) ** 2 / (n.se_deg_s ** 2 + rho * rho * d.se_deg_s ** 2);
      expect(Math.sqrt(stat)).toBeCloseTo(2.179, 3);
    }
    expect(f.bounds[0]).toBeLessThan(-3.1 / 42);
    expect(f.bounds[1]).toBeGreaterThan(-3.1 / 42);
  });

  it('is unbounded, or two rays, when the denominator is not distinguishable from zero', () => {
    expect(fiellerInterval(est(0.1, 0.5), est(0.5, 1)).kind).toBe('unbounded');
    const ex = fiellerInterval(est(3, 0.5), est(0.5, 1));
    expect(ex.kind).toBe('exclusive');
    expect(ex.bounds[0]).toBeLessThan(ex.bounds[1]);
  });

  // Monte Carlo coverage (seeded): with a noisy denominator (se/D = 0.25) Fieller keeps its nominal 95%
  // coverage; the binomial standard error over 4000 trials is 0.0034.
  it('covers the true ratio 95% of the time with a noisy denominator', () => {
    const rng = seededRandom(20261202, 7);
    const trueN = -1.5;
    const trueD = 40;
    const seN = 0.4;
    const seD = 10;
    let covered = 0;
    const trials = 4000;
    for (let i = 0; i < trials; i++) {
      const f = fiellerInterval(est(trueN + seN * rng.normal(), seN), est(trueD + seD * rng.normal(), seD));
      const rho = trueN / trueD;
      const inside = f.kind === 'bounded' ? rho >= f.bounds[0] && rho <= f.bounds[1] : f.kind === 'exclusive' ? rho <= f.bounds[0] || rho >= f.bounds[1] : true;
      if (inside) covered++;
    }
    expect(covered / trials).toBeGreaterThan(0.94);
    expect(covered / trials).toBeLessThan(0.96);
  });
});

describe('compareDirections', () => {
  // z(0.95) = 1.644854 (standard normal table): a reverse rate 1.644854 se on the other side of zero than
  // forward has a one-sided p-value of 0.05.
  it('gives p = 0.05 for a reverse rate 1.645 standard errors opposite to forward', () => {
    const c = compareDirections(est(120, 2), est(-1.644854 * 0.1, 0.1));
    expect(c.p_opposite).toBeCloseTo(0.05, 6);
    const same = compareDirections(est(-120, 2), est(-1.644854 * 0.1, 0.1));
    expect(same.p_opposite).toBeCloseTo(0.95, 6);
  });

  // Schuirmann (1987) two one-sided tests: at R = 0 with margin m = 1.644854·se each one-sided p is 0.05.
  it('tests equivalence to zero within a margin (TOST)', () => {
    const c = compareDirections(est(80, 1), est(0, 0.1), { margin_deg_s: 0.1644854 });
    expect(c.equivalence?.p_value).toBeCloseTo(0.05, 6);
    const wide = compareDirections(est(80, 1), est(0.02, 0.1), { margin_deg_s: 0.5 });
    expect(wide.equivalence?.equivalent).toBe(true);
    const narrow = compareDirections(est(80, 1), est(0.02, 0.1), { margin_deg_s: 0.05 });
    expect(narrow.equivalence?.equivalent).toBe(false);
    expect(compareDirections(est(80, 1), est(0.02, 0.1)).equivalence).toBeNull();
  });

  // Minimum detectable effect (common practice, no source): (z(0.975) + z(0.80))·se = (1.959964 + 0.841621)·se;
  // with 10 df: (t(0.975,10) + t(0.80,10))·se = (2.228 + 0.879)·se from a Student t table.
  it('states the minimum detectable reverse rate at 80% power', () => {
    expect(compareDirections(est(80, 1), est(0.3, 0.2)).min_detectable_deg_s).toBeCloseTo(2.801585 * 0.2, 5);
    expect(compareDirections(est(80, 1, 10), est(0.3, 0.2, 10)).min_detectable_deg_s).toBeCloseTo(3.107 * 0.2, 3);
  });

  it('reports the reverse/forward ratio with both intervals', () => {
    const c = compareDirections(est(90, 3, 20), est(-4.5, 0.5, 20));
    expect(c.ratio.value).toBeCloseTo(-0.05, 12);
    expect(c.ratio.fieller.kind).toBe('bounded');
    expect(c.ratio.delta.ci[0]).toBeLessThan(-0.05);
  });

  it('refuses an estimate without a standard error', () => {
    expect(() => compareDirections(est(1, 0), est(1, 1))).toThrow(/forward rate/);
    expect(() => compareDirections(est(1, 1), est(1, 1), { margin_deg_s: -1 })).toThrow(/margin/);
  });
});
