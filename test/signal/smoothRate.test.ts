import { describe, expect, it } from 'vitest';
import { smoothRate } from '../../src/signal/smoothRate.js';
import { simulateSteady } from '../../bench/fitScenarios.mjs';

describe('smoothRate', () => {
  it('recovers the derivative of a noise-free quadratic angle on irregular frame times', () => {
    // invented spin-up: θ = 2t + 0.75t², irregular times (a phone camera's jittered frames); truth dθ/dt = 2 + 1.5t
    // (closed form)
    const t: number[] = [];
    let tt = 500;
    for (let i = 0; i < 400; i++) {
      tt += 0.02 + 0.02 * (((i * 7919) % 17) / 17);
      t.push(tt);
    }
    const ts = Float64Array.from(t);
    const a = Float64Array.from(ts, (v) => 2 * (v - 500) + 0.75 * (v - 500) ** 2);
    const r = smoothRate(ts, a, { halfWidth_s: 0.3 });
    for (let i = 0; i < r.t_s.length; i += 37) expect(r.rate_deg_s[i]).toBeCloseTo(2 + 1.5 * (r.t_s[i]! - 500), 6);
  });

  // simulateSteady (bench/fitScenarios.mjs) is our own seeded simulator: its rate is the truth by construction
  it('writes at most maxRows rows and keeps the last frame', () => {
    const { t_s, angle_deg } = simulateSteady({ seed: 2, n: 5000, fps: 60, rate_deg_s: 5, white_deg: 0.2 });
    const r = smoothRate(t_s, angle_deg, { maxRows: 1000 });
    expect(r.t_s.length).toBeLessThanOrEqual(1001);
    expect(r.t_s[r.t_s.length - 1]).toBe(t_s[t_s.length - 1]);
    for (let i = 0; i < r.t_s.length; i++) expect(r.lo_deg_s[i]!).toBeLessThanOrEqual(r.hi_deg_s[i]!);
  });

  // Seeded Monte Carlo of the pointwise band under white noise (window fixed at 1 s to keep the test fast):
  // 200 replicates × 2 points 0.9 s or more apart (nearly independent); if the band covers 95%, the covering
  // share among 400 lies within ±3.29·√(0.95·0.05/400) = ±3.6 points with probability 99.9% (normal approximation
  // to the binomial, common practice, no source). Truth: simulateSteady's rate, 0.8 deg/s (bench/fitScenarios.mjs).
  it('covers the true rate pointwise about 95% of the time under white noise', () => {
    let covered = 0;
    let total = 0;
    for (let r0 = 0; r0 < 200; r0++) {
      const { t_s, angle_deg } = simulateSteady({ seed: 4000 + r0, n: 900, fps: 60, rate_deg_s: 0.8, white_deg: 0.3 });
      const r = smoothRate(t_s, angle_deg, { halfWidth_s: 1 });
      for (const k of [Math.floor(r.t_s.length / 2), Math.floor(r.t_s.length / 7)]) {
        total++;
        if (r.lo_deg_s[k]! <= 0.8 && 0.8 <= r.hi_deg_s[k]!) covered++;
      }
    }
    expect(covered / total).toBeGreaterThanOrEqual(0.95 - 0.036);
    expect(covered / total).toBeLessThanOrEqual(0.95 + 0.036);
  });

  // a design property (no outside value): curvature shortens the chosen window
  it('chooses a wider window for a steady rotation than for a fast spin-up', () => {
    const steady = simulateSteady({ seed: 5, n: 1200, fps: 60, rate_deg_s: 10, white_deg: 0.3 });
    const curved = Float64Array.from(steady.t_s, (t, i) => 360 * (t - 10 * (1 - Math.exp(-t / 2))) + steady.angle_deg[i]! - 10 * t);
    const a = smoothRate(steady.t_s, steady.angle_deg);
    const b = smoothRate(steady.t_s, curved);
    expect(a.halfWidth_s).toBeGreaterThan(b.halfWidth_s);
  });
});
