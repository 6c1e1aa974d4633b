import { directionVerdict, type ComparisonSummary, type DirectionAtSetting, type SettingComparison } from './buildComparison.js';
import { formatFixed, formatInterval, formatP, formatRate, formatSig, decimalsFor } from './formatQuantity.js';
import { html, type SafeHtml } from './escapeHtml.js';
import { settingLabel } from './comparisonCharts.js';
import type { RatioInterval } from '../fit/compareDirections.js';

function rateCell(side: DirectionAtSetting): SafeHtml {
  const p = side.pooled;
  if (!p) return html`<td>—</td>`;
  const f = formatRate(p.value_deg_s, p.ci_deg_s, p.se_deg_s);
  return html`<td class="num">${f.deg_s}<br><small>${f.rpm} rpm · ${p.k} run${p.k === 1 ? '' : 's'}</small></td>`;
}

function ratioText(value: number, fieller: RatioInterval, se: number): string {
  const d = decimalsFor(se);
  if (fieller.kind === 'bounded') return `${formatFixed(value, d)} [${formatFixed(fieller.bounds[0], d)}, ${formatFixed(fieller.bounds[1], d)}]`;
  if (fieller.kind === 'exclusive') return `${formatFixed(value, d)} (set: below ${formatFixed(fieller.bounds[0], d)} or above ${formatFixed(fieller.bounds[1], d)})`;
  return `${formatFixed(value, d)} (no bounded interval)`;
}

function comparisonRow(s: SettingComparison, level: number): SafeHtml {
  const c = s.comparison;
  const label = settingLabel(s.group, s.setting, s.setting_unit);
  if (!c) {
    return html`<tr><th scope="row">${label}</th>${rateCell(s.forward)}${rateCell(s.reverse)}<td colspan="5">${s.notes.join(' ')}</td></tr>`;
  }
  const eq = c.equivalence;
  const eqText = eq ? `${eq.equivalent ? 'yes' : 'no'} (±${formatSig(eq.margin_deg_s)} deg/s, p ${formatP(eq.p_value).startsWith('<') ? '' : '= '}${formatP(eq.p_value)})` : 'no margin given';
  const verdict = directionVerdict(c, level);
  return html`<tr><th scope="row">${label}</th>${rateCell(s.forward)}${rateCell(s.reverse)}
<td class="num">${ratioText(c.ratio.value, c.ratio.fieller, c.ratio.delta.se)}<br><small>standard error ${formatSig(c.ratio.delta.se, 2)} (delta method)</small></td>
<td class="num">${formatP(c.p_opposite)}<br><small>${verdict}</small></td>
<td>${eqText}</td>
<td class="num">${formatSig(c.min_detectable_deg_s, 2)} deg/s<br><small>${formatSig(c.min_detectable_deg_s / 6, 2)} rpm</small></td>
<td>${s.notes.join(' ')}</td></tr>`;
}

/** The per-setting comparison table, the replicate table and the power-law table. */
export function comparisonTables(summary: ComparisonSummary): { comparison: SafeHtml; replicates: SafeHtml; trends: SafeHtml } {
  const level = Math.round(summary.level * 100);
  const comparison = html`<div class="table-wrap"><table class="comparison">
<caption>Forward against reverse at each setting (rates in deg/s with ${level}% intervals; rpm below)</caption>
<thead><tr><th scope="col">Setting</th><th scope="col"><span class="dir dir-forward">Forward rate</span></th><th scope="col"><span class="dir dir-reverse">Reverse rate</span></th><th scope="col">Reverse / forward [Fieller ${level}%]</th><th scope="col">p, reverse turns opposite to forward</th><th scope="col">Reverse equivalent to zero?</th><th scope="col">Smallest reverse rate detectable (${Math.round((summary.settings[0]?.comparison?.power ?? 0.8) * 100)}% power)</th><th scope="col">Notes</th></tr></thead>
<tbody>${summary.settings.map((s) => comparisonRow(s, summary.level))}</tbody></table></div>`;

  const repRows: SafeHtml[] = [];
  for (const s of summary.settings) {
    for (const [dir, side] of [['forward', s.forward], ['reverse', s.reverse]] as const) {
      if (!side.pooled) continue;
      for (const r of side.runs) {
        const f = formatRate(r.estimate.value_deg_s, r.ci_deg_s, r.estimate.se_deg_s);
        repRows.push(html`<tr><th scope="row">${settingLabel(s.group, s.setting, s.setting_unit)}</th><td><span class="dir dir-${dir}">${dir}</span></td><td><a href="#${runAnchor(r.run)}">${r.run}</a></td><td class="num">${f.deg_s}</td><td class="num">${f.rpm}</td><td>${r.source}</td></tr>`);
      }
      const p = side.pooled;
      const f = formatRate(p.value_deg_s, p.ci_deg_s, p.se_deg_s);
      const spread = p.k > 1 ? `between-run SD ${formatSig(Math.sqrt(p.tau2_deg2_s2), 2)} deg/s, I² ${Math.round(100 * p.i2)}%` : 'single run';
      repRows.push(html`<tr class="pooled"><th scope="row">${settingLabel(s.group, s.setting, s.setting_unit)}</th><td><span class="dir dir-${dir}">${dir}</span></td><td>pooled (${p.k})</td><td class="num">${f.deg_s}</td><td class="num">${f.rpm}</td><td>${spread}</td></tr>`);
    }
  }
  const replicates = html`<div class="table-wrap"><table class="replicates">
<caption>Replicate runs one by one, then pooled (rates with ${level}% intervals)</caption>
<thead><tr><th scope="col">Setting</th><th scope="col">Direction</th><th scope="col">Run</th><th scope="col">Rate (deg/s)</th><th scope="col">Rate (rpm)</th><th scope="col">Rate used / spread</th></tr></thead>
<tbody>${repRows}</tbody></table></div>`;

  const trends = summary.trends.length === 0
    ? html`<p>No numeric settings to fit a trend to.</p>`
    : html`<div class="table-wrap"><table class="trends">
<caption>|rate| = a·setting^b per direction (log–log least squares, ${level}% intervals)</caption>
<thead><tr><th scope="col">Group</th><th scope="col">Direction</th><th scope="col">Runs</th><th scope="col">Exponent b</th><th scope="col">Prefactor a (deg/s per unit^b)</th><th scope="col">R² (logs)</th><th scope="col">Sign of rate</th><th scope="col">Notes</th></tr></thead>
<tbody>${summary.trends.map((t) => html`<tr><th scope="row">${t.group || '—'}</th><td><span class="dir dir-${t.direction}">${t.direction}</span></td><td class="num">${t.fit ? t.fit.n : '—'}</td>
<td class="num">${t.fit ? formatInterval(t.fit.b.value, t.fit.b.ci, t.fit.b.se) : '—'}</td>
<td class="num">${t.fit ? `${formatSig(t.fit.a.value)} [${formatSig(t.fit.a.ci[0])}, ${formatSig(t.fit.a.ci[1])}]` : '—'}</td>
<td class="num">${t.fit ? formatFixed(t.fit.r2_log, 3) : '—'}</td><td>${t.sign > 0 ? 'counterclockwise (+)' : 'clockwise (−)'}</td><td>${t.notes.join(' ')}</td></tr>`)}</tbody></table></div>`;
  return { comparison, replicates, trends };
}

/** The in-page anchor of a run's section (the run name made safe for an id). */
export function runAnchor(run: string): string {
  return `run-${run.replace(/[^A-Za-z0-9_-]/g, (c) => `_${c.codePointAt(0)!.toString(16)}`)}`;
}
