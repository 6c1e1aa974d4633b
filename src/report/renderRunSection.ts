import { relative, sep } from 'node:path';
import type { FitReport } from '../fit/FitReport.js';
import type { ChartSpec } from './ChartSpec.js';
import { escapeHtml, html, trusted, type SafeHtml } from './escapeHtml.js';
import { formatFixed, formatInterval, formatP, formatRate, formatSig, modelLabel } from './formatQuantity.js';
import { previewDataUri } from './previewDataUri.js';
import { qualityNotes } from './qualityNotes.js';
import { renderChart } from './renderChart.js';
import type { RunData } from './ReportData.js';
import { runAnchor } from './renderComparisonSection.js';
import { runChartSpecs } from './runCharts.js';

/** A relative link from the report's folder to a file, each path segment URI-encoded. */
export function relativeHref(fromDir: string, target: string): string {
  return relative(fromDir, target).split(sep).map(encodeURIComponent).join('/');
}

/** A figure holding one rendered chart. */
export async function chartFigure(chart: ChartSpec, headingLevel: 'h3' | 'h4'): Promise<SafeHtml> {
  const svg = (await renderChart(chart.spec)).replace('<svg ', `<svg role="img" aria-label="${escapeHtml(chart.title)}" `);
  const heading = headingLevel === 'h3' ? html`<h3>${chart.title}</h3>` : html`<h4>${chart.title}</h4>`;
  return html`<figure class="chart" data-chart="${chart.id}">${heading}${trusted(svg)}<figcaption>${chart.caption}</figcaption></figure>`;
}

/** The relation and value after 'p': '= 0.012' or '< 0.001'. */
function pText(p: number): string {
  const f = formatP(p);
  return f.startsWith('<') ? f : `= ${f}`;
}

function estimateRow(name: string, e: { value: number; se: number; ci: [number, number] }, unit: string): SafeHtml {
  return html`<tr><th scope="row">${name}</th><td class="num">${formatInterval(e.value, e.ci, e.se)}</td><td>${unit}</td></tr>`;
}

function resultTable(fit: FitReport): SafeHtml {
  const rows: SafeHtml[] = [];
  const level = Math.round(100 * (fit.steady?.rate_deg_s.level ?? fit.spinup?.terminal_rate_deg_s.level ?? fit.spindown?.initial_rate_deg_s.level ?? 0.95));
  // only the chosen model's numbers: fit.json may also carry the candidates that were not chosen
  if (fit.model === 'steady' && fit.steady) {
    const s = fit.steady;
    const r = formatRate(s.rate_deg_s.value, s.rate_deg_s.ci, s.rate_deg_s.se);
    rows.push(html`<tr><th scope="row">Steady rate</th><td class="num">${r.deg_s}</td><td>deg/s</td></tr>`);
    rows.push(html`<tr><th scope="row">Steady rate</th><td class="num">${r.rpm}</td><td>rpm</td></tr>`);
    rows.push(html`<tr><th scope="row">Differs from zero</th><td class="num">p ${pText(s.zero_test.p_value)}</td><td>two-sided, ${formatSig(s.zero_test.df)} df</td></tr>`);
    if (s.zero_test.margin_deg_s !== undefined) rows.push(html`<tr><th scope="row">Equivalent to zero (±${formatSig(s.zero_test.margin_deg_s)} deg/s)</th><td class="num">${s.zero_test.equivalent_to_zero ? 'yes' : 'no'}, p ${pText(s.zero_test.equivalence_p_value ?? Number.NaN)}</td><td>two one-sided tests</td></tr>`);
    const w = s.wander_allowance;
    if (w && w.hidden_walk_bound_deg_per_sqrt_s !== null) {
      rows.push(html`<tr><th scope="row">Allowing for undetected rate wander (up to ${formatSig(w.hidden_walk_bound_deg_per_sqrt_s, 2)} deg/√s)</th><td class="num">${formatInterval(w.rate_deg_s.value, w.rate_deg_s.ci, w.rate_deg_s.se)}<br>differs from zero: p ${pText(w.zero_test.p_value)}</td><td>deg/s</td></tr>`);
    }
    rows.push(html`<tr><th scope="row">Smallest detectable rate</th><td class="num">${formatSig(s.min_detectable_deg_s, 2)} (${formatSig(s.min_detectable_deg_s / 6, 2)} rpm)</td><td>deg/s, 80% power</td></tr>`);
  }
  if (fit.model === 'spinup' && fit.spinup) {
    const u = fit.spinup;
    rows.push(estimateRow('Terminal rate', u.terminal_rate_deg_s, 'deg/s'));
    rows.push(estimateRow('Terminal rate', u.terminal_rate_rpm, 'rpm'));
    rows.push(estimateRow('Time constant τ', u.tau_s, 's'));
    rows.push(estimateRow('Onset', u.onset_s, 's'));
  }
  if (fit.model === 'spindown' && fit.spindown) {
    const d = fit.spindown;
    rows.push(estimateRow('Initial rate', d.initial_rate_deg_s, 'deg/s'));
    rows.push(estimateRow('Initial rate', d.initial_rate_rpm, 'rpm'));
    rows.push(estimateRow('Dry (Coulomb) deceleration', d.coulomb_deg_s2, 'deg/s²'));
    rows.push(estimateRow('Viscous decay rate', d.viscous_per_s, '1/s'));
    rows.push(html`<tr><th scope="row">Stops at</th><td class="num">${d.stop_s === null ? 'not within the window' : formatFixed(d.stop_s, 2)}</td><td>${d.stop_s === null ? '' : 's'}</td></tr>`);
  }
  return html`<table class="result"><caption>Fit: ${modelLabel(fit.model)} model, window ${formatFixed(fit.window_s[0], 2)}–${formatFixed(fit.window_s[1], 2)} s, ${fit.n} frames (${level}% intervals)</caption>
<thead><tr><th scope="col">Quantity</th><th scope="col">Value [interval]</th><th scope="col">Unit</th></tr></thead><tbody>${rows}</tbody></table>
<p class="meta">Method: ${fit.method}${fit.selection && !fit.method.includes(fit.selection.rule) ? ` Model chosen by: ${fit.selection.rule}` : ''}</p>`;
}

/** Settings groups as dotted keys (track.centre, fit.model), one level deep; null shown as "default". */
function flattenSettings(settings: Record<string, unknown>, prefix = ''): [string, string][] {
  const rows: [string, string][] = [];
  for (const [k, v] of Object.entries(settings)) {
    const key = prefix ? `${prefix}.${k}` : k;
    if (v !== null && typeof v === 'object' && !Array.isArray(v) && prefix === '') rows.push(...flattenSettings(v as Record<string, unknown>, key));
    else rows.push([key, v === null ? 'default' : typeof v === 'string' ? v : JSON.stringify(v)]);
  }
  return rows;
}

function settingsTable(settings: Record<string, unknown>): SafeHtml {
  const rows = flattenSettings(settings ?? {}).sort((a, b) => (a[0] < b[0] ? -1 : 1));
  if (rows.length === 0) return html`<p>No settings recorded.</p>`;
  return html`<table class="settings"><caption>Settings used</caption><thead><tr><th scope="col">Setting</th><th scope="col">Value</th></tr></thead>
<tbody>${rows.map(([k, v]) => html`<tr><th scope="row"><code>${k}</code></th><td><code>${v}</code></td></tr>`)}</tbody></table>`;
}

export interface RunSectionOptions {
  /** Folder the report is written to (links are relative to it). */
  report_dir: string;
  buckets?: number;
}

/** One run's article: what it is, its result, the files, the preview, the charts, settings and quality notes. */
export async function renderRunSection(run: RunData, options: RunSectionOptions): Promise<SafeHtml> {
  const r = run.record;
  const links = run.files.map((f) => html`<a href="${relativeHref(options.report_dir, `${run.dir}${sep}${f}`)}">${f}</a>`);
  const status = r.status === 'ok' ? html`<span class="badge badge-ok">done</span>` : html`<span class="badge badge-failed">failed</span>`;
  const charts = r.status === 'ok' ? runChartSpecs(run, { buckets: options.buckets }) : [];
  const figures: SafeHtml[] = [];
  for (const c of charts) figures.push(await chartFigure(c, 'h4'));
  const preview = run.preview_png ? previewDataUri(run.preview_png) : null;
  const notes = qualityNotes(run);
  return html`<article class="run" id="${runAnchor(r.run)}">
<h3>Run ${r.run} ${status}</h3>
<p><span class="dir dir-${r.direction}">${r.direction}</span> · setting ${r.setting === null ? 'none' : `${r.setting}${r.setting_unit ? ` ${r.setting_unit}` : ''}`}${r.group ? html` · group ${r.group}` : ''} · video <code>${r.video}</code></p>
${r.notes ? html`<p>Notes: ${r.notes}</p>` : ''}
${r.status === 'failed' ? html`<p><strong>This run failed:</strong> ${r.error ?? 'no reason recorded'}</p>` : ''}
${run.fit ? resultTable(run.fit) : ''}
${links.length > 0 ? html`<p class="files">Files: ${links}</p>` : ''}
${preview ? html`<figure class="preview"><h4>Preview frame</h4><img src="${preview.uri}" width="${preview.width}" height="${preview.height}" alt="Preview frame of run ${r.run} with the tracked marker"><figcaption>A frame of the video as tracked${preview.width < preview.original_width ? `, shrunk from ${preview.original_width} px wide to ${preview.width} × ${preview.height} px` : ''}.</figcaption></figure>` : ''}
${figures.length > 0 ? html`<div class="charts">${figures}</div>` : ''}
<h4>Data quality</h4>
${notes.length === 0 ? html`<p class="ok-note">No data-quality flags.</p>` : html`<dl class="flags">${notes.map((n) => html`<dt>${n.label}</dt><dd>${n.words}</dd>`)}</dl>`}
${settingsTable(r.settings)}
</article>`;
}
