import { describe, expect, it } from 'vitest';
import { frameTiming } from '../../src/video/frameTiming.js';

// Hand-worked examples (common practice, no source): a 25 fps grid is 40 ms between frames.
describe('frameTiming', () => {
  it('finds a constant rate on an exact 25 fps grid', () => {
    const t = Array.from({ length: 26 }, (_, i) => i / 25);
    const r = frameTiming(t);
    expect(r.interval_s.median).toBeCloseTo(0.04, 12);
    expect(r.median_fps).toBeCloseTo(25, 9);
    expect(r.variable_frame_rate).toBe(false);
    expect(r.dropped).toEqual({ count: 0, at_s: [] });
    expect(r.duplicated).toEqual({ count: 0, at_s: [] });
  });

  it('counts a gap of three intervals as two dropped frames without calling the rate variable', () => {
    const t = [0, 0.04, 0.08, 0.2, 0.24, 0.28];
    const r = frameTiming(t);
    expect(r.dropped).toEqual({ count: 2, at_s: [0.08] });
    expect(r.variable_frame_rate).toBe(false);
    expect(r.interval_s.max).toBeCloseTo(0.12, 12);
  });

  it('flags jitter, a drop and a near-duplicate', () => {
    // intervals 40, 40, 80, 40, 0.5, 39.5 ms: median 40 ms; 80 ms = one drop; 0.5 ms < 20 ms = duplicate;
    // 39.5 ms is 0.5 ms off the grid, beyond 0.5 % of 40 ms (0.2 ms) = variable rate.
    const r = frameTiming([0, 0.04, 0.08, 0.16, 0.2, 0.2005, 0.24]);
    expect(r.interval_s.median).toBeCloseTo(0.04, 12);
    expect(r.interval_s.min).toBeCloseTo(0.0005, 12);
    expect(r.dropped).toEqual({ count: 1, at_s: [0.08] });
    expect(r.duplicated).toEqual({ count: 1, at_s: [0.2005] });
    expect(r.variable_frame_rate).toBe(true);
  });

  it('treats rounding to a 1 ms time step as constant rate (30000/1001 fps stored in milliseconds)', () => {
    const t = Array.from({ length: 100 }, (_, i) => Math.round((i * 1001) / 30) / 1000);
    expect(frameTiming(t, { tick_s: 0.001 }).variable_frame_rate).toBe(false);
  });
});
