import { stringify } from 'csv-stringify/sync';

/** Per-frame truth of a synthetic clip. */
export interface SynthTruth {
  /** Frame presentation times, seconds. */
  t_s: Float64Array;
  /** Rotor angle in its own plane, degrees CCW as seen, unwrapped. */
  angle_deg: Float64Array;
  /** Rotor rate, deg/s. */
  rate_deg_s: Float64Array;
  /** One entry per marker: its centre in the displayed image, px, and whether a particle overlaps it (1) or not (0). */
  markers: Array<{ x_px: Float64Array; y_px: Float64Array; occluded: Uint8Array }>;
}

/**
 * Column names of truth.csv: frame, t_s, angle_deg, then x_px, y_px for one marker or x1_px, y1_px, x2_px, …
 * for several, then (with particles and at least one marker) `occluded` (1 when any marker has a particle over it) and, for several
 * markers, occluded1, occluded2, …; rate_deg_s last.
 */
export function truthColumns(markerCount: number, withParticles: boolean): string[] {
  const cols = ['frame', 't_s', 'angle_deg'];
  if (markerCount === 1) cols.push('x_px', 'y_px');
  else for (let m = 1; m <= markerCount; m++) cols.push(`x${m}_px`, `y${m}_px`);
  if (withParticles && markerCount > 0) {
    cols.push('occluded');
    if (markerCount > 1) for (let m = 1; m <= markerCount; m++) cols.push(`occluded${m}`);
  }
  cols.push('rate_deg_s');
  return cols;
}

/** Rounds for the table: times to 1e-9 s, angles to 1e-9 deg, positions to 1e-6 px (all far below what any tracker resolves). */
function fixed(v: number, digits: number): string {
  return String(Number(v.toFixed(digits)));
}

/** The truth table as CSV text (header row, one row per frame). */
export function formatTruthCsv(truth: SynthTruth, withParticles: boolean): string {
  const n = truth.t_s.length;
  const rows: string[][] = [];
  for (let f = 0; f < n; f++) {
    const row = [String(f), fixed(truth.t_s[f], 9), fixed(truth.angle_deg[f], 9)];
    for (const m of truth.markers) row.push(fixed(m.x_px[f], 6), fixed(m.y_px[f], 6));
    if (withParticles && truth.markers.length > 0) {
      row.push(truth.markers.some((m) => m.occluded[f] === 1) ? '1' : '0');
      if (truth.markers.length > 1) for (const m of truth.markers) row.push(String(m.occluded[f]));
    }
    row.push(fixed(truth.rate_deg_s[f], 9));
    rows.push(row);
  }
  return stringify(rows, { header: true, columns: truthColumns(truth.markers.length, withParticles) });
}
