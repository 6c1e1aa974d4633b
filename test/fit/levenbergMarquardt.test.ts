import { describe, expect, it } from 'vitest';
import { Matrix, QrDecomposition, inverse } from 'ml-matrix';
import { householderQr, inverseNormal, levenbergMarquardt, type LeastSquaresProblem } from '../../src/fit/levenbergMarquardt.js';
import { readStrd } from './strdFile.js';

/** A column-major copy of an ml-matrix Matrix. */
function columnMajor(m: Matrix): Float64Array {
  const out = new Float64Array(m.rows * m.columns);
  for (let j = 0; j < m.columns; j++) for (let i = 0; i < m.rows; i++) out[j * m.rows + i] = m.get(i, j);
  return out;
}

const a = new Matrix([
  [1, 2, 0.5],
  [3, -1, 2],
  [0.2, 4, 1],
  [5, 1, -3],
  [2, 2, 2],
]);

describe('Householder QR and (JᵀJ)⁻¹', () => {
  // Reference library: ml-matrix (QrDecomposition, inverse).
  it('gives an R with RᵀR = AᵀA and |R| equal to ml-matrix QrDecomposition', () => {
    const r = householderQr(columnMajor(a), 5, 3, new Float64Array(5));
    const ref = new QrDecomposition(a).upperTriangularMatrix;
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) expect(Math.abs(r[i * 3 + j]!)).toBeCloseTo(Math.abs(ref.get(i, j)), 12);
    const ata = a.transpose().mmul(a);
    for (let i = 0; i < 3; i++) {
      for (let j = 0; j < 3; j++) {
        let s = 0;
        for (let l = 0; l < 3; l++) s += r[l * 3 + i]! * r[l * 3 + j]!;
        expect(s).toBeCloseTo(ata.get(i, j), 11);
      }
    }
  });

  it('gives (JᵀJ)⁻¹ equal to ml-matrix inverse(AᵀA)', () => {
    const inv = inverseNormal(columnMajor(a), 5, 3);
    const ref = inverse(a.transpose().mmul(a));
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) expect(inv[i * 3 + j]).toBeCloseTo(ref.get(i, j), 12);
  });

  it('reports NaN for a rank-deficient Jacobian instead of a meaningless inverse', () => {
    const singular = new Matrix([
      [1, 2],
      [2, 4],
      [3, 6],
    ]);
    expect(Array.from(inverseNormal(columnMajor(singular), 3, 2)).every(Number.isNaN)).toBe(true);
  });
});

describe('levenbergMarquardt', () => {
  // Reference: Moré, Garbow & Hillstrom (1981), "Testing unconstrained optimization software", problem 1
  // (Rosenbrock): r1 = 10(x2 − x1²), r2 = 1 − x1, standard start (−1.2, 1), minimum 0 at (1, 1).
  it('solves the Rosenbrock problem from the standard start', () => {
    const problem: LeastSquaresProblem = {
      n: 2,
      // our convention: residual = y − f with y = 0 and f = the MGH residual functions
      residuals: (p, r) => {
        r[0] = -10 * (p[1]! - p[0]! * p[0]!);
        r[1] = -(1 - p[0]!);
      },
      jacobian: (p, jac) => {
        jac[0] = -20 * p[0]!;
        jac[1] = -1;
        jac[2] = 10;
        jac[3] = 0;
      },
    };
    const fit = levenbergMarquardt(problem, [-1.2, 1]);
    expect(fit.converged).toBe(true);
    expect(fit.params[0]).toBeCloseTo(1, 10);
    expect(fit.params[1]).toBeCloseTo(1, 10);
  });

  // Reference: NIST StRD linear regression, Norris (certified values); a linear model is a one-step
  // nonlinear problem, so LM must reproduce the certified estimates and standard deviations.
  it('reproduces the NIST Norris certified line and standard deviations', () => {
    const data = readStrd('Norris');
    const x = data.x.map((row) => row[0]!);
    const n = x.length;
    const problem: LeastSquaresProblem = {
      n,
      residuals: (p, r) => {
        for (let i = 0; i < n; i++) r[i] = data.y[i]! - p[0]! - p[1]! * x[i]!;
      },
      jacobian: (_p, jac) => {
        for (let i = 0; i < n; i++) {
          jac[i] = 1;
          jac[n + i] = x[i]!;
        }
      },
    };
    const fit = levenbergMarquardt(problem, [0, 0]);
    for (let j = 0; j < 2; j++) {
      const cert = data.certified[j]!;
      expect(Math.abs(fit.params[j]! - cert.value) / Math.abs(cert.value)).toBeLessThan(1e-9);
      expect(Math.abs(fit.se[j]! - cert.sd) / cert.sd).toBeLessThan(1e-9);
    }
    expect(Math.abs(fit.rss - data.residualSumSquares!) / data.residualSumSquares!).toBeLessThan(1e-9);
  });

  it('throws a RangeError when the model is not finite at the start', () => {
    const problem: LeastSquaresProblem = {
      n: 3,
      residuals: (p, r) => r.fill(Math.log(p[0]!)),
      jacobian: (p, jac) => jac.fill(1 / p[0]!),
    };
    expect(() => levenbergMarquardt(problem, [-1])).toThrow(RangeError);
  });
});
