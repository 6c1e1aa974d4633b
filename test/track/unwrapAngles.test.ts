import { describe, expect, it } from 'vitest';
import { unwrapAngles } from '../../src/track/unwrapAngles.js';
import { rotorPlaneAngle, wrapDeg } from '../../src/track/rotorPlaneAngle.js';
import { arcCoverage } from '../../src/track/arcCoverage.js';

const wrapAll = (a: number[]) => Float64Array.from(a, wrapDeg);

// Truth: angle series and points built here in closed form (uniform rotation, plane geometry; common practice,
// no source); the code under test only sees them wrapped or projected.

describe('unwrapAngles', () => {
  it('follows a steady rotation of 50° per frame through many turns', () => {
    const n = 100;
    const t = Float64Array.from({ length: n }, (_, i) => i / 30);
    const truth = Array.from({ length: n }, (_, i) => 10 + 50 * i);
    const r = unwrapAngles(t, wrapAll(truth));
    for (let i = 0; i < n; i++) expect(r.angle_deg[i]).toBeCloseTo(truth[i], 9);
    expect(r.splits).toEqual([]);
  });

  it('carries the count across a short gap using the recent rate', () => {
    const n = 120;
    const t = Float64Array.from({ length: n }, (_, i) => i / 60);
    const truth = Array.from({ length: n }, (_, i) => -720 * t[i]); // −720°/s, 12° per frame
    const w = wrapAll(truth);
    for (let i = 50; i < 60; i++) w[i] = Number.NaN; // 10 frames lost = 120° unseen
    const r = unwrapAngles(t, w);
    expect(r.splits).toEqual([]);
    for (let i = 60; i < n; i++) expect(r.angle_deg[i]).toBeCloseTo(truth[i], 9);
    expect(Number.isNaN(r.angle_deg[55])).toBe(true);
  });

  it('splits when a gap is too long to count the turns', () => {
    const n = 300;
    const t = Float64Array.from({ length: n }, (_, i) => i / 30);
    const truth = Array.from({ length: n }, (_, i) => 90 * t[i]);
    const w = wrapAll(truth);
    for (let i = 60; i < 200; i++) w[i] = Number.NaN; // 4.7 s gap at 90°/s: 25 % rate allowance → ±105° > 90°
    const r = unwrapAngles(t, w);
    expect(r.splits.length).toBe(1);
    expect(r.splits[0].after_index).toBe(59);
    expect(r.splits[0].gap_s).toBeCloseTo(141 / 30, 9);
  });

  it('splits (and still counts the turns right) when the rotor spins up from rest while the marker is lost', () => {
    // Spin-up from rest in closed form, θ = ω∞[(t − t0) − τ(1 − e^(−(t − t0)/τ))] (first-order response; common practice,
    // no source): at rest until 0.5 s, then towards 1440°/s with τ = 0.4 s, filmed at 30 fps; frames 16–30 lost.
    // Before the gap the rate is 0, after it ≈ 1150°/s: a rule that looks only at the rate before would see no
    // uncertainty, keep the series whole and (as it did) count one turn too few.
    const n = 60;
    const t = Float64Array.from({ length: n }, (_, i) => i / 30);
    const truth = Array.from(t, (ti) => (ti <= 0.5 ? 0 : 1440 * (ti - 0.5 - 0.4 * (1 - Math.exp(-(ti - 0.5) / 0.4)))));
    const w = wrapAll(truth);
    for (let i = 16; i <= 30; i++) w[i] = Number.NaN;
    const r = unwrapAngles(t, w);
    expect(r.splits.length).toBe(1);
    expect(r.splits[0].after_index).toBe(15);
    // the best guess uses the mean of the rates before and after the gap (343.8° turned; 0°/s alone would guess 0°)
    for (let i = 31; i < n; i++) expect(r.angle_deg[i]).toBeCloseTo(truth[i], 6);
  });

  it('keeps the series whole when the rotor starts during a short gap and the turn count is plain', () => {
    // at rest, 3 frames lost, then turning at 60°/s (2° per frame): the rotation over the gap is a few degrees either way
    const n = 40;
    const t = Float64Array.from({ length: n }, (_, i) => i / 30);
    const truth = Array.from(t, (ti) => 25 + (ti <= 0.4 ? 0 : 60 * (ti - 0.4)));
    const w = wrapAll(truth);
    for (let i = 12; i <= 14; i++) w[i] = Number.NaN;
    const r = unwrapAngles(t, w);
    expect(r.splits).toEqual([]);
    for (let i = 15; i < n; i++) expect(r.angle_deg[i]).toBeCloseTo(truth[i], 9);
  });

  it('reports the per-frame step for the aliasing check', () => {
    const t = Float64Array.from([0, 1, 2, 3]);
    const r = unwrapAngles(t, wrapAll([0, 70, 140, 210]));
    expect(Array.from(r.step_deg)).toEqual([70, 70, 70]);
  });
});

describe('rotorPlaneAngle', () => {
  it('is the counterclockwise polar angle as displayed (image y down) for a square-on view', () => {
    const view = { cx_px: 100, cy_px: 100, axis_ratio: 1, major_axis_deg: 0 };
    expect(rotorPlaneAngle(150, 100, view)).toBeCloseTo(0, 12);
    expect(rotorPlaneAngle(100, 50, view)).toBeCloseTo(90, 12); // above the centre on screen
    expect(rotorPlaneAngle(50, 100, view)).toBeCloseTo(180, 12);
    expect(rotorPlaneAngle(100, 150, view)).toBeCloseTo(-90, 12);
  });

  it('undoes the foreshortening of a tilted view', () => {
    // Circle of radius 100 tilted 35° about the image x axis: y extent shrinks by cos 35°
    const ratio = Math.cos((35 * Math.PI) / 180);
    const view = { cx_px: 0, cy_px: 0, axis_ratio: ratio, major_axis_deg: 0 };
    for (const deg of [10, 45, 100, 200, 300]) {
      const th = (deg * Math.PI) / 180;
      const x = 100 * Math.cos(th);
      const y = -100 * ratio * Math.sin(th);
      expect(wrapDeg(rotorPlaneAngle(x, y, view) - deg)).toBeCloseTo(0, 9);
    }
  });

  it('handles a major axis that is not horizontal', () => {
    const phi = (30 * Math.PI) / 180;
    const view = { cx_px: 0, cy_px: 0, axis_ratio: 0.5, major_axis_deg: 30 };
    // the point at rotor angle 90° relative to the major axis lies on the minor axis at half radius
    const x = 50 * Math.cos(phi + Math.PI / 2);
    const y = -50 * Math.sin(phi + Math.PI / 2);
    expect(rotorPlaneAngle(x, y, view)).toBeCloseTo(120, 9);
  });
});

describe('arcCoverage', () => {
  it('measures the swept arc', () => {
    const a = Array.from({ length: 31 }, (_, i) => (i * 3 * Math.PI) / 180); // 0..90°
    const x = a.map((v) => Math.cos(v));
    const y = a.map((v) => -Math.sin(v));
    expect(arcCoverage(x, y, 0, 0)).toBeCloseTo(90, 9);
  });
});
