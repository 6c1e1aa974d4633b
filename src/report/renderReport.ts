import { basename } from 'node:path';
import { buildComparison } from './buildComparison.js';
import { comparisonChartSpecs } from './comparisonCharts.js';
import { html, trusted, type SafeHtml } from './escapeHtml.js';
import { formatFixed, formatRate, modelLabel } from './formatQuantity.js';
import { qualityNotes } from './qualityNotes.js';
import { REPORT_CSS } from './reportStyle.js';
import type { ReportData } from './ReportData.js';
import { comparisonTables, runAnchor } from './renderComparisonSection.js';
import { chartFigure, renderRunSection } from './renderRunSection.js';
import { leftOutWords } from '../batch/leftOutWords.js';
import { sameVideoRuns } from './sameVideoRuns.js';

export interface RenderOptions {
  /** Report title; default names the manifest (or the batch folder). */
  title?: string;
  /** Folder the HTML will be written to (links to run files are relative to it); default the batch folder. */
  report_dir?: string;
  /** Confidence level for the comparison; default the runs' own level. */
  level?: number;
  /** Equivalence margin for "reverse does not turn", deg/s; default the margin the runs were fitted with. */
  margin_deg_s?: number | null;
  /** Buckets for thinning long series, default 240. */
  buckets?: number;
}

function when(iso: string): string {
  return iso.replace('T', ' ').replace(/:\d\d(\.\d+)?Z$/, ' UTC');
}

/** Renders the whole report to one self-contained HTML string: no scripts, fonts or styles from elsewhere. */
export async function renderReport(data: ReportData, options: RenderOptions = {}): Promise<string> {
  const source = data.manifests.length === 1 ? basename(data.manifests[0]!.path).replace(/\.[^.]*$/, '') : basename(data.out_dir);
  const title = options.title ?? `${source}: forward and reverse runs compared`;
  const reportDir = options.report_dir ?? data.out_dir;
  const summary = buildComparison(data.runs, { level: options.level, margin_deg_s: options.margin_deg_s });
  const ok = data.runs.filter((r) => r.record.status === 'ok').length;
  const failed = data.runs.length - ok;
  const level = Math.round(summary.level * 100);

  const warnings: SafeHtml[] = [];
  for (const r of data.runs) if (r.record.status === 'failed') warnings.push(html`<li>Run <a href="#${runAnchor(r.record.run)}">${r.record.run}</a> failed: ${r.record.error ?? 'no reason recorded'}</li>`);
  for (const u of data.unreadable) warnings.push(html`<li>Run folder ${u.run} has a run.json that could not be read (${u.reason}); it is left out.</li>`);
  for (const group of sameVideoRuns(data.runs.map((r) => r.record))) {
    warnings.push(html`<li>Runs ${group.join(', ')} measured the same video (identical content) over the same window; the comparison counts that one recording ${group.length} times. Remove the copies from the manifest.</li>`);
  }
  if (data.left_out.length > 0) warnings.push(html`<li>The output folder also holds ${leftOutWords(data.left_out)}, not in this batch's manifest; left out of this report and summary.csv (delete those folders if they are stale).</li>`);
  const runSections: SafeHtml[] = [];
  for (const r of data.runs) {
    try {
      if (r.record.status === 'ok') for (const n of qualityNotes(r).filter((q) => q.serious)) warnings.push(html`<li>Run <a href="#${runAnchor(r.record.run)}">${r.record.run}</a> (${n.label}): ${n.words}</li>`);
      runSections.push(await renderRunSection(r, { report_dir: reportDir, buckets: options.buckets }));
    } catch (err) {
      // one malformed run file must not cost the whole report
      const why = err instanceof Error ? err.message : String(err);
      warnings.push(html`<li>Run <a href="#${runAnchor(r.record.run)}">${r.record.run}</a>: its section could not be drawn (${why}); check its files.</li>`);
      runSections.push(html`<article class="run" id="${runAnchor(r.record.run)}"><h3>Run ${r.record.run}</h3><p>This run’s section could not be drawn: ${why}.</p></article>`);
    }
  }
  for (const e of summary.excluded) warnings.push(html`<li>Run <a href="#${runAnchor(e.run)}">${e.run}</a> is not in the comparison: ${e.reason}.</li>`);
  for (const s of summary.settings) for (const n of s.notes) if (/No (forward|reverse) run/.test(n)) warnings.push(html`<li>${s.group ? `${s.group}, ` : ''}setting ${s.setting ?? 'none'} ${s.setting_unit}: ${n}</li>`);
  const versions = [...new Set(data.runs.map((r) => r.record.software.version))].sort();
  if (versions.length > 1) warnings.push(html`<li>The runs were made with different revtrace versions (${versions.join(', ')}).</li>`);

  const comparisonFigures: SafeHtml[] = [];
  const trendFigures: SafeHtml[] = [];
  for (const c of comparisonChartSpecs(summary)) (c.id === 'powerlaw' ? trendFigures : comparisonFigures).push(await chartFigure(c, 'h3'));
  const tables = comparisonTables(summary);

  const runRows = data.runs.map((r) => {
    const f = r.fit;
    const est = f?.steady?.rate_deg_s ?? f?.spinup?.terminal_rate_deg_s ?? f?.spindown?.initial_rate_deg_s ?? null;
    const fr = est ? formatRate(est.value, est.ci, est.se) : null;
    const lost = r.record.lost_share ?? f?.diagnostics.lost_share ?? null;
    return html`<tr><th scope="row"><a href="#${runAnchor(r.record.run)}">${r.record.run}</a></th><td><span class="dir dir-${r.record.direction}">${r.record.direction}</span></td><td class="num">${r.record.setting === null ? '—' : `${r.record.setting} ${r.record.setting_unit}`}</td><td>${r.record.status === 'ok' ? 'done' : 'failed'}</td><td>${f ? modelLabel(f.model) : '—'}</td><td class="num">${fr?.deg_s ?? '—'}</td><td class="num">${fr?.rpm ?? '—'}</td><td class="num">${lost === null ? '—' : `${formatFixed(100 * lost, 1)}%`}</td></tr>`;
  });


  const marginText = summary.margin_deg_s === null ? 'No equivalence margin was given, so "equivalent to zero" is not tested.' : `Equivalence margin ±${summary.margin_deg_s} deg/s (${summary.margin_source}).`;
  const doc = html`<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta http-equiv="Content-Security-Policy" content="default-src 'none'; img-src data:; style-src 'unsafe-inline'">
<meta name="generator" content="${data.software.name} ${data.software.version}">
<title>${title}</title>
<style>${trusted(REPORT_CSS)}</style>
</head>
<body>
<main>
<header>
<h1>${title}</h1>
<p class="meta">Made ${when(data.generated_at)} by ${data.software.name} ${data.software.version} from <code>${data.out_dir}</code>.</p>
${data.manifests.length === 0 ? html`<p class="meta">Manifest: not recorded in the run files.</p>` : data.manifests.map((m) => html`<p class="meta">Manifest: <code>${m.path}</code> (SHA-256 <code>${m.sha256.slice(0, 16)}…</code>)</p>`)}
<p class="meta">Runs: <strong>${data.runs.length}</strong> — ${ok} done, ${failed} failed${data.unreadable.length > 0 ? `, ${data.unreadable.length} unreadable` : ''}.</p>
</header>
<section class="warnings" aria-labelledby="warnings-heading">
<h2 id="warnings-heading">Warnings</h2>
${warnings.length === 0 ? html`<p>None: every run finished and no data-quality flag needs attention.</p>` : html`<ul>${warnings}</ul>`}
</section>
<nav class="contents" aria-label="Contents"><h2>Contents</h2><ol>
<li><a href="#comparison">Forward and reverse compared</a></li>
<li><a href="#trend">Rate against setting</a></li>
<li><a href="#runs">Runs</a></li>
<li><a href="#methods">Methods</a></li>
</ol></nav>
<section id="comparison" aria-labelledby="comparison-heading">
<h2 id="comparison-heading">Forward and reverse compared</h2>
${summary.settings.length === 0 ? html`<p>No run has a rate to compare yet.</p>` : html`${comparisonFigures}${tables.comparison}${tables.replicates}`}
<p>${marginText} Rates are counterclockwise positive as seen in the video; 1 rpm = 6 deg/s.</p>
</section>
<section id="trend" aria-labelledby="trend-heading">
<h2 id="trend-heading">Rate against setting</h2>
${trendFigures}
${tables.trends}
</section>
<section id="runs" aria-labelledby="runs-heading">
<h2 id="runs-heading">Runs</h2>
<table class="runs"><caption>All runs (rates with ${level}% intervals)</caption>
<thead><tr><th scope="col">Run</th><th scope="col">Direction</th><th scope="col">Setting</th><th scope="col">Status</th><th scope="col">Model</th><th scope="col">Rate (deg/s)</th><th scope="col">Rate (rpm)</th><th scope="col">Lost frames</th></tr></thead>
<tbody>${runRows}</tbody></table>
${runSections}
</section>
<section id="methods" aria-labelledby="methods-heading" class="methods">
<h2 id="methods-heading">Methods</h2>
<ul>
<li>Each run’s rate is its steady rate, or for a spin-up its terminal rate, with the interval of its own fit (method stated under each run). Coast-down runs are shown but not compared.</li>
<li>Replicate runs at one setting and direction are pooled by random-effects meta-analysis: the between-run variance τ² is the DerSimonian–Laird (1986) moment estimate, weights are 1/(se² + τ²), and the interval uses the Hartung–Knapp variance with Student’s t on k − 1 degrees of freedom, never narrower than DerSimonian–Laird’s. So the spread between runs is part of every pooled interval; a single run keeps its own interval.</li>
<li>The reverse/forward ratio has Fieller’s (1954) interval (t at the smaller of the two degrees of freedom); the delta-method standard error is shown beside it. When forward is not clearly different from zero the Fieller set is unbounded and is reported as such.</li>
<li>“p, reverse turns opposite to forward” is the one-sided p-value of a t test that the pooled reverse rate has the opposite sign of the forward rate (null hypothesis: same sign or zero).</li>
<li>“Equivalent to zero” uses two one-sided tests (Schuirmann 1987) at α = ${(1 - summary.level).toFixed(2)} against ±margin. The smallest detectable rate is (t₁₋α/₂ + t₀.₈)·se: the |rate| a two-sided test at α would find with 80% power.</li>
<li>The power law |rate| = a·setting^b is fitted per direction by ordinary least squares of ln|rate| on ln(setting), one point per run; the exponent’s interval is Student’s t on n − 2 degrees of freedom.</li>
<li>Long series are drawn thinned: each time bin keeps its lowest and highest value in time order, so spikes and dips stay visible; lost frames break the line. Charts are drawn with Vega-Lite when the report is made.</li>
</ul>
</section>
<footer><p>${data.software.name} ${data.software.version}. This file is self-contained and works offline; links to run files are relative to it.</p></footer>
</main>
</body>
</html>
`;
  return doc.value;
}
