import type { Direction, RunRecord } from '../batch/RunRecord.js';
import type { FitReport } from '../fit/FitReport.js';
import { compareDirections, studentQuantile, type DirectionComparison, type RateEstimate } from '../fit/compareDirections.js';
import { fitPowerLaw, type PowerLawFit } from '../fit/fitPowerLaw.js';
import { poolReplicates, type PooledRate } from '../fit/poolReplicates.js';
import { modelLabel } from './formatQuantity.js';

/** One run's rate as used in the comparison. */
export interface RunRate {
  run: string;
  direction: Direction;
  group: string;
  setting: number | null;
  setting_unit: string;
  estimate: RateEstimate;
  ci_deg_s: [number, number];
  /** The same rate allowing for a rate wander too small for the run to detect (steady fits: steady.wander_allowance); the estimate itself otherwise. */
  estimate_allowing_wander: RateEstimate;
  /** Which number of the fit is the run's rate. */
  source: 'steady rate' | 'spin-up terminal rate';
}

/** One direction at one setting: its runs one by one and pooled. */
export interface DirectionAtSetting {
  runs: RunRate[];
  pooled: PooledRate | null;
}

/** Forward against reverse at one (group, setting). */
export interface SettingComparison {
  group: string;
  setting: number | null;
  setting_unit: string;
  forward: DirectionAtSetting;
  reverse: DirectionAtSetting;
  comparison: DirectionComparison | null;
  /** The comparison once more with every run's rate allowing for undetected rate wander (built at each fit's own level); null when no run's differs. */
  comparison_allowing_wander: DirectionComparison | null;
  /** Why there is no comparison, or a caveat about it. */
  notes: string[];
}

/** Rate against setting for one direction of one group, as a power law. */
export interface TrendFit {
  group: string;
  direction: Direction;
  setting_unit: string;
  /** Sign of every rate used (the fit is on |rate|). */
  sign: 1 | -1;
  fit: PowerLawFit | null;
  notes: string[];
}

export interface ComparisonSummary {
  level: number;
  margin_deg_s: number | null;
  margin_source: string;
  settings: SettingComparison[];
  trends: TrendFit[];
  /** ok runs that have no single rate to compare (e.g. coast-down runs), with the reason. */
  excluded: { run: string; reason: string }[];
}

export interface ComparisonOptions {
  /** Confidence level; default: the level of the runs' fits, else 0.95. */
  level?: number;
  /** Equivalence margin, deg/s; default: the margin the runs were fitted with, if any. */
  margin_deg_s?: number | null;
}

/**
 * The rate a run contributes to the comparison, following the model its fit chose: the steady rate, or a
 * spin-up's terminal rate (with `auto` a spin-up run also carries a steady fit, whose rate averages the
 * spin-up and is not the run's rate).
 */
export function runRate(record: RunRecord, fit: FitReport | null): { rate: RunRate | null; reason: string | null } {
  if (record.status !== 'ok' || fit === null) return { rate: null, reason: 'the run has no fit' };
  const base = { run: record.run, direction: record.direction, group: record.group, setting: record.setting, setting_unit: record.setting_unit };
  if (fit.model === 'steady' && fit.steady) {
    const e = fit.steady.rate_deg_s;
    const estimate = { value_deg_s: e.value, se_deg_s: e.se, df: fit.steady.zero_test.df > 0 ? fit.steady.zero_test.df : Infinity };
    const w = fit.steady.wander_allowance;
    const allowing = w && w.hidden_walk_bound_deg_per_sqrt_s !== null ? { value_deg_s: w.rate_deg_s.value, se_deg_s: w.rate_deg_s.se, df: w.zero_test.df > 0 ? w.zero_test.df : Infinity } : estimate;
    return { rate: { ...base, estimate, estimate_allowing_wander: allowing, ci_deg_s: e.ci, source: 'steady rate' }, reason: null };
  }
  if (fit.model === 'spinup' && fit.spinup) {
    const e = fit.spinup.terminal_rate_deg_s;
    const estimate = { value_deg_s: e.value, se_deg_s: e.se, df: Infinity };
    return { rate: { ...base, estimate, estimate_allowing_wander: estimate, ci_deg_s: e.ci, source: 'spin-up terminal rate' }, reason: null };
  }
  return { rate: null, reason: `a ${modelLabel(fit.model)} fit has no single rate to compare` };
}

/**
 * What a comparison says about the reverse direction's sense, at this level: it turns the other way (p_opposite
 * below α), it turns the same way (the reverse rate has the forward's sign and 1 − p_opposite is below α), or the
 * direction is not settled.
 */
export function directionVerdict(c: DirectionComparison, level: number): 'turns the other way' | 'turns the same way' | 'direction not settled' {
  const alpha = 1 - level;
  const sameWay = Math.sign(c.reverse.value_deg_s) === Math.sign(c.forward.value_deg_s);
  return c.p_opposite < alpha ? 'turns the other way' : 1 - c.p_opposite < alpha && sameWay ? 'turns the same way' : 'direction not settled';
}

/**
 * Groups the ok runs by (group, setting), pools replicates per direction (random effects), compares
 * reverse with forward, and fits |rate| against setting per direction as a power law.
 */
export function buildComparison(runs: readonly { record: RunRecord; fit: FitReport | null }[], options: ComparisonOptions = {}): ComparisonSummary {
  const rates: RunRate[] = [];
  const excluded: { run: string; reason: string }[] = [];
  let fitLevel: number | undefined;
  let fitMargin: number | undefined;
  for (const r of runs) {
    if (r.record.status !== 'ok') continue;
    const { rate, reason } = runRate(r.record, r.fit);
    if (rate && rate.estimate.se_deg_s > 0 && Number.isFinite(rate.estimate.value_deg_s)) rates.push(rate);
    else excluded.push({ run: r.record.run, reason: reason ?? 'its rate has no usable standard error' });
    fitLevel ??= r.fit?.steady?.rate_deg_s.level ?? r.fit?.spinup?.terminal_rate_deg_s.level;
    fitMargin ??= r.fit?.steady?.zero_test.margin_deg_s;
  }
  const level = options.level ?? fitLevel ?? 0.95;
  const margin = options.margin_deg_s !== undefined ? options.margin_deg_s : (fitMargin ?? null);
  const margin_source = options.margin_deg_s !== undefined && options.margin_deg_s !== null ? 'given for this report' : fitMargin !== undefined ? 'the margin the runs were fitted with' : 'none given';

  const keyOf = (r: RunRate): string => JSON.stringify([r.group, r.setting, r.setting_unit]);
  const groups = new Map<string, RunRate[]>();
  for (const r of rates) {
    const list = groups.get(keyOf(r)) ?? [];
    list.push(r);
    groups.set(keyOf(r), list);
  }
  const settings: SettingComparison[] = [];
  for (const list of groups.values()) {
    const first = list[0]!;
    const side = (d: Direction): DirectionAtSetting => {
      const rs = list.filter((r) => r.direction === d);
      return { runs: rs, pooled: rs.length > 0 ? poolReplicates(rs.map((r) => r.estimate), { level }) : null };
    };
    const forward = side('forward');
    const reverse = side('reverse');
    const notes: string[] = [];
    let comparison: DirectionComparison | null = null;
    let allowing: DirectionComparison | null = null;
    if (forward.pooled && reverse.pooled) {
      comparison = compareDirections(forward.pooled, reverse.pooled, { level, margin_deg_s: margin });
      if (forward.pooled.k === 1 || reverse.pooled.k === 1) notes.push('A single run in one direction: the spread between runs is not included for it.');
      if (comparison.ratio.fieller.kind !== 'bounded') notes.push('The forward rate is not clearly different from zero, so the ratio has no bounded interval.');
      if (list.some((r) => r.estimate_allowing_wander !== r.estimate)) {
        const pool = (d: Direction) => poolReplicates(list.filter((r) => r.direction === d).map((r) => r.estimate_allowing_wander), { level });
        allowing = compareDirections(pool('forward'), pool('reverse'), { level, margin_deg_s: margin });
        const before = directionVerdict(comparison, level);
        const after = directionVerdict(allowing, level);
        // said only when allowing for wander unsettles a verdict the main intervals gave
        if (before !== 'direction not settled' && after === 'direction not settled') {
          notes.push(`Allowing for a rate wander too small for the runs to detect, the sense of the reverse direction is not settled (p = ${allowing.p_opposite.toPrecision(2)} for turning the other way).`);
        }
      }
    } else notes.push(forward.pooled ? 'No reverse run at this setting.' : 'No forward run at this setting.');
    settings.push({ group: first.group, setting: first.setting, setting_unit: first.setting_unit, forward, reverse, comparison, comparison_allowing_wander: allowing, notes });
  }
  settings.sort((a, b) => (a.group < b.group ? -1 : a.group > b.group ? 1 : (a.setting ?? -Infinity) - (b.setting ?? -Infinity)));

  const trends: TrendFit[] = [];
  const trendGroups = new Map<string, RunRate[]>();
  for (const r of rates) {
    if (r.setting === null) continue;
    const key = JSON.stringify([r.group, r.direction, r.setting_unit]);
    const list = trendGroups.get(key) ?? [];
    list.push(r);
    trendGroups.set(key, list);
  }
  for (const list of trendGroups.values()) {
    const first = list[0]!;
    const notes: string[] = [];
    const positive = list.filter((r) => r.estimate.value_deg_s > 0).length;
    const sign: 1 | -1 = positive * 2 >= list.length ? 1 : -1;
    const distinct = new Set(list.map((r) => r.setting)).size;
    let fit: PowerLawFit | null = null;
    if (distinct < 2) notes.push('Only one setting: no trend to fit.');
    else if (list.some((r) => (r.setting ?? 0) <= 0)) notes.push('A setting is zero or negative, so a power law cannot be fitted.');
    else if (list.some((r) => Math.sign(r.estimate.value_deg_s) !== sign)) notes.push('The runs do not all turn the same way, so a power law in |rate| would mislead; not fitted.');
    else {
      fit = fitPowerLaw(list.map((r) => r.setting!), list.map((r) => Math.abs(r.estimate.value_deg_s)), { level });
      const unclear = list.filter((r) => {
        const t = studentQuantile(1 - (1 - level) / 2, r.estimate.df);
        return Math.abs(r.estimate.value_deg_s) < t * r.estimate.se_deg_s;
      }).length;
      if (unclear > 0) notes.push(`${unclear} of ${list.length} rates are not distinguishable from zero; read the exponent with care.`);
      if (fit.n === 2) notes.push('Two points only: the exponent has no interval.');
    }
    trends.push({ group: first.group, direction: first.direction, setting_unit: first.setting_unit, sign, fit, notes });
  }
  trends.sort((a, b) => (a.group < b.group ? -1 : a.group > b.group ? 1 : a.direction < b.direction ? -1 : 1));
  return { level, margin_deg_s: margin, margin_source, settings, trends, excluded };
}
