import { describe, expect, it } from 'vitest';
import { curveProblem, fitDynamicsCurve, type CurveModel } from '../../src/fit/fitDynamicsCurve.js';

/** Invented test model: y = a·(1 − e^(−b·t)), with its closed-form gradient (calculus, common practice, no source). */
const saturating: CurveModel = {
  k: 2,
  evaluate: (p, t, grad) => {
    const e = Math.exp(-p[1]! * t);
    grad[0] = 1 - e;
    grad[1] = p[0]! * t * e;
    return p[0]! * (1 - e);
  },
};

describe('curveProblem', () => {
  const t = Float64Array.from({ length: 50 }, (_, i) => i / 10);
  const y = t.map((v) => 3 * (1 - Math.exp(-0.7 * v)) + 0.01 * Math.sin(7 * v));
  const problem = curveProblem(saturating, t, y);

  it('gives residuals y − f(t)', () => {
    const r = new Float64Array(t.length);
    problem.residuals(Float64Array.of(2, 0.5), r);
    for (let i = 0; i < t.length; i++) expect(r[i]).toBeCloseTo(y[i]! - 2 * (1 - Math.exp(-0.5 * t[i]!)), 14);
  });

  // The residual pass keeps the Jacobian for reuse; a request at other parameters must not get the kept one.
  it('gives the closed-form Jacobian at the parameters asked for, whatever the last residual pass used', () => {
    const r = new Float64Array(t.length);
    const jac = new Float64Array(2 * t.length);
    for (const [pr, pj] of [[Float64Array.of(2, 0.5), Float64Array.of(2, 0.5)], [Float64Array.of(2, 0.5), Float64Array.of(4, 1.2)], [Float64Array.of(4, 1.2), Float64Array.of(4, 1.2)]] as const) {
      problem.residuals(pr, r);
      problem.jacobian(pj, jac);
      for (let i = 0; i < t.length; i++) {
        const e = Math.exp(-pj[1]! * t[i]!);
        expect(jac[i]).toBeCloseTo(1 - e, 14);
        expect(jac[t.length + i]).toBeCloseTo(pj[0]! * t[i]! * e, 14);
      }
    }
  });
});

describe('fitDynamicsCurve with repeated values (a compressed clip\'s still picture)', () => {
  // invented series: 40 points of the saturating curve with seeded-looking wiggle, preceded by 25 copies of its first value
  const tMove = Float64Array.from({ length: 40 }, (_, i) => 2.5 + i / 10);
  const yMove = tMove.map((v) => 3 * (1 - Math.exp(-0.7 * (v - 2.5))) + 0.02 * Math.sin(13 * v));
  const t = Float64Array.from([...Array.from({ length: 25 }, (_, i) => i / 10), ...tMove]);
  const y = Float64Array.from([...Array.from({ length: 25 }, () => yMove[0]!), ...yMove]);
  const shifted: CurveModel = { k: 2, evaluate: (p, tt, grad) => saturating.evaluate(p, Math.max(0, tt - 2.5), grad) };

  it('leaves out every value equal to the one before it: the same fit as without those rows, with residuals for every row', () => {
    const withRepeats = fitDynamicsCurve(shifted, t, y, [Float64Array.of(2, 0.5)], { replicates: 0 });
    const kept = [0, ...Array.from({ length: 40 }, (_, i) => 25 + i)].filter((i, j, all) => j === 0 || y[i] !== y[all[j - 1]!]);
    const without = fitDynamicsCurve(shifted, Float64Array.from(kept, (i) => t[i]!), Float64Array.from(kept, (i) => y[i]!), [Float64Array.of(2, 0.5)], { replicates: 0 });
    expect(Array.from(withRepeats.params)).toEqual(Array.from(without.params));
    expect(Array.from(withRepeats.covariance)).toEqual(Array.from(without.covariance));
    // every row gets its residual from the fitted curve, the left-out ones too, and rss sums them all
    const grad = new Float64Array(2);
    let rss = 0;
    for (let i = 0; i < 65; i++) {
      const e = y[i]! - shifted.evaluate(withRepeats.params, t[i]!, grad);
      expect(withRepeats.residuals[i]).toBeCloseTo(e, 12);
      rss += e * e;
    }
    expect(withRepeats.rss).toBeCloseTo(rss, 12);
  });
});
