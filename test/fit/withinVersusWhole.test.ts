// The steady fit warns when the angle jumps between its segments (a looped clip's splices moved the whole-window
// slope from 69.1 to 89.7 deg/s while every segment read 69.1). Truth: our seeded simulator (bench/fitScenarios.mjs);
// the test is Hausman's (1978) comparison of an efficient and a robust estimate, from memory.
import { describe, expect, it } from 'vitest';
import { fitSteadyRate } from '../../src/fit/steadyRate.js';
import { simulateSteady } from '../../bench/fitScenarios.mjs';

const JUMP = /disagrees with the rate inside its segments/;

describe('fitSteadyRate and angle jumps between segments', () => {
  it('warns, naming both rates, when the angle jumps by 20° every 2 s of a 69.1 deg/s run', () => {
    const { t_s, angle_deg } = simulateSteady({ seed: 3, n: 600, fps: 30, t0_s: 0, rate_deg_s: 69.1, white_deg: 0.05 });
    for (let i = 0; i < angle_deg.length; i++) angle_deg[i]! += 20 * Math.floor(i / 60);
    const f = fitSteadyRate(t_s, angle_deg);
    const w = f.warnings.find((x) => JUMP.test(x));
    expect(w).toMatch(/^the rate over the whole window \(7\d\.\d\d deg\/s\) disagrees with the rate inside its segments \(69\.\d\d deg\/s; p < 1e-6\)/);
  });

  it('stays quiet on steady runs with white, autocorrelated or wandering noise (40 seeds each)', () => {
    const kinds = [{ white_deg: 0.3 }, { white_deg: 0.1, ar_phi: 0.9, ar_sd_deg: 0.5 }, { white_deg: 0.2, walk_deg_sqrt_s: 0.3 }];
    let alarms = 0;
    for (const kind of kinds) {
      for (let seed = 1; seed <= 40; seed++) {
        const { t_s, angle_deg } = simulateSteady({ seed, n: 600, fps: 30, t0_s: 0, rate_deg_s: 10, ...kind });
        if (fitSteadyRate(t_s, angle_deg).warnings.some((x) => JUMP.test(x))) alarms++;
      }
    }
    expect(alarms).toBeLessThanOrEqual(1); // p < 0.001 on 120 fits: 0.12 false alarms expected
  });
});
