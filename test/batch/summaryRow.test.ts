// summary.csv rows: a model's own columns are filled only when that model is the run's headline (auto keeps the
// models it did not choose in fit.json, where a steady run's coast-down fit once showed −950 deg/s² friction).
import { describe, expect, it } from 'vitest';
import { summaryRow } from '../../src/batch/summaryRow.js';
import type { RunRecord } from '../../src/batch/RunRecord.js';

const est = (value: number) => ({ value, se: 0.1, ci: [value - 0.2, value + 0.2] as [number, number], level: 0.95 });
const fits = {
  steady: { rate_deg_s: est(-2.5), rate_rpm: est(-2.5 / 6), zero_test: { p_value: 1e-6 } },
  spinup: { onset_s: est(1), tau_s: est(0.07), terminal_rate_deg_s: est(-2.5), terminal_rate_rpm: est(-2.5 / 6) },
  spindown: { initial_rate_deg_s: est(-2.6), initial_rate_rpm: est(-2.6 / 6), coulomb_deg_s2: est(-950.7), viscous_per_s: est(-1.7), stop_s: null },
};
/** A run record whose fit holds all three models, as --model auto writes it, with `model` chosen. */
const record = (model: 'steady' | 'spinup' | 'spindown') =>
  ({ run: 'R1', direction: 'reverse', setting: 12, setting_unit: 'L/min', group: 'g', status: 'ok', error: null, notes: '', lost_share: 0, warnings: [], fit: { model, ...fits } }) as unknown as RunRecord;

describe('summaryRow', () => {
  it('fills the zero test for a steady run and leaves the unchosen spin-up and coast-down columns empty', () => {
    const row = summaryRow(record('steady'));
    expect([row.rate_kind, row.rate_deg_s, row.zero_p_value]).toEqual(['steady', '-2.5', '0.000001']);
    expect([row.spinup_onset_s, row.spinup_tau_s, row.spinup_tau_se_s, row.spindown_coulomb_deg_s2, row.spindown_viscous_per_s, row.spindown_stop_s]).toEqual(['', '', '', '', '', '']);
  });

  it('fills only the chosen dynamics model\'s columns, and no steady zero test beside a terminal or initial rate', () => {
    const up = summaryRow(record('spinup'));
    expect([up.rate_kind, up.spinup_tau_s, up.zero_p_value, up.spindown_coulomb_deg_s2]).toEqual(['terminal', '0.07', '', '']);
    const down = summaryRow(record('spindown'));
    expect([down.rate_kind, down.spindown_coulomb_deg_s2, down.spinup_tau_s, down.zero_p_value]).toEqual(['initial', '-950.7', '', '']);
  });
});
