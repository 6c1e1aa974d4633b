import { describe, expect, it } from 'vitest';
import { fitSpinUp, spinUpAngle, spinUpRate, type SpinUpParams } from '../../src/fit/spinUp.js';
import { InputError } from '../../src/errors.js';
import { DynamicsFitError } from '../../src/fit/DynamicsFitError.js';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';

/** Gaussian draws (Box–Muller) from a seeded generator. */
function gaussianSource(seed: number): () => number {
  const rng = xoroshiro128plus(seed);
  return () => {
    const u = uniformFloat64(rng) || 1e-300;
    const v = uniformFloat64(rng);
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
  };
}

/**
 * Invented test input: a spin-up sampled at `fps` with AR(1) noise (lag-1 correlation rho, sd `arSd` deg)
 * plus white noise (sd 0.3 deg), generated from the closed form.
 */
function syntheticSpinUp(p: SpinUpParams, n: number, seed: number, rho = 0.8, arSd = 1, fps = 30): { t: Float64Array; y: Float64Array } {
  const gauss = gaussianSource(seed);
  const angle = spinUpAngle(p);
  const t = new Float64Array(n);
  const y = new Float64Array(n);
  let ar = 0;
  for (let i = 0; i < n; i++) {
    t[i] = 10 + i / fps;
    ar = rho * ar + arSd * Math.sqrt(1 - rho * rho) * gauss();
    y[i] = angle(t[i]!) + (arSd > 0 ? ar + 0.3 * gauss() : 0);
  }
  return { t, y };
}

const truth: SpinUpParams = { theta0_deg: 30, onset_s: 12, terminal_rate_deg_s: 90, tau_s: 1.5 };
const inside = (e: { ci: [number, number] }, v: number) => e.ci[0] <= v && v <= e.ci[1];

describe('spin-up closed form', () => {
  // Reference: the first-order lag dω/dt = (ω∞ − ω)/τ, dθ/dt = ω from rest at t0, integrated by classical
  // RK4 (Numerical Recipes §16.1) independently of the closed form.
  it('matches an RK4 integration of the first-order lag from rest', () => {
    const p: SpinUpParams = { theta0_deg: -20, onset_s: 0.5, terminal_rate_deg_s: -240, tau_s: 0.8 };
    const h = 1e-4;
    let th = p.theta0_deg;
    let w = 0;
    let t = p.onset_s;
    const f = (om: number) => (p.terminal_rate_deg_s - om) / p.tau_s;
    const angle = spinUpAngle(p);
    const rate = spinUpRate(p);
    expect(angle(0.2)).toBe(p.theta0_deg);
    expect(rate(0.2)).toBe(0);
    for (let step = 1; step <= 40000; step++) {
      const k1 = f(w), k2 = f(w + (h / 2) * k1), k3 = f(w + (h / 2) * k2), k4 = f(w + h * k3);
      th += (h / 6) * (w + 2 * (w + (h / 2) * k1) + 2 * (w + (h / 2) * k2) + (w + h * k3));
      w += (h / 6) * (k1 + 2 * k2 + 2 * k3 + k4);
      t = p.onset_s + step * h;
      if (step % 5000 === 0) {
        expect(angle(t)).toBeCloseTo(th, 6);
        expect(rate(t)).toBeCloseTo(w, 8);
      }
    }
  });
});

describe('fitSpinUp', () => {
  it('recovers the parameters of a noise-free spin-up without hints', () => {
    const { t, y } = syntheticSpinUp(truth, 360, 1, 0, 0);
    const fit = fitSpinUp(t, y, { replicates: 0 });
    expect(fit.result.onset_s.value).toBeCloseTo(12, 6);
    expect(fit.result.terminal_rate_deg_s.value).toBeCloseTo(90, 6);
    expect(fit.result.tau_s.value).toBeCloseTo(1.5, 6);
    expect(fit.result.theta0_deg.value).toBeCloseTo(30, 6);
    expect(fit.result.terminal_rate_rpm.value).toBeCloseTo(15, 6);
    expect(fit.converged).toBe(true);
    expect(fit.predict_deg(20)).toBeCloseTo(spinUpAngle(truth)(20), 5);
    expect(fit.rate_deg_s(20)).toBeCloseTo(spinUpRate(truth)(20), 5);
  });

  // One fixed seed; the 99% level makes a failure of a correct method unlikely (about 4% for four parameters).
  it('recovers a clockwise spin-up within its 99% intervals from autocorrelated noise', () => {
    const p: SpinUpParams = { theta0_deg: 200, onset_s: 11, terminal_rate_deg_s: -45, tau_s: 2 };
    const { t, y } = syntheticSpinUp(p, 450, 11);
    const fit = fitSpinUp(t, y, { level: 0.99, replicates: 99 });
    const r = fit.result;
    expect(inside(r.onset_s, p.onset_s)).toBe(true);
    expect(inside(r.terminal_rate_deg_s, p.terminal_rate_deg_s)).toBe(true);
    expect(inside(r.tau_s, p.tau_s)).toBe(true);
    expect(inside(r.theta0_deg, p.theta0_deg)).toBe(true);
    expect(r.tau_s.ci[0]).toBeGreaterThan(0);
    expect(r.tau_s.level).toBe(0.99);
    expect(fit.candidate).toMatchObject({ model: 'spinup', n: 450, k: 4 });
    expect(fit.residuals_deg.length).toBe(450);
  });

  it('fits a long series on the bin-mean path with intervals that contain the truth', () => {
    const { t, y } = syntheticSpinUp(truth, 8000, 4, 0.8, 1, 400);
    const fit = fitSpinUp(t, y);
    expect(inside(fit.result.tau_s, 1.5)).toBe(true);
    expect(inside(fit.result.terminal_rate_deg_s, 90)).toBe(true);
    expect(fit.residuals_deg.length).toBe(8000);
  });

  // Statistical validity (small version of bench/spinUpCoverage.mjs): with 40 series the binomial standard
  // error of a true 95% coverage is 3.4%, so we accept 0.85 or more (about 3 standard errors below 0.95).
  it('gives 95% intervals for τ and the terminal rate that cover the truth in about 95% of series', () => {
    let coverTau = 0;
    let coverRate = 0;
    const series = 40;
    for (let s = 0; s < series; s++) {
      const { t, y } = syntheticSpinUp(truth, 240, 1000 + s);
      const r = fitSpinUp(t, y, { replicates: 79, seed: s + 1 }).result;
      coverTau += inside(r.tau_s, 1.5) ? 1 : 0;
      coverRate += inside(r.terminal_rate_deg_s, 90) ? 1 : 0;
    }
    expect(coverTau / series).toBeGreaterThanOrEqual(0.85);
    expect(coverRate / series).toBeGreaterThanOrEqual(0.85);
  });

  it('says so when the window shows no spin-up (a steady line)', () => {
    const t = Float64Array.from({ length: 300 }, (_, i) => i / 30);
    const y = t.map((v) => 5 + 40 * v);
    expect(() => fitSpinUp(t, y, { replicates: 0 })).toThrow(DynamicsFitError);
    expect(() => fitSpinUp(t, y, { replicates: 0 })).toThrow(/shows no spin-up/);
  });

  // A long noisy steady series (bin-mean path): the best spin-up curve drifts towards an onset far before the
  // window; the fit must say there is no spin-up rather than report one.
  it('says so when a long noisy window shows no spin-up', () => {
    const gauss = gaussianSource(77);
    const n = 20000;
    const t = Float64Array.from({ length: n }, (_, i) => i / 60);
    let ar = 0;
    const y = t.map((v) => {
      ar = 0.9 * ar + 0.3 * gauss();
      return 12 + 2.5 * v + ar + 0.3 * gauss();
    });
    expect(() => fitSpinUp(t, y)).toThrow(/shows no spin-up/);
  });

  it('rejects inputs of different lengths in one sentence', () => {
    expect(() => fitSpinUp(new Float64Array(10), new Float64Array(9))).toThrow(InputError);
    expect(() => fitSpinUp(new Float64Array(10), new Float64Array(9))).toThrow(/10 times but 9 angles/);
  });
});
