// External check: NIST StRD nonlinear regression datasets (https://www.itl.nist.gov/div898/strd/),
// certified parameter values and standard deviations, from both NIST starting points.
// Files are read from ../shared/reference/strd/ (see SOURCES.md there).
import { describe, expect, it } from 'vitest';
import { levenbergMarquardt, type LeastSquaresProblem } from '../../src/fit/levenbergMarquardt.js';
import { readStrd } from './strdFile.js';

/** Model value f(x; b) and its gradient ∂f/∂b_j, for one StRD model. */
type Model = (x: number, b: Float64Array, grad: Float64Array) => number;

/** The StRD file's model as written in its header. */
const models: Record<string, Model> = {
  // y = b1*(1-exp[-b2*x])   (Misra1a, BoxBOD)
  exponentialRise: (x, b, g) => {
    const e = Math.exp(-b[1]! * x);
    g[0] = 1 - e;
    g[1] = b[0]! * x * e;
    return b[0]! * (1 - e);
  },
  // y = b1 * (1-(1+b2*x/2)**(-2))   (Misra1b)
  misra1b: (x, b, g) => {
    const u = 1 + (b[1]! * x) / 2;
    g[0] = 1 - u ** -2;
    g[1] = b[0]! * x * u ** -3;
    return b[0]! * (1 - u ** -2);
  },
  // y = b1*x**b2   (DanWood)
  power: (x, b, g) => {
    const v = x ** b[1]!;
    g[0] = v;
    g[1] = b[0]! * v * Math.log(x);
    return b[0]! * v;
  },
  // y = b1*exp(-b2*x) + b3*exp(-b4*x) + b5*exp(-b6*x)   (Lanczos3)
  threeExponentials: (x, b, g) => {
    let y = 0;
    for (let m = 0; m < 3; m++) {
      const e = Math.exp(-b[2 * m + 1]! * x);
      g[2 * m] = e;
      g[2 * m + 1] = -b[2 * m]! * x * e;
      y += b[2 * m]! * e;
    }
    return y;
  },
};

function problemFor(model: Model, x: number[], y: number[], k: number): LeastSquaresProblem {
  const n = y.length;
  const g = new Float64Array(k);
  return {
    n,
    residuals: (p, r) => {
      for (let i = 0; i < n; i++) r[i] = y[i]! - model(x[i]!, p, g);
    },
    jacobian: (p, jac) => {
      for (let i = 0; i < n; i++) {
        model(x[i]!, p, g);
        for (let j = 0; j < k; j++) jac[j * n + i] = g[j]!;
      }
    },
  };
}

/** Number of significant digits on which a and the certified value c agree (log relative error, as NIST's LRE). */
function agreeingDigits(a: number, c: number): number {
  if (a === c) return 16;
  return -Math.log10(Math.abs(a - c) / Math.abs(c));
}

const cases: { name: string; model: Model }[] = [
  { name: 'Misra1a', model: models.exponentialRise! }, // the spin-up velocity form
  { name: 'BoxBOD', model: models.exponentialRise! }, // same form, higher difficulty
  { name: 'Misra1b', model: models.misra1b! },
  { name: 'DanWood', model: models.power! },
  { name: 'Lanczos3', model: models.threeExponentials! },
];

describe('levenbergMarquardt against NIST StRD certified values', () => {
  for (const { name, model } of cases) {
    const data = readStrd(name);
    const k = data.certified.length;
    for (const start of [0, 1]) {
      // Reference: NIST StRD nonlinear regression, dataset `name`, certified values, start point start+1.
      it(`${name}, start ${start + 1}: parameters and standard deviations to ≥ 6 significant digits`, () => {
        const x = data.x.map((row) => row[0]!);
        const fit = levenbergMarquardt(problemFor(model, x, data.y, k), data.starts![start]!);
        expect(fit.converged).toBe(true);
        for (let j = 0; j < k; j++) {
          const cert = data.certified[j]!;
          expect(agreeingDigits(fit.params[j]!, cert.value), `${cert.name} = ${fit.params[j]}`).toBeGreaterThanOrEqual(6);
          expect(agreeingDigits(fit.se[j]!, cert.sd), `sd(${cert.name}) = ${fit.se[j]}`).toBeGreaterThanOrEqual(6);
        }
        expect(agreeingDigits(fit.rss, data.residualSumSquares!)).toBeGreaterThanOrEqual(6);
      });
    }
  }
});
