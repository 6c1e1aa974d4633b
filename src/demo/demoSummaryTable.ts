import type { RunRecord } from '../batch/RunRecord.js';
import { headlineRate } from '../batch/summaryRow.js';
import type { DemoRun } from './demoDay.js';

/** The reported rate of a record with its interval: the chosen model's headline rate, as in summary.csv. */
function reportedRate(record: RunRecord): { value: number; lo: number; hi: number } | null {
  const est = headlineRate(record)?.deg_s;
  return est ? { value: est.value, lo: est.ci[0], hi: est.ci[1] } : null;
}

/** A plain-text table of the demo's runs: measured rate and interval beside the renderer's truth. */
export function demoSummaryTable(runs: DemoRun[], records: RunRecord[]): string {
  const byRun = new Map(records.map((r) => [r.run, r]));
  const header = ['run', 'direction', 'head cm', 'rate deg/s', '95% interval', 'truth', 'status'];
  const rows = runs.map((d) => {
    const rec = byRun.get(d.run);
    const rate = rec ? reportedRate(rec) : null;
    // enough decimals that the interval's half-width shows two significant digits
    const half = rate ? (rate.hi - rate.lo) / 2 : 0;
    const digits = rate && half > 0 ? Math.min(6, Math.max(1, 1 - Math.floor(Math.log10(half)))) : 3;
    return [
      d.run,
      d.direction,
      String(d.setting),
      rate ? rate.value.toFixed(digits) : '—',
      rate ? `[${rate.lo.toFixed(digits)}, ${rate.hi.toFixed(digits)}]` : '—',
      d.truth_rate_deg_s === null ? '—' : d.truth_rate_deg_s.toFixed(digits),
      rec ? (rec.status === 'ok' ? 'ok' : `failed: ${rec.error ?? ''}`) : 'not run',
    ];
  });
  const widths = header.map((h, i) => Math.max(h.length, ...rows.slice(0).map((r) => (i === 6 ? 0 : r[i].length))));
  const line = (cells: string[]) => cells.map((c, i) => (i === cells.length - 1 ? c : c.padEnd(widths[i]))).join('  ');
  return [line(header), ...rows.map(line)].join('\n');
}
