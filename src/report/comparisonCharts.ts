import type { TopLevelSpec } from 'vega-lite';
import type { Direction } from '../batch/RunRecord.js';
import type { ChartSpec } from './ChartSpec.js';
import type { ComparisonSummary } from './buildComparison.js';
import { PALETTE, SHAPES } from './reportStyle.js';

const SCHEMA = 'https://vega.github.io/schema/vega-lite/v6.json';

interface MarkRow {
  x: number | string;
  /** Position beside the setting on a categorical axis: forward runs, forward pooled, reverse pooled, reverse runs. */
  slot: string;
  direction: Direction;
  kind: 'run' | 'pooled';
  rate: number;
  lo: number;
  hi: number;
}

const directionScale = {
  color: { domain: ['forward', 'reverse'], range: [PALETTE.forward, PALETTE.reverse] },
  shape: { domain: ['forward', 'reverse'], range: [SHAPES.forward, SHAPES.reverse] },
};

/** Whether the settings make a numeric axis: all numbers, at least two different (else they are shown as labels). */
function numericSettings(summary: ComparisonSummary): boolean {
  return summary.settings.length > 0 && summary.settings.every((s) => s.setting !== null) && new Set(summary.settings.map((s) => s.setting)).size >= 2;
}

/** Label of a (group, setting) used on a categorical axis. */
export function settingLabel(group: string, setting: number | null, unit: string): string {
  const s = setting === null ? 'no setting' : `${setting}${unit ? ` ${unit}` : ''}`;
  return group ? `${group} · ${s}` : s;
}

function markRows(summary: ComparisonSummary, directions: Direction[]): MarkRow[] {
  const numeric = numericSettings(summary);
  const settingsNum = summary.settings.map((s) => s.setting ?? 0);
  const span = numeric ? Math.max(...settingsNum) - Math.min(...settingsNum) || Math.abs(settingsNum[0] ?? 1) || 1 : 1;
  const rows: MarkRow[] = [];
  for (const s of summary.settings) {
    for (const d of directions) {
      const side = d === 'forward' ? s.forward : s.reverse;
      if (!side.pooled) continue;
      const sign = d === 'forward' ? -1 : 1;
      const x0 = numeric ? s.setting! : settingLabel(s.group, s.setting, s.setting_unit);
      const at = (k: number): number | string => (numeric ? (x0 as number) + sign * span * (0.012 + 0.008 * k) : x0);
      const slotOf = (k: number | null): string => (d === 'forward' ? (k === null ? 'f~' : `f${String(k).padStart(3, '0')}`) : k === null ? 'r!' : `r${String(999 - k).padStart(3, '0')}`);
      side.runs.forEach((r, k) => rows.push({ x: at(k + 1), slot: slotOf(k), direction: d, kind: 'run', rate: r.estimate.value_deg_s, lo: r.ci_deg_s[0], hi: r.ci_deg_s[1] }));
      rows.push({ x: numeric ? (x0 as number) + sign * span * 0.004 : x0, slot: slotOf(null), direction: d, kind: 'pooled', rate: side.pooled.value_deg_s, lo: side.pooled.ci_deg_s[0], hi: side.pooled.ci_deg_s[1] });
    }
  }
  return rows;
}

function rateVsSetting(summary: ComparisonSummary, directions: Direction[], yTitle: string, width: number): TopLevelSpec {
  const numeric = numericSettings(summary);
  const unit = summary.settings[0]?.setting_unit ?? '';
  const x = numeric
    ? { field: 'x', type: 'quantitative', title: `setting${unit ? ` (${unit})` : ''}`, scale: { zero: false, padding: 16 } }
    : { field: 'x', type: 'nominal', title: 'setting', axis: { labelAngle: summary.settings.length <= 4 ? 0 : -30, labelLimit: summary.settings.length <= 4 ? 520 / summary.settings.length : 160 } };
  const rows = markRows(summary, directions);
  // slots sort forward runs, forward pooled ('f~'), reverse pooled ('r!'), reverse runs (character order ! < 0–9 < ~)
  const slots = [...new Set(rows.map((r) => r.slot))].sort((a, b) => (a[0] !== b[0] ? (a[0] === 'f' ? -1 : 1) : a < b ? -1 : 1));
  const xOffset = numeric ? {} : { xOffset: { field: 'slot', type: 'nominal', scale: { domain: slots, paddingInner: 0.2 } } };
  const color = { field: 'direction', type: 'nominal', title: 'direction', scale: { domain: directions, range: directions.map((d) => PALETTE[d]) } };
  const shape = { field: 'direction', type: 'nominal', title: 'direction', scale: { domain: directions, range: directions.map((d) => SHAPES[d]) } };
  return {
    $schema: SCHEMA,
    width,
    height: 260,
    data: { values: rows },
    layer: [
      { data: { values: [{ y: 0 }] }, mark: { type: 'rule', color: PALETTE.muted, strokeDash: [2, 2] }, encoding: { y: { field: 'y', type: 'quantitative' } } },
      { transform: [{ filter: "datum.kind === 'run'" }], mark: { type: 'rule', strokeWidth: 1, opacity: 0.8 }, encoding: { x, ...xOffset, y: { field: 'lo', type: 'quantitative', title: yTitle }, y2: { field: 'hi' }, color } },
      { transform: [{ filter: "datum.kind === 'pooled'" }], mark: { type: 'rule', strokeWidth: 3 }, encoding: { x, ...xOffset, y: { field: 'lo', type: 'quantitative' }, y2: { field: 'hi' }, color } },
      { transform: [{ filter: "datum.kind === 'run'" }], mark: { type: 'point', filled: false, size: 40, strokeWidth: 1.4 }, encoding: { x, ...xOffset, y: { field: 'rate', type: 'quantitative' }, color, shape } },
      { transform: [{ filter: "datum.kind === 'pooled'" }], mark: { type: 'point', filled: true, size: 110, stroke: PALETTE.ink, strokeWidth: 0.8, opacity: 1 }, encoding: { x, ...xOffset, y: { field: 'rate', type: 'quantitative' }, color, shape } },
    ],
  } as TopLevelSpec;
}

/** Power law panels: |rate| against setting on log–log axes with the fitted line per direction. */
function powerLawSpec(summary: ComparisonSummary): TopLevelSpec | null {
  const fitted = summary.trends.filter((t) => t.fit !== null);
  if (fitted.length === 0) return null;
  const points: { s: number; r: number; lo: number; hi: number; direction: Direction; clipped: boolean }[] = [];
  let floor = Infinity;
  for (const s of summary.settings) {
    for (const side of [s.forward, s.reverse]) for (const r of side.runs) if (Math.abs(r.estimate.value_deg_s) > 0) floor = Math.min(floor, Math.abs(r.estimate.value_deg_s));
  }
  floor = floor / 4;
  const lines: { s: number; r: number; direction: Direction; k: number }[] = [];
  for (const t of fitted) {
    const runs = summary.settings.filter((s) => s.group === t.group).flatMap((s) => (t.direction === 'forward' ? s.forward.runs : s.reverse.runs));
    for (const r of runs) {
      const v = t.sign * r.estimate.value_deg_s;
      const lo = t.sign === 1 ? r.ci_deg_s[0] : -r.ci_deg_s[1];
      const hi = t.sign === 1 ? r.ci_deg_s[1] : -r.ci_deg_s[0];
      points.push({ s: r.setting!, r: v, lo: Math.max(lo, floor), hi, direction: t.direction, clipped: lo < floor });
    }
    const ss = runs.map((r) => r.setting!);
    const s0 = Math.min(...ss);
    const s1 = Math.max(...ss);
    for (let k = 0; k <= 40; k++) {
      const s = s0 * (s1 / s0) ** (k / 40);
      lines.push({ s, r: t.fit!.a.value * s ** t.fit!.b.value, direction: t.direction, k });
    }
  }
  const unit = summary.settings[0]?.setting_unit ?? '';
  const color = { field: 'direction', type: 'nominal', title: 'direction', scale: directionScale.color };
  return {
    $schema: SCHEMA,
    width: 520,
    height: 280,
    layer: [
      { data: { values: lines }, mark: { type: 'line', strokeWidth: 1.6 }, encoding: { x: { field: 's', type: 'quantitative', scale: { type: 'log', nice: false, padding: 12 }, title: `setting${unit ? ` (${unit})` : ''}, log scale` }, y: { field: 'r', type: 'quantitative', scale: { type: 'log', nice: false, padding: 12 }, title: '|rate| (deg/s), log scale' }, color, strokeDash: { field: 'direction', type: 'nominal', title: 'direction', scale: { domain: ['forward', 'reverse'], range: [[1, 0], [6, 3]] } }, order: { field: 'k', type: 'quantitative' } } },
      { data: { values: points }, mark: { type: 'rule', strokeWidth: 1 }, encoding: { x: { field: 's', type: 'quantitative' }, y: { field: 'lo', type: 'quantitative' }, y2: { field: 'hi' }, color } },
      { data: { values: points }, mark: { type: 'point', filled: true, size: 50 }, encoding: { x: { field: 's', type: 'quantitative' }, y: { field: 'r', type: 'quantitative' }, color, shape: { field: 'direction', type: 'nominal', title: 'direction', scale: directionScale.shape } } },
    ],
  } as TopLevelSpec;
}

/** The comparison charts: both directions against setting, reverse alone on its own scale, and the power law. */
export function comparisonChartSpecs(summary: ComparisonSummary): ChartSpec[] {
  const charts: ChartSpec[] = [];
  if (summary.settings.length === 0) return charts;
  const level = Math.round(summary.level * 100);
  charts.push({
    id: 'both',
    title: 'Rate against setting, both directions',
    caption: `Signed rate (counterclockwise positive). Filled large marks: runs pooled per setting with their ${level}% interval (thick bar); small open marks beside them: each run with its own interval. Forward: blue circles; reverse: orange downward triangles.`,
    spec: rateVsSetting(summary, ['forward', 'reverse'], 'rate (deg/s)', 560),
  });
  if (summary.settings.some((s) => s.reverse.pooled)) {
    charts.push({
      id: 'reverse',
      title: 'Reverse direction on its own scale',
      caption: `The reverse runs alone, so a rate many times smaller than forward stays readable. The dotted line is zero: marks below it turn clockwise, above it counterclockwise; an interval crossing it means the direction is not settled.`,
      spec: rateVsSetting(summary, ['reverse'], 'reverse rate (deg/s)', 560),
    });
  }
  const pl = powerLawSpec(summary);
  if (pl) {
    charts.push({
      id: 'powerlaw',
      title: '|Rate| against setting, log–log, with fitted power laws',
      caption: 'Each run’s |rate| with its interval (an interval reaching below the plot is cut at its lower edge); lines: fitted power law |rate| = a·setting^b per direction (forward solid, reverse dashed).',
      spec: pl,
    });
  }
  return charts;
}
