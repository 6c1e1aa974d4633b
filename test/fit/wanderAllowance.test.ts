// The steady rate allowing for a rate wander too small to detect: the restricted likelihood behind the walk's
// upper bound, the bound's coverage, the walk's effect on a trend slope, and the widened interval's coverage.
import { describe, expect, it } from 'vitest';
import { CholeskyDecomposition, Matrix, inverse } from 'ml-matrix';
import { restrictedLogLikelihood, kalmanWhiten } from '../../src/fit/stateSpaceGls.js';
import { walkUpperBound, wanderAllowedVariance } from '../../src/fit/wanderAllowance.js';
import { fitSteadyRate, walkSensitivity } from '../../src/fit/steadyRate.js';
import { simulateSteady } from '../../bench/fitScenarios.mjs';

/** ln det of a symmetric positive definite matrix (ml-matrix's Cholesky factor). */
function logDet(a: Matrix): number {
  const l = new CholeskyDecomposition(a.add(a.transpose()).div(2)).lowerTriangularMatrix; // symmetric up to rounding
  let s = 0;
  for (let i = 0; i < a.rows; i++) s += 2 * Math.log(l.get(i, i));
  return s;
}

describe('restrictedLogLikelihood', () => {
  it('equals the dense restricted likelihood −½[ln det Σ + ln det XᵀΣ⁻¹X + yᵀPy] on irregular times', () => {
    // Dense formula of the restricted (REML) likelihood: Patterson & Thompson 1971 (Biometrika 58:545), with
    // P = Σ⁻¹ − Σ⁻¹X(XᵀΣ⁻¹X)⁻¹XᵀΣ⁻¹, computed with ml-matrix (a general-purpose matrix library). The noise
    // covariance is built term by term: white σ² on the diagonal, AR(1) s²·exp(−|Δt|/τ), walk q·min(t_i, t_j)
    // from the first row (the Kalman filter's walk starts at 0 there).
    const t = Float64Array.from([0, 0.03, 0.05, 0.1, 0.13, 0.2, 0.21, 0.3, 0.34, 0.4, 0.47, 0.5, 0.58, 0.6, 0.7]);
    const y = Float64Array.from(t, (v, i) => 0.7 * v + 0.05 * Math.sin(7 * i) + 0.02 * Math.cos(3 * i * i));
    const model = { white_var_deg2: 0.0004, ar_var_deg2: 0.0009, ar_time_s: 0.08, walk_deg2_per_s: 0.01 };
    const n = t.length;
    const sigma = new Matrix(n, n);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        const ti = t[i]! - t[0]!;
        const tj = t[j]! - t[0]!;
        sigma.set(i, j, (i === j ? model.white_var_deg2 : 0) + model.ar_var_deg2 * Math.exp(-Math.abs(ti - tj) / model.ar_time_s) + model.walk_deg2_per_s * Math.min(ti, tj));
      }
    }
    const X = new Matrix(n, 2);
    for (let i = 0; i < n; i++) { X.set(i, 0, 1); X.set(i, 1, t[i]!); }
    const inv = inverse(sigma);
    const xtx = X.transpose().mmul(inv).mmul(X);
    const Y = Matrix.columnVector(Array.from(y));
    const P = inv.sub(inv.mmul(X).mmul(inverse(xtx)).mmul(X.transpose()).mmul(inv));
    const dense = -0.5 * (logDet(sigma) + logDet(xtx) + Y.transpose().mmul(P).mmul(Y).get(0, 0));
    expect(restrictedLogLikelihood(t, y, 0, n, model)).toBeCloseTo(dense, 9);
    // and without a walk part, the form the upper bound starts from
    const still = { ...model, walk_deg2_per_s: 0 };
    const s0 = new Matrix(n, n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) s0.set(i, j, (i === j ? still.white_var_deg2 : 0) + still.ar_var_deg2 * Math.exp(-Math.abs(t[i]! - t[j]!) / still.ar_time_s));
    const inv0 = inverse(s0);
    const xtx0 = X.transpose().mmul(inv0).mmul(X);
    const P0 = inv0.sub(inv0.mmul(X).mmul(inverse(xtx0)).mmul(X.transpose()).mmul(inv0));
    const dense0 = -0.5 * (logDet(s0) + logDet(xtx0) + Y.transpose().mmul(P0).mmul(Y).get(0, 0));
    expect(restrictedLogLikelihood(t, y, 0, n, still)).toBeCloseTo(dense0, 9);
  });
});

describe('walkSensitivity', () => {
  it('gives a least-squares trend the Brownian-motion slope variance 6q/(5T) per unit walk', () => {
    // A walk of diffusion q (Var W(t) = q·t) adds q·∫∫a(s)a(u)min(s,u) ds du/(∫a²)² to the slope variance of a
    // least-squares line on [0, T], a(t) = t − T/2; since min(s, u) = ∫₀ᵀ 1[r<s]1[r<u] dr and ∫_r^T a = r(T − r)/2,
    // the numerator is ∫₀ᵀ r²(T − r)²/4 dr = T⁵/120 and the denominator (T³/12)², so 6q/(5T) (derived here; a
    // textbook exercise, no source checked). Under a white-only noise model GLS is least squares.
    const T = 40;
    const n = 2401;
    const t = Float64Array.from({ length: n }, (_, i) => (i * T) / (n - 1));
    const model = { white_var_deg2: 0.25, ar_var_deg2: 0, ar_time_s: 1, walk_deg2_per_s: 0 };
    const w = kalmanWhiten(t, new Float64Array(n), 0, n, model);
    const { trueVar } = walkSensitivity(t, 0, n, model, w, 8);
    expect(trueVar / (6 / (5 * T))).toBeGreaterThan(0.97);
    expect(trueVar / (6 / (5 * T))).toBeLessThan(1.03);
  });
});

describe('wanderAllowedVariance', () => {
  it('adds the part of a walk at its bound that the jackknife cannot see, and raises the df by Satterthwaite', () => {
    const v = wanderAllowedVariance(1e-6, 4, 2e-4, { trueVar: 0.03, jackknifeVar: 0.005 });
    expect(v.variance).toBeCloseTo(1e-6 + 2e-4 * 0.025, 15);
    // ν = ν_J·(V/J)² (Satterthwaite 1946: the allowance is a constant, only J is random)
    expect(v.df).toBeCloseTo(Math.min(1000, 4 * ((1e-6 + 5e-6) / 1e-6) ** 2), 9);
    // a jackknife that already sees more than the walk's true effect gets nothing added
    expect(wanderAllowedVariance(1e-6, 4, 2e-4, { trueVar: 0.01, jackknifeVar: 0.02 })).toEqual({ variance: 1e-6, df: 4 });
  });
});

describe('walkUpperBound', () => {
  it('sits where the restricted likelihood has fallen z²/2 = 1.353 below its best (z = 1.645, one-sided 95%)', () => {
    // the defining equation of the bound, checked with the likelihood verified above against the dense formula and
    // a maximum found by a plain scan over q (not the function's own search); 1.645²/2 from the normal table
    const { t_s, angle_deg } = simulateSteady({ seed: 4711, n: 1200, fps: 60, rate_deg_s: 0.4, white_deg: 0.3, walk_deg_sqrt_s: 0.05 });
    const model = { white_var_deg2: 0.09, ar_var_deg2: 0, ar_time_s: 1, walk_deg2_per_s: 0 };
    const like = (q: number) => restrictedLogLikelihood(t_s, angle_deg, 0, t_s.length, { ...model, walk_deg2_per_s: q });
    let best = like(0);
    for (let k = 0; k <= 400; k++) best = Math.max(best, like(1e-6 * 1.05 ** k));
    const bound = walkUpperBound(t_s, angle_deg, 0, t_s.length, model, 0.95);
    expect(best - like(bound)).toBeGreaterThan(1.3);
    expect(best - like(bound)).toBeLessThan(1.41);
    // a two-sided slip (z = 1.96, drop 1.92) or the other tail would miss this band
  });

  it('lies above the true walk in about 95% of seeded series (one-sided likelihood bound; Self & Liang 1987)', () => {
    // 80 series of 1200 frames (20 s at 60 fps), white 0.3° + a walk of 0.05 deg/√s; the noise model is the
    // true one without its walk. Binomial: 95% of 80 = 76, SD ≈ 2, so ≥ 70 is the band's lower edge.
    const q = 0.05 ** 2;
    let above = 0;
    for (let r = 0; r < 80; r++) {
      const { t_s, angle_deg } = simulateSteady({ seed: 31000 + r, n: 1200, fps: 60, rate_deg_s: 0.4, white_deg: 0.3, walk_deg_sqrt_s: 0.05 });
      const bound = walkUpperBound(t_s, angle_deg, 0, t_s.length, { white_var_deg2: 0.09, ar_var_deg2: 0, ar_time_s: 1, walk_deg2_per_s: 0 }, 0.95);
      if (bound >= q) above++;
    }
    expect(above).toBeGreaterThanOrEqual(70);
    expect(above).toBeLessThan(80); // a bound that is always above would be useless
  });
});

describe('fitSteadyRate wander_allowance', () => {
  it('covers the true rate when a small rate wander hides in white noise, where the main interval does not', () => {
    // Seeded series with known truth (invented: 0.8 deg/s, white 0.5°, walk 0.02 deg/√s, 30 s at 60 fps).
    let main = 0;
    let allowing = 0;
    const reps = 60;
    for (let r = 0; r < reps; r++) {
      const { t_s, angle_deg } = simulateSteady({ seed: 52000 + r, n: 1800, fps: 60, rate_deg_s: 0.8, white_deg: 0.5, walk_deg_sqrt_s: 0.02 });
      const fit = fitSteadyRate(t_s, angle_deg);
      const e = fit.result.rate_deg_s;
      const w = fit.result.wander_allowance!;
      if (e.ci[0] <= 0.8 && 0.8 <= e.ci[1]) main++;
      if (w.rate_deg_s.ci[0] <= 0.8 && 0.8 <= w.rate_deg_s.ci[1]) allowing++;
      if (fit.noise.walk_deg2_per_s === 0) {
        expect(w.hidden_walk_bound_deg_per_sqrt_s).toBeGreaterThan(0);
        expect(w.rate_deg_s.se).toBeGreaterThanOrEqual(e.se);
      } else expect(w.hidden_walk_bound_deg_per_sqrt_s).toBeNull();
    }
    expect(main / reps).toBeLessThan(0.9);
    expect(allowing / reps).toBeGreaterThanOrEqual(0.9);
  });

  it('repeats the main interval when the noise model holds a walk', () => {
    const { t_s, angle_deg } = simulateSteady({ seed: 7, n: 3600, fps: 60, rate_deg_s: 0.8, white_deg: 0.05, walk_deg_sqrt_s: 0.3 });
    const fit = fitSteadyRate(t_s, angle_deg);
    expect(fit.noise.walk_deg2_per_s).toBeGreaterThan(0);
    expect(fit.result.wander_allowance).toEqual({ hidden_walk_bound_deg_per_sqrt_s: null, rate_deg_s: fit.result.rate_deg_s, zero_test: fit.result.zero_test });
  });
});
