import { describe, expect, it } from 'vitest';
import { combineMarkerAngles } from '../../src/track/combineMarkerAngles.js';
import { wrapDeg } from '../../src/track/rotorPlaneAngle.js';

// Truth: angles built here from a known rotation (a rigid hub: every marker turns by the same amount), wrapped
// to (−180, 180] as a tracker reports them; the combined angle must read the first marker's unwrapped angle.

describe('combineMarkerAngles', () => {
  const n = 40;
  const t_s = Float64Array.from({ length: n }, (_, i) => i / 30);
  const rate = 600; // deg/s: 20° per frame, several wraps
  const hub = Float64Array.from(t_s, (t) => 10 + rate * t);

  it('subtracts each marker’s phase offset and averages, so the result is the first marker’s angle', () => {
    const m1 = Float64Array.from(hub, (a) => wrapDeg(a + 0.2));
    const m2 = Float64Array.from(hub, (a) => wrapDeg(a + 180 - 0.2));
    const c = combineMarkerAngles(t_s, [m1, m2]);
    expect(c.first_all_index).toBe(0);
    expect(c.all_found_frames).toBe(n);
    expect(c.phase_offset_deg[0]).toBe(0);
    expect(c.phase_offset_deg[1]).toBeCloseTo(179.6, 9);
    for (let i = 0; i < n; i++) expect(wrapDeg(c.wrapped_deg[i] - (hub[i] + 0.2))).toBeCloseTo(0, 9);
  });

  it('a frame with one marker lost keeps the other’s angle; a frame with none is lost', () => {
    const m1 = Float64Array.from(hub, (a) => wrapDeg(a));
    const m2 = Float64Array.from(hub, (a) => wrapDeg(a + 120));
    const m3 = Float64Array.from(hub, (a) => wrapDeg(a - 120));
    m1[0] = Number.NaN; // the first marker is missing at the start: offsets come from the first all-found frame
    m1[10] = Number.NaN;
    m2[20] = Number.NaN;
    m1[30] = m2[30] = m3[30] = Number.NaN;
    const c = combineMarkerAngles(t_s, [m1, m2, m3]);
    expect(c.first_all_index).toBe(1);
    expect(Array.from(c.found.slice(9, 12))).toEqual([3, 2, 3]);
    expect(c.found[30]).toBe(0);
    expect(c.wrapped_deg[30]).toBeNaN();
    for (const i of [0, 10, 20, 25]) expect(wrapDeg(c.wrapped_deg[i] - hub[i])).toBeCloseTo(0, 9);
  });

  it('loses a frame where two markers disagree (one took a particle) and keeps the phase offset from the others', () => {
    // marker 2 sits 180° from marker 1 except in frames 10–17, where its follower is on a particle 40° off
    const m1 = Float64Array.from(hub, (a, i) => wrapDeg(a + 0.3 * Math.sin(i)));
    const m2 = Float64Array.from(hub, (a, i) => wrapDeg(a + 180 + (i >= 10 && i < 18 ? 40 : 0) + 0.3 * Math.cos(i)));
    const c = combineMarkerAngles(t_s, [m1, m2]);
    // the median offset ignores the eight bad frames (a mean would be pulled by 8 × 40 / 40 = 8°)
    expect(Math.abs(wrapDeg(c.phase_offset_deg[1] - 180))).toBeLessThan(0.5);
    expect(Array.from(c.disagree).map((v, i) => (v ? i : -1)).filter((i) => i >= 0)).toEqual([10, 11, 12, 13, 14, 15, 16, 17]);
    for (let i = 10; i < 18; i++) expect(c.wrapped_deg[i]).toBeNaN();
    for (const i of [0, 9, 18, 39]) expect(Math.abs(wrapDeg(c.wrapped_deg[i] - hub[i]))).toBeLessThan(0.5);
  });

  it('with three markers leaves out the one far from the others and keeps the frame', () => {
    const m1 = Float64Array.from(hub, (a) => wrapDeg(a));
    const m2 = Float64Array.from(hub, (a) => wrapDeg(a + 120));
    const m3 = Float64Array.from(hub, (a, i) => wrapDeg(a - 120 + (i === 25 ? 30 : 0)));
    const c = combineMarkerAngles(t_s, [m1, m2, m3]);
    expect(c.disagree[25]).toBe(0);
    expect(wrapDeg(c.wrapped_deg[25] - hub[25])).toBeCloseTo(0, 9);
  });
});
