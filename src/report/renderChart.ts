import type * as Vega from 'vega';
import type { TopLevelSpec } from 'vega-lite';
import { CHART_CONFIG } from './reportStyle.js';

/** Vega and Vega-Lite, loaded on the first chart: they take ≈ 150 ms to import, which every other command would pay. */
let chartLibraries: Promise<{ vega: typeof Vega; compile: typeof import('vega-lite').compile }> | undefined;
function loadChartLibraries(): Promise<{ vega: typeof Vega; compile: typeof import('vega-lite').compile }> {
  chartLibraries ??= Promise.all([import('vega'), import('vega-lite')]).then(([vega, vl]) => ({ vega, compile: vl.compile }));
  return chartLibraries;
}

let chartCounter = 0;
/** Parsed Vega runtimes by chart structure (the spec without its data), so charts that differ only in data compile once. */
const runtimes = new Map<string, Vega.Runtime>();
const MAX_CACHED = 100;

/** Replaces every inline `data: { values }` with a named data set; returns the skeleton and the values by name. */
function separateData(spec: unknown): { skeleton: unknown; datasets: Map<string, unknown[]> } {
  const datasets = new Map<string, unknown[]>();
  const walk = (node: unknown): unknown => {
    if (Array.isArray(node)) return node.map(walk);
    if (node === null || typeof node !== 'object') return node;
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(node)) {
      if (k === 'data' && v !== null && typeof v === 'object' && Array.isArray((v as { values?: unknown }).values)) {
        const name = `inline${datasets.size}`;
        datasets.set(name, (v as { values: unknown[] }).values);
        out[k] = { name };
      } else out[k] = walk(v);
    }
    return out;
  };
  return { skeleton: walk(spec), datasets };
}

/**
 * Compiles a Vega-Lite spec and renders it headless to an SVG string (no browser, no network: data must be inline).
 * Element ids inside the SVG are made unique so many charts can share one HTML page.
 */
export async function renderChart(spec: TopLevelSpec): Promise<string> {
  const { vega, compile } = await loadChartLibraries();
  const { skeleton, datasets } = separateData(spec);
  const key = JSON.stringify(skeleton);
  let runtime = runtimes.get(key);
  if (!runtime) {
    runtime = vega.parse(compile(skeleton as TopLevelSpec, { config: CHART_CONFIG }).spec);
    if (runtimes.size >= MAX_CACHED) runtimes.clear();
    runtimes.set(key, runtime);
  }
  const view = new vega.View(runtime, { renderer: 'none' });
  try {
    for (const [name, values] of datasets) view.data(name, values);
    const svg = await view.toSVG();
    const prefix = `c${++chartCounter}-`;
    return svg
      .replace(/\bid="([^"]+)"/g, `id="${prefix}$1"`)
      .replace(/url\(#([^)]+)\)/g, `url(#${prefix}$1)`)
      // coordinates in attribute values to 1/100 px (text content, e.g. axis labels, is left alone)
      .replace(/="([^"]*)"/g, (_m, v: string) => `="${v.replace(/(\d\.\d\d)\d+/g, '$1')}"`);
  } finally {
    view.finalize();
  }
}
