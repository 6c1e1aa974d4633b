import { describe, expect, it } from 'vitest';
import { linearRegression } from 'simple-statistics';
import { chooseModel } from '../../src/fit/chooseModel.js';
import { fitSpinUp, spinUpAngle } from '../../src/fit/spinUp.js';
import type { ModelCandidate } from '../../src/fit/ModelFit.js';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';

function gaussianSource(seed: number): () => number {
  const rng = xoroshiro128plus(seed);
  return () => Math.sqrt(-2 * Math.log(uniformFloat64(rng) || 1e-300)) * Math.cos(2 * Math.PI * uniformFloat64(rng));
}

/** Steady-rate candidate from the reference library simple-statistics (least-squares line). */
function steadyCandidate(t: Float64Array, y: Float64Array, n_eff?: number): ModelCandidate {
  const pairs = Array.from(t, (ti, i) => [ti, y[i]!]);
  const { m, b } = linearRegression(pairs);
  let rss = 0;
  for (let i = 0; i < t.length; i++) rss += (y[i]! - (m * t[i]! + b)) ** 2;
  return { model: 'steady', n: t.length, k: 2, rss, ...(n_eff === undefined ? {} : { n_eff }) };
}

/** Invented test input: angle series at 30 frames/s with AR(1) (ρ = 0.7, sd 0.5°) plus white (0.2°) noise. */
function series(angle: (t: number) => number, n: number, seed: number): { t: Float64Array; y: Float64Array } {
  const gauss = gaussianSource(seed);
  const t = new Float64Array(n);
  const y = new Float64Array(n);
  let ar = 0;
  for (let i = 0; i < n; i++) {
    t[i] = i / 30;
    ar = 0.7 * ar + 0.5 * Math.sqrt(1 - 0.49) * gauss();
    y[i] = angle(t[i]!) + ar + 0.2 * gauss();
  }
  return { t, y };
}

describe('chooseModel', () => {
  // Schwarz (1978) BIC on the effective sample size: n_eff·ln(RSS/n) + k·ln(n_eff), computed by hand here.
  it('scores candidates by BIC on the effective sample size', () => {
    const choice = chooseModel([
      { model: 'steady', n: 100, k: 2, rss: 50, n_eff: 40 },
      { model: 'spinup', n: 100, k: 4, rss: 30, n_eff: 25 },
    ]);
    // n_eff comes from the best-fitting candidate (spinup, 25).
    expect(choice.scores.steady).toBeCloseTo(25 * Math.log(0.5) + 2 * Math.log(25), 12);
    expect(choice.scores.spinup).toBeCloseTo(25 * Math.log(0.3) + 4 * Math.log(25), 12);
    expect(choice.chosen).toBe('spinup');
    expect(choice.rule).toMatch(/BIC/);
  });

  it('calls the choice ambiguous when the runner-up is within 2 (Kass & Raftery 1995)', () => {
    const choice = chooseModel([
      { model: 'steady', n: 100, k: 2, rss: 50 },
      { model: 'spindown', n: 100, k: 4, rss: 46 },
    ]);
    // 100·ln(0.46) + 4·ln(100) = −59.23; 100·ln(0.5) + 2·ln(100) = −60.10: steady by 0.87.
    expect(choice.chosen).toBe('steady');
    expect(choice.ambiguous).toBe(true);
  });

  it('scores but does not choose a candidate marked as not physically meaningful', () => {
    const choice = chooseModel([
      { model: 'steady', n: 100, k: 2, rss: 50 },
      { model: 'spindown', n: 100, k: 4, rss: 20, excluded: 'the fitted rotor gains speed' },
    ]);
    expect(choice.chosen).toBe('steady');
    expect(choice.scores.spindown).toBeLessThan(choice.scores.steady!);
    expect(choice.rule).toMatch(/spindown not eligible: the fitted rotor gains speed/);
  });

  it('refuses candidates fitted to different windows', () => {
    expect(() => chooseModel([{ model: 'steady', n: 100, k: 2, rss: 5 }, { model: 'spinup', n: 90, k: 4, rss: 4 }])).toThrow(/different numbers of points/);
  });

  it('prefers spin-up for a spin-up series and steady for a steady series', () => {
    const spin = series(spinUpAngle({ theta0_deg: 0, onset_s: 2, terminal_rate_deg_s: 60, tau_s: 1.2 }), 300, 21);
    const fitA = fitSpinUp(spin.t, spin.y, { replicates: 0 });
    const a = chooseModel([steadyCandidate(spin.t, spin.y), fitA.candidate]);
    expect(a.chosen).toBe('spinup');
    expect(a.ambiguous).toBe(false);

    const steady = series((t) => 5 + 40 * t, 300, 22);
    const fitB = fitSpinUp(steady.t, steady.y, { replicates: 0 });
    const b = chooseModel([steadyCandidate(steady.t, steady.y), fitB.candidate]);
    expect(b.chosen).toBe('steady');
  });
});
