// runChartSpecs: the per-run marker-path chart draws one fitted ellipse per marker.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { RunData } from '../../src/report/ReportData.js';
import { runChartSpecs } from '../../src/report/runCharts.js';
import { loadFirstTestRun } from './writeTestBatch.js';

let run: RunData;
let remove: () => Promise<void>;
beforeAll(async () => {
  ({ run, remove } = await loadFirstTestRun('runcharts'));
});
afterAll(async () => {
  await remove();
});

/** The ellipse layer of the path chart: its points grouped by marker, each as distances from the centre along the major axis. */
function ellipsesOf(data: RunData): Map<number, { x: number; y: number }[]> {
  const path = runChartSpecs(data).find((c) => c.id === 'path')!;
  const layers = (path.spec as unknown as { layer: { data: { values: { x: number; y: number; k?: number; m?: number }[] } }[] }).layer;
  const line = layers.find((l) => l.data.values.length > 0 && l.data.values[0]!.k !== undefined)!;
  const out = new Map<number, { x: number; y: number }[]>();
  for (const p of line.data.values) out.set(p.m!, [...(out.get(p.m!) ?? []), { x: p.x, y: p.y }]);
  return out;
}

describe('runChartSpecs, marker path', () => {
  it('promises an ellipse only when one was fitted (a given centre without a view draws none)', () => {
    const path = (d: RunData) => runChartSpecs(d).find((c) => c.id === 'path')!;
    expect(path(run).title).toBe('Marker path, fitted ellipse and centre');
    const noView: RunData = { ...run, track: { ...run.track!, view: null } };
    expect(path(noView).title).toBe('Marker path and centre');
    expect(path(noView).caption).not.toMatch(/ellipse/);
    // a view assumed square-on (a short sweep about a given centre) has no size: nothing drawn, nothing promised
    const unsized: RunData = { ...run, track: { ...run.track!, view: { ...run.track!.view!, semi_major_px: Number.NaN, semi_minor_px: Number.NaN } } };
    expect(path(unsized).title).toBe('Marker path and centre');
    expect(path(unsized).caption).not.toMatch(/ellipse/);
  });

  // The test batch's view: centre (120, 110), semi-axes 60 × 45 px, major axis along x (axis ratio 0.75).
  it('draws the fitted ellipse of a single marker', () => {
    const e = ellipsesOf(run);
    expect([...e.keys()]).toEqual([0]);
    const xs = e.get(0)!.map((p) => p.x);
    expect(Math.max(...xs) - 120).toBeCloseTo(60, 6); // semi-major along x
  });

  it('draws one ellipse per marker, each at its own size with the shared shape', () => {
    const withMarkers: RunData = { ...run, track: { ...run.track!, markers: { count: 2, found_frames: [10, 10], all_found_frames: 10, first_all_found_frame: 0, phase_offset_deg: [0, 180], semi_major_px: [60, 40] } } };
    const e = ellipsesOf(withMarkers);
    expect([...e.keys()].sort()).toEqual([0, 1]);
    const second = e.get(1)!;
    expect(Math.max(...second.map((p) => p.x)) - 120).toBeCloseTo(40, 6);
    expect(Math.max(...second.map((p) => p.y)) - 110).toBeCloseTo(40 * 0.75, 6); // semi-minor = 40 × axis ratio (y down)
  });
});
