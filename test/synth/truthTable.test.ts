import { describe, expect, it } from 'vitest';
import { parse } from 'csv-parse/sync';
import { formatTruthCsv, truthColumns } from '../../src/synth/truthTable.js';

describe('truth table columns', () => {
  it('names one marker x_px, y_px and several x1_px, y1_px, …; occluded only with particles and markers', () => {
    expect(truthColumns(1, false)).toEqual(['frame', 't_s', 'angle_deg', 'x_px', 'y_px', 'rate_deg_s']);
    expect(truthColumns(1, true)).toEqual(['frame', 't_s', 'angle_deg', 'x_px', 'y_px', 'occluded', 'rate_deg_s']);
    expect(truthColumns(2, true)).toEqual(['frame', 't_s', 'angle_deg', 'x1_px', 'y1_px', 'x2_px', 'y2_px', 'occluded', 'occluded1', 'occluded2', 'rate_deg_s']);
    expect(truthColumns(0, true)).toEqual(['frame', 't_s', 'angle_deg', 'rate_deg_s']);
  });

  it('writes one row per frame that csv-parse reads back to the same numbers', () => {
    const truth = {
      t_s: Float64Array.from([0, 1 / 30]),
      angle_deg: Float64Array.from([0, -0.123456789]),
      rate_deg_s: Float64Array.from([-3.7, -3.7]),
      markers: [
        { x_px: Float64Array.from([240, 239.9]), y_px: Float64Array.from([120, 120.25]), occluded: Uint8Array.from([0, 1]) },
        { x_px: Float64Array.from([80, 80.1]), y_px: Float64Array.from([120, 119.75]), occluded: Uint8Array.from([0, 0]) },
      ],
    };
    const rows = parse(formatTruthCsv(truth, true), { columns: true, cast: true }) as Array<Record<string, number>>;
    expect(rows).toEqual([
      { frame: 0, t_s: 0, angle_deg: 0, x1_px: 240, y1_px: 120, x2_px: 80, y2_px: 120, occluded: 0, occluded1: 0, occluded2: 0, rate_deg_s: -3.7 },
      { frame: 1, t_s: 0.033333333, angle_deg: -0.123456789, x1_px: 239.9, y1_px: 120.25, x2_px: 80.1, y2_px: 119.75, occluded: 1, occluded1: 1, occluded2: 0, rate_deg_s: -3.7 },
    ]);
  });
});
