// A dynamics curve fitted to a window it cannot describe says so. Truth: an invented series built by hand — a rotor
// held at 100 deg/s by its drive for 2 s, then coasting down under viscous friction only (ω = 100·e^(−(t−2)) deg/s,
// so the angle is 200 + 100·(1 − e^(−(t−2))) deg after the cut) — with seeded white noise of 0.03°.
import { describe, expect, it } from 'vitest';
import { fitAngleSeries } from '../../src/fit/fitAngleSeries.js';
import { frameNoise_deg } from '../../src/fit/curveMisfit.js';
import { normalSource } from '../../bench/fitScenarios.mjs';

function heldThenCoasting(seed: number): { t_s: Float64Array; angle_deg: Float64Array } {
  const normal = normalSource(seed);
  const t_s = Float64Array.from({ length: 240 }, (_, i) => i / 30);
  const angle_deg = t_s.map((t) => (t < 2 ? 100 * t : 200 + 100 * (1 - Math.exp(-(t - 2)))) + 0.03 * normal());
  return { t_s, angle_deg };
}

describe('curveMisfit through fitAngleSeries', () => {
  it('estimates white noise from second differences (σ = 0.5° → within 10 %)', () => {
    const normal = normalSource(7);
    const y = Float64Array.from({ length: 4000 }, (_, i) => 2 * i + 0.5 * normal());
    expect(frameNoise_deg(y)).toBeGreaterThan(0.45);
    expect(frameNoise_deg(y)).toBeLessThan(0.55);
  });

  it('warns when a coast-down window starts 2 s before the drive is cut, and not when it starts at the cut', () => {
    const { t_s, angle_deg } = heldThenCoasting(5);
    const early = fitAngleSeries({ t_s, angle_deg }, { model: 'spindown' });
    expect(early.report.diagnostics.warnings.some((w) => /^the coast-down curve does not describe this window/.test(w))).toBe(true);
    const atCut = fitAngleSeries({ t_s, angle_deg }, { model: 'spindown', from_s: 2 });
    expect(atCut.report.diagnostics.warnings.filter((w) => /does not describe this window/.test(w))).toEqual([]);
    expect(atCut.report.spindown!.initial_rate_deg_s.ci[0]).toBeLessThan(100);
    expect(atCut.report.spindown!.initial_rate_deg_s.ci[1]).toBeGreaterThan(100);
  });

  it('does not call a good spin-up a misfit when a compressed clip repeats one angle through 5 s at rest', () => {
    // invented: 150 identical rows at rest (the codec's still picture), then 90 deg/s·(t − 5 − 0.5·(1 − e^(−(t−5)/0.5)))
    // with autocorrelated noise (AR(1), φ = 0.9, sd 0.05°) — before, the repeats made the noise look like zero
    for (const seed of [1, 2, 3]) {
      const normal = normalSource(seed);
      let ar = 0;
      const t_s = Float64Array.from({ length: 300 }, (_, i) => i / 30);
      const angle_deg = t_s.map((t) => {
        if (t < 5) return 12.5;
        ar = 0.9 * ar + 0.05 * Math.sqrt(1 - 0.81) * normal();
        const d = t - 5;
        return 12.5 + 90 * (d - 0.5 * (1 - Math.exp(-d / 0.5))) + ar;
      });
      const f = fitAngleSeries({ t_s, angle_deg }, { model: 'spinup' });
      expect(f.report.diagnostics.warnings.filter((w) => /does not describe this window/.test(w)), `seed ${seed}`).toEqual([]);
    }
  });
});
