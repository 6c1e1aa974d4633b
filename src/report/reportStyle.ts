import type { Config } from 'vega-lite';

/**
 * The report's own colours. Forward and reverse are a blue/orange pair that stays distinct under the
 * common colour-vision deficiencies; every chart also separates them by marker shape and line dash.
 */
export const PALETTE = {
  ink: '#1d232b',
  muted: '#5b6573',
  rule: '#c9ced6',
  paper: '#ffffff',
  forward: '#24588f',
  reverse: '#c8651b',
  data: '#3f4b59',
  model: '#b5396f',
  band: '#9fbfdc',
  lost: '#b5396f',
  warn: '#8a4b00',
  warnBg: '#fff4e0',
} as const;

/** Marker shapes by direction (Vega shape names). */
export const SHAPES = { forward: 'circle', reverse: 'triangle-down' } as const;

/** Vega-Lite config shared by every chart: system sans-serif font, quiet axes, our colours. */
export const CHART_CONFIG: Config = {
  // no per-mark ARIA labels: each chart is a figure with a heading and caption, and labels would bloat the file
  aria: false,
  font: 'sans-serif',
  background: PALETTE.paper,
  view: { stroke: null },
  axis: { labelColor: PALETTE.ink, titleColor: PALETTE.ink, domainColor: PALETTE.muted, tickColor: PALETTE.muted, gridColor: '#e6e9ee', labelFontSize: 11, titleFontSize: 12, titleFontWeight: 'normal' },
  legend: { labelColor: PALETTE.ink, titleColor: PALETTE.ink, labelFontSize: 11, titleFontSize: 12, titleFontWeight: 'normal', orient: 'top' },
  title: { color: PALETTE.ink, fontSize: 13, fontWeight: 'normal', anchor: 'start' },
};

/** The report's style sheet, screen and print. */
export const REPORT_CSS = `
:root { color-scheme: light; }
* { box-sizing: border-box; }
body { margin: 0; font: 15px/1.45 system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, sans-serif; color: ${PALETTE.ink}; background: #f4f5f7; }
main { max-width: 1180px; margin: 0 auto; padding: 1.5rem 1.5rem 3rem; background: ${PALETTE.paper}; }
h1 { font-size: 1.7rem; margin: 0 0 .3rem; }
h2 { font-size: 1.3rem; margin: 2.2rem 0 .6rem; padding-bottom: .2rem; border-bottom: 2px solid ${PALETTE.rule}; }
h3 { font-size: 1.1rem; margin: 1.6rem 0 .4rem; }
h4 { font-size: 1rem; margin: 1rem 0 .3rem; }
p, li { max-width: 62rem; }
.meta { color: ${PALETTE.muted}; margin: .2rem 0; }
.meta code, td code { font-size: .9em; word-break: break-all; }
nav.contents ol { columns: 2; margin: .4rem 0; }
.warnings { border-left: 5px solid ${PALETTE.warn}; background: ${PALETTE.warnBg}; padding: .6rem 1rem; margin: 1rem 0; }
.warnings h2 { border: 0; margin: .2rem 0 .4rem; color: ${PALETTE.warn}; }
.warnings ul { margin: 0; padding-left: 1.2rem; }
.ok-note { color: ${PALETTE.muted}; }
table { border-collapse: collapse; margin: .6rem 0 1rem; font-size: .9rem; }
.table-wrap { overflow-x: auto; max-width: 100%; }
table.comparison { width: 100%; font-size: .85rem; }
table.comparison td.num { white-space: normal; }
table.comparison td:last-child { min-width: 10rem; }
caption { text-align: left; font-weight: 600; padding: .3rem 0; }
th, td { border: 1px solid ${PALETTE.rule}; padding: .3rem .5rem; vertical-align: top; text-align: left; }
thead th { background: #eef1f5; }
tbody th { font-weight: 600; background: #f8f9fb; }
td.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
tr.pooled td, tr.pooled th { font-weight: 600; background: #f3f6fa; }
.dir { white-space: nowrap; }
.dir-forward::before { content: "●\\00a0"; color: ${PALETTE.forward}; }
.dir-reverse::before { content: "▼\\00a0"; color: ${PALETTE.reverse}; }
.badge { display: inline-block; padding: 0 .4rem; border-radius: 3px; font-size: .85em; border: 1px solid currentColor; }
.badge-failed { color: #a11d2b; }
.badge-ok { color: #1f6b3a; }
figure { margin: .8rem 0; break-inside: avoid; page-break-inside: avoid; }
figure svg { max-width: 100%; height: auto; display: block; }
figcaption { font-size: .88rem; color: ${PALETTE.muted}; max-width: 62rem; margin-top: .2rem; }
.charts { display: grid; grid-template-columns: repeat(auto-fit, minmax(480px, 1fr)); gap: .4rem 1.2rem; }
.preview img { max-width: 100%; height: auto; border: 1px solid ${PALETTE.rule}; image-rendering: auto; }
article.run { border-top: 1px solid ${PALETTE.rule}; margin-top: 2rem; }
.files a { margin-right: .8rem; }
dl.flags dt { font-weight: 600; }
dl.flags dd { margin: 0 0 .5rem 1rem; }
.methods li { margin-bottom: .3rem; }
footer { color: ${PALETTE.muted}; font-size: .85rem; margin-top: 3rem; }
@media print {
  body { background: #fff; font-size: 10.5pt; }
  main { max-width: none; padding: 0; }
  nav.contents { display: none; }
  h2 { break-after: avoid; page-break-after: avoid; }
  h3, h4 { break-after: avoid; page-break-after: avoid; }
  article.run { break-before: page; page-break-before: always; border: 0; }
  .charts { grid-template-columns: 1fr 1fr; }
  table { font-size: 8.5pt; }
  .table-wrap { overflow: visible; }
  table.comparison td:last-child { min-width: 0; }
  a { color: inherit; text-decoration: none; }
  .files a::after { content: " (" attr(href) ")"; font-size: .8em; }
  tr, figure, table { break-inside: avoid; page-break-inside: avoid; }
}
`;
