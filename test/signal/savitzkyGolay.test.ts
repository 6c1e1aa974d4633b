import { describe, expect, it } from 'vitest';
import { savitzkyGolayCoefficients } from '../../src/signal/savitzkyGolayCoefficients.js';
import { localPolynomialAt, windowAround } from '../../src/signal/localPolynomialFit.js';

function expectCoefficients(actual: Float64Array, numerators: number[], norm: number): void {
  expect(actual).toHaveLength(numerators.length);
  numerators.forEach((c, j) => expect(actual[j]).toBeCloseTo(c / norm, 13));
}

describe('savitzkyGolayCoefficients against the published tables', () => {
  // Reference: Savitzky & Golay (1964), Anal. Chem. 36:1627, Table I, as corrected by Steinier, Termonia &
  // Deltour (1972), Anal. Chem. 44:1906 — 5-point quadratic smoothing (−3, 12, 17, 12, −3)/35.
  it('gives the 5-point quadratic smoothing weights', () => {
    expectCoefficients(savitzkyGolayCoefficients({ halfWidth: 2, order: 2, derivative: 0 }), [-3, 12, 17, 12, -3], 35);
  });

  // Same source: 7-point quadratic smoothing (−2, 3, 6, 7, 6, 3, −2)/21.
  it('gives the 7-point quadratic smoothing weights', () => {
    expectCoefficients(savitzkyGolayCoefficients({ halfWidth: 3, order: 2, derivative: 0 }), [-2, 3, 6, 7, 6, 3, -2], 21);
  });

  // Same source: 5-point first derivative (linear/quadratic) (−2, −1, 0, 1, 2)/10.
  it('gives the 5-point first-derivative weights', () => {
    expectCoefficients(savitzkyGolayCoefficients({ halfWidth: 2, order: 2, derivative: 1 }), [-2, -1, 0, 1, 2], 10);
    expectCoefficients(savitzkyGolayCoefficients({ halfWidth: 2, order: 1, derivative: 1 }), [-2, -1, 0, 1, 2], 10);
  });

  // Same source, quartic smoothing, 7 points: (5, −30, 75, 131, 75, −30, 5)/231 (value recalled from memory of the table).
  it('gives the 7-point quartic smoothing weights', () => {
    expectCoefficients(savitzkyGolayCoefficients({ halfWidth: 3, order: 4, derivative: 0 }), [5, -30, 75, 131, 75, -30, 5], 231);
  });

  it('rejects an order the window cannot support', () => {
    expect(() => savitzkyGolayCoefficients({ halfWidth: 1, order: 3 })).toThrow(/order/);
  });
});

describe('localPolynomialAt on real time', () => {
  // Reference: the Savitzky–Golay weights, themselves checked against the published tables above (a different
  // code path: a fixed convolution instead of a least-squares fit on real times).
  it('reproduces the Savitzky–Golay filter on equally spaced samples (spacing 1/60 s)', () => {
    const dt = 1 / 60;
    const t = Float64Array.from({ length: 40 }, (_, i) => 1000 + i * dt);
    const y = Float64Array.from(t, (_, i) => Math.sin(i * 0.7) * 3 + i * 0.2);
    const c0 = savitzkyGolayCoefficients({ halfWidth: 3, order: 2, derivative: 0 });
    const c1 = savitzkyGolayCoefficients({ halfWidth: 3, order: 2, derivative: 1 });
    const i = 20;
    const f = localPolynomialAt(t, y, i, i - 3, i + 3, 3 * dt * 1.0000001, 2)!;
    let s0 = 0;
    let s1 = 0;
    for (let j = -3; j <= 3; j++) {
      s0 += c0[j + 3]! * y[i + j]!;
      s1 += (c1[j + 3]! * y[i + j]!) / dt;
    }
    expect(f.value).toBeCloseTo(s0, 10);
    expect(f.rate).toBeCloseTo(s1, 8);
    // the leverage of the centre is the centre weight (17/35-type value for 7 points: 7/21)
    expect(f.valueFactor).toBeCloseTo(7 / 21, 12);
  });

  // a local quadratic fit is exact on a quadratic (least squares, common practice, no source): truth 40 + 6(t − 3600)
  it('differentiates a quadratic exactly on irregular times far from zero', () => {
    const t: number[] = [];
    let tt = 3600;
    for (let i = 0; i < 30; i++) {
      tt += 0.01 + 0.03 * ((i * 7919) % 13) / 13;
      t.push(tt);
    }
    const ts = Float64Array.from(t);
    const y = Float64Array.from(ts, (v) => 5 + 40 * (v - 3600) + 3 * (v - 3600) ** 2);
    const i = 12;
    const [lo, hi] = windowAround(ts, i, 0.1, 4);
    const f = localPolynomialAt(ts, y, i, lo, hi, 0.1, 2)!;
    expect(f.rate).toBeCloseTo(40 + 6 * (ts[i]! - 3600), 7);
  });
});
