import type { Estimate } from '../fit/FitReport.js';
import type { RunRecord } from './RunRecord.js';

/** The columns of summary.csv, in order. Rates in deg/s (counterclockwise positive as displayed) and rpm. */
export const SUMMARY_COLUMNS = [
  'run', 'direction', 'setting', 'setting_unit', 'group', 'status', 'model', 'rate_kind',
  'rate_deg_s', 'rate_se_deg_s', 'rate_lo_deg_s', 'rate_hi_deg_s', 'rate_rpm', 'rate_lo_rpm', 'rate_hi_rpm', 'level',
  'zero_p_value', 'spinup_onset_s', 'spinup_tau_s', 'spinup_tau_se_s', 'spindown_coulomb_deg_s2', 'spindown_viscous_per_s', 'spindown_stop_s',
  'lost_share', 'warnings', 'error', 'notes',
] as const;

export type SummaryRow = Record<(typeof SUMMARY_COLUMNS)[number], string>;

/** A number as text with 10 significant digits (stable across runs); '' for null or not finite. */
export function formatNumber(x: number | null | undefined): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '';
  return String(Number(x.toPrecision(10)));
}

/** The rate a run is summarised by: the steady rate, a spin-up's terminal rate or a coast-down's initial rate. */
export function headlineRate(r: RunRecord): { kind: string; deg_s: Estimate; rpm: Estimate } | null {
  const f = r.fit;
  if (!f) return null;
  if (f.model === 'steady' && f.steady) return { kind: 'steady', deg_s: f.steady.rate_deg_s, rpm: f.steady.rate_rpm };
  if (f.model === 'spinup' && f.spinup) return { kind: 'terminal', deg_s: f.spinup.terminal_rate_deg_s, rpm: f.spinup.terminal_rate_rpm };
  if (f.model === 'spindown' && f.spindown) return { kind: 'initial', deg_s: f.spindown.initial_rate_deg_s, rpm: f.spindown.initial_rate_rpm };
  return null;
}

/** One row of summary.csv from a run record. */
export function summaryRow(r: RunRecord): SummaryRow {
  const rate = headlineRate(r);
  const f = r.fit;
  const spinup = f?.model === 'spinup' ? f.spinup : undefined;
  const spindown = f?.model === 'spindown' ? f.spindown : undefined;
  return {
    run: r.run,
    direction: r.direction,
    setting: formatNumber(r.setting),
    setting_unit: r.setting_unit,
    group: r.group,
    status: r.status,
    model: f?.model ?? '',
    rate_kind: rate?.kind ?? '',
    rate_deg_s: formatNumber(rate?.deg_s.value),
    rate_se_deg_s: formatNumber(rate?.deg_s.se),
    rate_lo_deg_s: formatNumber(rate?.deg_s.ci[0]),
    rate_hi_deg_s: formatNumber(rate?.deg_s.ci[1]),
    rate_rpm: formatNumber(rate?.rpm.value),
    rate_lo_rpm: formatNumber(rate?.rpm.ci[0]),
    rate_hi_rpm: formatNumber(rate?.rpm.ci[1]),
    level: formatNumber(rate?.deg_s.level),
    // each model's columns only for the chosen model: --model auto keeps the others' fits in fit.json, not here
    zero_p_value: formatNumber(f?.model === 'steady' ? f.steady?.zero_test.p_value : undefined),
    spinup_onset_s: formatNumber(spinup?.onset_s.value),
    spinup_tau_s: formatNumber(spinup?.tau_s.value),
    spinup_tau_se_s: formatNumber(spinup?.tau_s.se),
    spindown_coulomb_deg_s2: formatNumber(spindown?.coulomb_deg_s2.value),
    spindown_viscous_per_s: formatNumber(spindown?.viscous_per_s.value),
    spindown_stop_s: formatNumber(spindown?.stop_s),
    lost_share: formatNumber(r.lost_share),
    warnings: (r.warnings ?? []).join('; '),
    error: r.error ?? '',
    notes: r.notes,
  };
}
