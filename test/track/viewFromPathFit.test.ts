// viewFromPathFit: the camera view from a fitted marker path. A circle seen at tilt θ projects to an ellipse
// of axis ratio cos θ (orthographic projection; common practice, no source).
import { describe, expect, it } from 'vitest';
import { viewFromPathFit, viewWithoutPathFit } from '../../src/track/viewFromPathFit.js';

const ellipse = (ratio: number) => ({ cx_px: 320, cy_px: 240, semi_major_px: 100, semi_minor_px: 100 * ratio, major_axis_deg: 30 });
const fit = (ratio: number, se: number) => ({
  ellipse: ellipse(ratio),
  axis_ratio: ratio,
  se: { cx_px: 0.1, cy_px: 0.1, axis_ratio: se },
  ci95: { cx_px: [319.8, 320.2] as [number, number], cy_px: [239.8, 240.2] as [number, number], axis_ratio: [ratio - 2 * se, Math.min(1, ratio + 2 * se)] as [number, number] },
});
const deg = (r: number) => (Math.acos(r) * 180) / Math.PI;

describe('viewFromPathFit', () => {
  it('corrects a clearly oblique view: ratio cos 35°, tilt 35° with an interval around it', () => {
    const r = Math.cos((35 * Math.PI) / 180);
    const v = viewFromPathFit(fit(r, 0.004), { centre: null });
    expect(v.view.axis_ratio).toBeCloseTo(r, 12);
    expect(v.view_summary.corrected).toBe(true);
    expect(v.view_summary.tilt_deg.value).toBeCloseTo(35, 9);
    expect(v.view_summary.tilt_deg.ci[0]).toBeCloseTo(deg(r + 0.008), 9);
    expect(v.view_summary.tilt_deg.ci[1]).toBeCloseTo(deg(r - 0.008), 9);
    expect(v.centre_summary.source).toBe('ellipse-fit');
  });

  it('takes a path not distinguishable from a circle as square-on, and lets the tilt interval reach 0°', () => {
    const v = viewFromPathFit(fit(0.997, 0.003), { centre: null });
    expect(v.view.axis_ratio).toBe(1);
    expect(v.view_summary.corrected).toBe(false);
    expect(v.view_summary.tilt_deg.value).toBeCloseTo(deg(0.997), 9);
    expect(v.view_summary.tilt_deg.ci[0]).toBe(0);
  });

  it('uses a given tilt and a given centre as given (zero standard error)', () => {
    const v = viewFromPathFit(fit(0.997, 0.003), { centre: { x_px: 321, y_px: 239 }, tilt_deg: 20, tilt_axis_deg: 90 });
    expect(v.view.axis_ratio).toBeCloseTo(Math.cos((20 * Math.PI) / 180), 12);
    expect(v.view.major_axis_deg).toBe(90);
    expect(v.view_summary.tilt_deg).toEqual({ value: 20, se: 0, ci: [20, 20], level: 0.95 });
    expect(v.centre_summary).toEqual({ x_px: { value: 321, se: 0, ci: [321, 321], level: 0.95 }, y_px: { value: 239, se: 0, ci: [239, 239], level: 0.95 }, source: 'given' });
  });
});

describe('viewWithoutPathFit', () => {
  it('assumes square-on about the given centre and says so when no tilt is given', () => {
    const warnings: string[] = [];
    const v = viewWithoutPathFit(100, 80, { centre: { x_px: 100, y_px: 80 } }, 42, 'The marker', warnings);
    expect(v.view).toEqual({ cx_px: 100, cy_px: 80, axis_ratio: 1, major_axis_deg: 0 });
    expect(warnings).toEqual(['The marker swept only 42° about --center, too little to measure the view; angles assume a square-on camera (give the tilt in degrees with --tilt if it is not).']);
  });
});
