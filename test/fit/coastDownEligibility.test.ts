// Which fitted coast-downs --model auto may choose. The physics (a rotor without a drive only slows; dω/dt = −c·sign(ω) − kω
// with Coulomb c and viscous k) is common practice, no source; the factor-2 band around the equilibrium speed is our choice.
import { describe, expect, it } from 'vitest';
import { coastDownNotEligible } from '../../src/fit/coastDownEligibility.js';

const wide = { coulomb_deg_s2: 10, viscous_per_s: 1 }; // upper interval ends above zero

describe('coastDownNotEligible', () => {
  it('keeps ordinary coast-downs: both frictions positive, or one a little negative far from an equilibrium', () => {
    expect(coastDownNotEligible({ initial_rate_deg_s: 100, coulomb_deg_s2: 1, viscous_per_s: 0.5 }, wide)).toBeUndefined();
    expect(coastDownNotEligible({ initial_rate_deg_s: -100, coulomb_deg_s2: 1, viscous_per_s: 0.5 }, wide)).toBeUndefined();
    // negative viscous, equilibrium 10 deg/s far above the initial 2 deg/s: decelerates at 0.8 of its Coulomb rate
    expect(coastDownNotEligible({ initial_rate_deg_s: 2, coulomb_deg_s2: 1, viscous_per_s: -0.1 }, wide)).toBeUndefined();
    // negative Coulomb, settling at 2 deg/s from 10 deg/s: a coast-down to a crawl
    expect(coastDownNotEligible({ initial_rate_deg_s: 10, coulomb_deg_s2: -1, viscous_per_s: 0.5 }, wide)).toBeUndefined();
  });

  it('refuses a curve that gains speed, and a coefficient whose whole interval is negative', () => {
    expect(coastDownNotEligible({ initial_rate_deg_s: 2, coulomb_deg_s2: 1, viscous_per_s: -1 }, wide)).toMatch(/gains speed/);
    expect(coastDownNotEligible({ initial_rate_deg_s: 50, coulomb_deg_s2: 5, viscous_per_s: 0.01 }, { coulomb_deg_s2: 9, viscous_per_s: -0.001 })).toMatch(/clearly negative/);
  });

  it('refuses a curve held at its equilibrium speed: a steady rate in disguise (a slow reverse run, k < 0)', () => {
    // the fit of a steady −2.68 deg/s reverse run that auto once chose: c = 4.4959, k = −1.6780, so s* = 2.6794 deg/s = |ω0|
    expect(coastDownNotEligible({ initial_rate_deg_s: -2.67935, coulomb_deg_s2: 4.49587, viscous_per_s: -1.67797 }, wide)).toMatch(/holds a steady nonzero rate/);
    // and with c < 0: settling at 8 deg/s from 10 deg/s
    expect(coastDownNotEligible({ initial_rate_deg_s: 10, coulomb_deg_s2: -4, viscous_per_s: 0.5 }, wide)).toMatch(/holds a steady nonzero rate/);
  });
});
