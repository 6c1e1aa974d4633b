import { describe, expect, it } from 'vitest';
import type { FitReport } from '../../src/fit/FitReport.js';
import { modelCurve } from '../../src/report/modelCurve.js';
import { profileAngle, profileRate } from '../../src/synth/rotationProfile.js';

const e = (value: number) => ({ value, se: 0.01, ci: [value - 0.02, value + 0.02] as [number, number], level: 0.95 });
const base = { n: 0, method: '', diagnostics: { residual_autocorrelation: [], lost_share: 0, residual_rms_deg: 0, warnings: [] }, software: { name: 'revtrace' as const, version: 'test' } };
const times = (t0: number, t1: number, n: number) => Float64Array.from({ length: n }, (_, i) => t0 + ((t1 - t0) * i) / (n - 1));

// The model curves drawn in the report are checked against the synthetic renderer's closed forms
// (src/synth/rotationProfile.ts), an independent implementation of the same physics that shares no code with
// modelCurve and is itself checked against closed forms and an RK4 integration in test/synth/rotationProfile.test.ts.
describe('modelCurve', () => {
  it('draws a spin-up with the fitted onset, time constant, terminal rate and start angle', () => {
    const t = times(0, 8, 200);
    const fit: FitReport = { ...base, model: 'spinup', window_s: [0, 8], spinup: { onset_s: e(1.2), terminal_rate_deg_s: e(-75), terminal_rate_rpm: e(-12.5), tau_s: e(1.7), theta0_deg: e(33) } };
    const c = modelCurve(fit, t, new Float64Array(200))!;
    const profile = { kind: 'spinup' as const, angle0_deg: 33, t0_s: 1.2, terminal_rate_deg_s: -75, tau_s: 1.7 };
    for (let i = 0; i < t.length; i += 7) {
      expect(c.angle_deg[i]).toBeCloseTo(profileAngle(profile, t[i]!), 9);
      expect(c.rate_deg_s[i]).toBeCloseTo(profileRate(profile, t[i]!), 9);
    }
  });

  it('draws a coast-down that stops and stays stopped, offset by least squares', () => {
    const t = times(0, 30, 600);
    const profile = { kind: 'coastdown' as const, angle0_deg: 0, t0_s: 0, start_rate_deg_s: 240, coulomb_deg_s2: 12, viscous_per_s: 0.15 };
    const truth = Float64Array.from(t, (x) => 50 + profileAngle(profile, x));
    const fit: FitReport = { ...base, model: 'spindown', window_s: [0, 30], spindown: { initial_rate_deg_s: e(240), initial_rate_rpm: e(40), coulomb_deg_s2: e(12), viscous_per_s: e(0.15), stop_s: null } };
    const c = modelCurve(fit, t, truth)!;
    for (let i = 0; i < t.length; i += 11) {
      expect(c.angle_deg[i]).toBeCloseTo(truth[i]!, 6);
      expect(c.rate_deg_s[i]).toBeCloseTo(profileRate(profile, t[i]!), 6);
    }
    expect(c.rate_deg_s[599]).toBe(0);
  });

  it('draws a steady line whose offset is the least-squares value over the fit window', () => {
    const t = times(0, 10, 101);
    const angle = Float64Array.from(t, (x) => 7 + 3 * x + (x > 5 ? 1 : -1) * 0.2);
    angle[40] = Number.NaN;
    const fit: FitReport = { ...base, model: 'steady', window_s: [2, 8], steady: { rate_deg_s: e(3), rate_rpm: e(0.5), rate_rev_s: e(3 / 360), segments: [], zero_test: { p_value: 0, p_sign: 0, statistic: 0, df: 10 }, min_detectable_deg_s: 0 } };
    const c = modelCurve(fit, t, angle)!;
    // window 2..8 s holds samples 20..80: 30 below 5 s (−0.2), 30 above (+0.2) and t = 5 s itself (−0.2), minus the NaN at 4 s
    const expectedOffset = 7 + (29 * -0.2 + 30 * 0.2 + -0.2) / 60;
    expect(c.angle_deg[0]).toBeCloseTo(expectedOffset, 12);
    expect(c.angle_deg[100]! - c.angle_deg[0]!).toBeCloseTo(30, 12);
  });
});
