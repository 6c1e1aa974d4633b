import { describe, expect, it } from 'vitest';
import { linearRegression } from 'simple-statistics';
import { Matrix, inverse } from 'ml-matrix';
import { fitPowerLaw } from '../../src/fit/fitPowerLaw.js';

describe('fitPowerLaw (log–log least squares)', () => {
  it('recovers an exact power law', () => {
    const s = [0.5, 1, 2, 4, 8];
    const r = s.map((x) => 37.5 * x ** 1.7);
    const f = fitPowerLaw(s, r);
    expect(f.b.value).toBeCloseTo(1.7, 12);
    expect(f.a.value).toBeCloseTo(37.5, 10);
    expect(f.r2_log).toBeCloseTo(1, 12);
  });

  // Reference: simple-statistics linearRegression (slope m, intercept b) on (ln s, ln|ω|), and the
  // ordinary least-squares standard error √(s²·[(XᵀX)⁻¹]₂₂) computed with ml-matrix.
  it('agrees with simple-statistics and the textbook standard error on scattered data', () => {
    const s = [1.2, 1.2, 1.8, 2.4, 2.4, 3.0, 3.6, 3.6];
    const r = [14.0, 15.3, 26.2, 40.1, 37.0, 55.4, 70.2, 74.9];
    const f = fitPowerLaw(s, r);
    const pts = s.map((x, i) => [Math.log(x), Math.log(r[i]!)] as [number, number]);
    const ref = linearRegression(pts);
    expect(f.b.value).toBeCloseTo(ref.m, 12);
    expect(f.ln_a.value).toBeCloseTo(ref.b, 12);
    const X = new Matrix(pts.map(([x]) => [1, x]));
    const rss = pts.reduce((acc, [x, y]) => acc + (y - ref.b - ref.m * x) ** 2, 0);
    const s2 = rss / (pts.length - 2);
    const cov = inverse(X.transpose().mmul(X)).mul(s2);
    expect(f.b.se).toBeCloseTo(Math.sqrt(cov.get(1, 1)), 12);
    expect(f.ln_a.se).toBeCloseTo(Math.sqrt(cov.get(0, 0)), 12);
    // t(0.975, 6) = 2.447 (Student t table)
    expect(f.b.ci[1] - f.b.value).toBeCloseTo(2.447 * f.b.se, 3);
  });

  it('refuses zero or negative rates with a sentence', () => {
    expect(() => fitPowerLaw([1, 2, 3], [1, 0, 2])).toThrow(/positive settings and rates; point 2/);
    expect(() => fitPowerLaw([2, 2], [1, 3])).toThrow(/two different settings/);
  });
});
