import { describe, expect, it } from 'vitest';
import { fitSteadyRate } from '../../src/fit/steadyRate.js';
import { fitAngleNoiseModel } from '../../src/fit/angleNoiseModel.js';
import { simulateSteady, normalSource, SCENARIOS } from '../../bench/fitScenarios.mjs';

// Seeded Monte Carlo, the fast version of bench/fitCoverage.mjs (1000 replicates per scenario there).
// 300 replicates: the count of covering intervals is Binomial(300, p); if the true coverage is 95%, it lies
// within ±3.29·√(0.95·0.05/300) = ±4.1 points with probability 99.9% (normal approximation to the binomial).
const REPS = 300;
const HALF_BAND = 3.29 * Math.sqrt((0.95 * 0.05) / REPS);
const N = 1200; // 20 s at 60 fps
const RATE = 0.8;

describe('fitSteadyRate interval coverage (seeded Monte Carlo)', () => {
  for (const [si, scenario] of SCENARIOS.entries()) {
    it(`covers the true rate 95% of the time under ${scenario.name}`, () => {
      let covered = 0;
      for (let r = 0; r < REPS; r++) {
        const { t_s, angle_deg } = simulateSteady({ seed: 31000 + 1000 * si + r, n: N, fps: 60, t0_s: 3600, rate_deg_s: RATE, ...scenario.noise });
        const e = fitSteadyRate(t_s, angle_deg, { level: 0.95 }).result.rate_deg_s;
        if (e.ci[0] <= RATE && RATE <= e.ci[1]) covered++;
      }
      expect(covered / REPS).toBeGreaterThanOrEqual(0.95 - HALF_BAND);
      expect(covered / REPS).toBeLessThanOrEqual(0.95 + HALF_BAND);
    });
  }

  // Cramér–Rao: for Gaussian white noise the OLS slope variance σ²/Σ(t − t̄)² is the bound (Gauss–Markov,
  // e.g. Kay, Fundamentals of Statistical Signal Processing: Estimation Theory, 1993, §3.7 line fitting).
  // The requirement is variance ≤ 1.15 × bound; a sample variance over R replicates is σ²·χ²_{R−1}/(R−1), whose
  // 99.9% upper point for R = 300 is ≈ 1 + 3.09·√(2/299) = 1.253, so the sample ratio must stay ≤ 1.15 × 1.253.
  it('has white-noise variance within 1.15 × the Cramér–Rao bound', () => {
    const sigma = 0.5;
    const est: number[] = [];
    let stt = 0;
    for (let r = 0; r < REPS; r++) {
      const { t_s, angle_deg } = simulateSteady({ seed: 55000 + r, n: N, fps: 60, rate_deg_s: RATE, white_deg: sigma });
      est.push(fitSteadyRate(t_s, angle_deg).result.rate_deg_s.value);
      if (r === 0) {
        const mean = t_s.reduce((a, b) => a + b, 0) / t_s.length;
        stt = t_s.reduce((a, b) => a + (b - mean) ** 2, 0);
      }
    }
    const m = est.reduce((a, b) => a + b, 0) / REPS;
    const variance = est.reduce((a, b) => a + (b - m) ** 2, 0) / (REPS - 1);
    expect(variance / ((sigma * sigma) / stt)).toBeLessThanOrEqual(1.15 * (1 + 3.09 * Math.sqrt(2 / (REPS - 1))));
  });
});

// The segment homogeneity test must hold its nominal false-alarm rate on steady series whose tracking error
// is correlated the way footage makes it (white + AR(1) + lighting flicker), and still flag a rate step.
// Counts over R seeded replicates are Binomial(R, α) under a correct test; the bands are the 99.9% normal
// approximation α ± 3.29·√(α(1 − α)/R) (common practice, no source). Invented rig: 8 s at 30 fps, −2.6 deg/s.
describe('fitSteadyRate segment homogeneity test (seeded Monte Carlo)', () => {
  const R = 300;
  const band = (alpha: number, reps: number): number => 3.29 * Math.sqrt((alpha * (1 - alpha)) / reps);
  /** Steady −2.6 deg/s plus white + AR(1) noise and a 2.5 Hz flicker error of random phase; the rate steps by `step_deg_s` at t = 4 s. */
  const footageLike = (seed: number, step_deg_s: number): number | null => {
    const { t_s, angle_deg } = simulateSteady({ seed, n: 240, fps: 30, rate_deg_s: -2.6, white_deg: 0.03, ar_phi: 0.7, ar_sd_deg: 0.02 });
    const phase = 3 * normalSource(seed + 99)();
    const a = Float64Array.from(angle_deg, (v, i) => {
      const tt = t_s[i]!;
      return v + 0.02 * Math.sin(2 * Math.PI * 2.5 * tt + phase) + (tt > 4 ? step_deg_s * (tt - 4) : 0);
    });
    return fitSteadyRate(t_s, a).segment_p_value;
  };

  it('has p-values roughly uniform on steady footage-like series (false alarms at the nominal rate)', () => {
    let below05 = 0;
    let below01 = 0;
    let belowHalf = 0;
    for (let r = 0; r < R; r++) {
      const p = footageLike(61000 + r, 0)!;
      if (p < 0.05) below05++;
      if (p < 0.01) below01++;
      if (p < 0.5) belowHalf++;
    }
    expect(below05 / R).toBeGreaterThanOrEqual(0.05 - band(0.05, R));
    expect(below05 / R).toBeLessThanOrEqual(0.05 + band(0.05, R));
    expect(below01 / R).toBeLessThanOrEqual(0.01 + band(0.01, R));
    expect(belowHalf / R).toBeGreaterThanOrEqual(0.5 - band(0.5, R));
    expect(belowHalf / R).toBeLessThanOrEqual(0.5 + band(0.5, R));
  });

  it('keeps the nominal false-alarm rate under AR(1) noise plus a wandering rate (10 segments)', () => {
    const sc = SCENARIOS.find((s) => s.name === 'AR(1) + random walk')!;
    const reps = 150;
    let below05 = 0;
    for (let r = 0; r < reps; r++) {
      const { t_s, angle_deg } = simulateSteady({ seed: 62000 + r, n: N, fps: 60, rate_deg_s: RATE, ...sc.noise });
      if (fitSteadyRate(t_s, angle_deg).segment_p_value! < 0.05) below05++;
    }
    expect(below05 / reps).toBeLessThanOrEqual(0.05 + band(0.05, reps));
  });

  it('flags a rate step of 0.3 deg/s (about 15 segment standard errors) at p < 0.01 in at least 90% of replicates', () => {
    const reps = 100;
    let flagged = 0;
    for (let r = 0; r < reps; r++) if (footageLike(63000 + r, 0.3)! < 0.01) flagged++;
    expect(flagged / reps).toBeGreaterThanOrEqual(0.9);
  });
});

describe('fitSteadyRate on single series', () => {
  it('reports segment rates and warns when the rate changes within the window', () => {
    const n = 1200;
    const t = Float64Array.from({ length: n }, (_, i) => 100 + i / 60);
    // 1 deg/s for the first half, 3 deg/s after (invented), plus small seeded noise
    const noise = simulateSteady({ seed: 9, n, fps: 60, rate_deg_s: 0, white_deg: 0.05 }).angle_deg;
    const a = Float64Array.from(t, (tt, i) => (tt < 110 ? tt - 100 : 10 + 3 * (tt - 110)) + noise[i]!);
    const fit = fitSteadyRate(t, a);
    expect(fit.result.segments.length).toBeGreaterThanOrEqual(2);
    const first = fit.result.segments[0]!.rate_deg_s;
    const last = fit.result.segments.at(-1)!.rate_deg_s;
    expect(first.ci[0]).toBeLessThan(1);
    expect(first.ci[1]).toBeGreaterThan(1);
    expect(last.ci[0]).toBeLessThan(3);
    expect(last.ci[1]).toBeGreaterThan(3);
    expect(last.ci[0]).toBeGreaterThan(first.ci[1]);
    expect(fit.segment_p_value!).toBeLessThan(0.01);
    expect(fit.warnings.join(' ')).toMatch(/not steady/);
  });

  it('converts to rpm and rev/s (360 deg = 1 rev)', () => {
    const { t_s, angle_deg } = simulateSteady({ seed: 4, n: 600, fps: 30, rate_deg_s: 36, white_deg: 0.2 });
    const r = fitSteadyRate(t_s, angle_deg).result;
    expect(r.rate_rpm.value).toBeCloseTo((r.rate_deg_s.value * 60) / 360, 12);
    expect(r.rate_rev_s.ci[1]).toBeCloseTo(r.rate_deg_s.ci[1] / 360, 12);
    expect(r.rate_deg_s.value).toBeCloseTo(36, 1);
  });

  it('rejects fewer than 10 frames', () => {
    const t = Float64Array.from({ length: 9 }, (_, i) => i);
    expect(() => fitSteadyRate(t, t)).toThrow(/at least 10/);
  });
});

describe('fitAngleNoiseModel', () => {
  it('finds white noise of the simulated size and no walk to speak of', () => {
    const { t_s, angle_deg } = simulateSteady({ seed: 12, n: 6000, fps: 60, rate_deg_s: 1, white_deg: 0.4 });
    const t = Float64Array.from(t_s, (v) => v - t_s[0]!);
    const m = fitAngleNoiseModel(t, angle_deg);
    expect(Math.sqrt(m.white_var_deg2 + m.ar_var_deg2)).toBeGreaterThan(0.37);
    expect(Math.sqrt(m.white_var_deg2 + m.ar_var_deg2)).toBeLessThan(0.43);
    // a walk this small moves the angle by < 0.1 deg over the whole 100 s window
    expect(Math.sqrt(m.walk_deg2_per_s * 100)).toBeLessThan(0.1);
  });

  it('finds a random walk of the simulated diffusion', () => {
    const { t_s, angle_deg } = simulateSteady({ seed: 13, n: 6000, fps: 60, rate_deg_s: 1, white_deg: 0.05, walk_deg_sqrt_s: 0.3 });
    const t = Float64Array.from(t_s, (v) => v - t_s[0]!);
    const m = fitAngleNoiseModel(t, angle_deg);
    expect(Math.sqrt(m.walk_deg2_per_s)).toBeGreaterThan(0.2);
    expect(Math.sqrt(m.walk_deg2_per_s)).toBeLessThan(0.4);
  });
});
