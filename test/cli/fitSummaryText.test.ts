// What `revtrace fit` prints for the dynamics models: every fitted parameter with its interval, not only the rate,
// each to two significant digits of its standard error (here se = half the interval's half-width).
import { describe, expect, it } from 'vitest';
import { fitSummaryText } from '../../src/cli/fit.js';
import type { FitReport } from '../../src/fit/FitReport.js';

const est = (value: number, half: number) => ({ value, se: half / 2, ci: [value - half, value + half] as [number, number], level: 0.95 });
const base = { window_s: [0.2, 8] as [number, number], n: 234, method: '', diagnostics: { residual_autocorrelation: [], lost_share: 0, residual_rms_deg: 0.03, warnings: [] }, software: { name: 'revtrace' as const, version: 'test' } };

describe('fitSummaryText', () => {
  it('prints a coast-down\'s friction coefficients and stop time, and a spin-up\'s onset', () => {
    const down = { ...base, model: 'spindown', spindown: { initial_rate_deg_s: est(149.97, 0.04), initial_rate_rpm: est(25, 0.01), coulomb_deg_s2: est(10.01, 0.013), viscous_per_s: est(0.2998, 0.0003), stop_s: 5.8812 } } as unknown as FitReport;
    expect(fitSummaryText(down, 'fit.json')).toContain('Coulomb friction 10.0100 deg/s² (95% CI 9.9970 to 10.0230), viscous 0.29980 1/s (95% CI 0.29950 to 0.30010); stops at 5.881 s\n');
    const up = { ...base, model: 'spinup', spinup: { terminal_rate_deg_s: est(120, 0.015), terminal_rate_rpm: est(20, 0.002), tau_s: est(0.8005, 0.0009), onset_s: est(0.9995, 0.0006) } } as unknown as FitReport;
    expect(fitSummaryText(up, 'fit.json')).toContain('onset 0.99950 s (95% CI 0.99890 to 1.00010)\n');
  });
});
