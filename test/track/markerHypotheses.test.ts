import { describe, expect, it } from 'vitest';
import { findSpots } from '../../src/track/findSpots.js';
import { circularPathScore, firstCandidates, pickMarkerTrack, pickMarkerTrackWithNote } from '../../src/track/markerHypotheses.js';
import { MarkerPathStore } from '../../src/track/MarkerPathStore.js';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { renderClip } from '../../src/synth/renderClip.js';
import { trackVideo } from '../../src/track/trackVideo.js';
import { offCircle, rotorPlaneRadius } from '../../src/track/pathCheck.js';

// Truth: exact geometry of points we place ourselves (a circle, an ellipse, a straight line), and a drawn
// image whose spots we know; common practice, no source.

/** Points every step_deg on a circle of radius r about (cx, cy), image y down, n points from angle a0. */
function arc(cx: number, cy: number, r: number, a0_deg: number, step_deg: number, n: number): { x: Float64Array; y: Float64Array } {
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const a = ((a0_deg + i * step_deg) * Math.PI) / 180;
    x[i] = cx + r * Math.cos(a);
    y[i] = cy - r * Math.sin(a);
  }
  return { x, y };
}

/** n points on a straight line from (x0, y0), step (dx, dy) px, with a deterministic ±0.1 px jitter like a measured centroid's. */
function line(x0: number, y0: number, dx: number, dy: number, n: number): { x: Float64Array; y: Float64Array } {
  return {
    x: Float64Array.from({ length: n }, (_, i) => x0 + i * dx + 0.1 * Math.sin(1.7 * i)),
    y: Float64Array.from({ length: n }, (_, i) => y0 + i * dy + 0.1 * Math.cos(2.3 * i)),
  };
}

describe('circularPathScore', () => {
  it('a marker going 1.5 turns round the centre scores its count of points; a straight drift scores far less, with or without the centre', () => {
    const marker = arc(160, 120, 81, 0, 5, 90);
    const drift = line(200, 40, 2, 2.2, 90);
    for (const centre of [{ x_px: 160, y_px: 120 }, null]) {
      expect(circularPathScore(marker.x, marker.y, centre)).toBe(90);
      expect(circularPathScore(drift.x, drift.y, centre)).toBeLessThan(0.5 * 90);
    }
    // without a centre the circle through a straight path lies far outside it
    expect(circularPathScore(drift.x, drift.y, null)).toBe(0);
  });

  it('a still spot scores nothing without a centre, but about a given centre counts like a marker at rest; lost frames (NaN) are skipped', () => {
    // a spot at (79, 39) with ±0.3 px jitter: without a centre its "circle" means nothing; about the centre
    // (160, 120) it keeps its distance (114.6 px) like the marker of a rotor at rest, and a particle drifting past does not
    const n = 60;
    const x = Float64Array.from({ length: n }, (_, i) => 79 + 0.3 * Math.cos(2.1 * i));
    const y = Float64Array.from({ length: n }, (_, i) => 39 + 0.3 * Math.sin(3.7 * i));
    expect(circularPathScore(x, y, null)).toBe(0);
    expect(circularPathScore(x, y, { x_px: 160, y_px: 120 })).toBe(60);
    const drift = line(60, 80, 2, 0, 60);
    expect(circularPathScore(drift.x, drift.y, { x_px: 160, y_px: 120 })).toBeLessThan(30);
    const marker = arc(160, 120, 81, 0, 5, 90);
    for (let i = 0; i < 90; i += 3) marker.x[i] = NaN;
    expect(circularPathScore(marker.x, marker.y, { x_px: 160, y_px: 120 })).toBe(60);
  });
});

/** A store of candidate tracks, one per list of points (NaN = lost). */
function storeOf(tracks: { x: ArrayLike<number>; y: ArrayLike<number> }[]): MarkerPathStore {
  const store = new MarkerPathStore(tracks.length);
  for (let i = 0; i < tracks[0]!.x.length; i++) {
    const at = tracks.map((t) => ({ x_px: t.x[i]!, y_px: t.y[i]! }));
    store.push(at.map((p) => ({ ...p, quality: Number.isFinite(p.x_px) ? 1 : 0, flag: Number.isFinite(p.x_px) ? '' : 'lost:no-blob' })), at, at);
  }
  return store;
}
const still = (x: number, y: number, n: number) => ({ x: new Float64Array(n).fill(x), y: new Float64Array(n).fill(y) });

describe('pickMarkerTrack about a given centre', () => {
  const centre = { x_px: 160, y_px: 120 };

  it('prefers the spot that goes round over a still pattern that keeps its distance as well (and lost no frame)', () => {
    const turning = arc(160, 120, 81, 0, 12, 90);
    turning.x[40] = turning.y[40] = Number.NaN; // the marker blurred out in two frames
    turning.x[41] = turning.y[41] = Number.NaN;
    expect(pickMarkerTrack(storeOf([still(29, 22, 90), turning]), centre)).toBe(1);
  });

  it('with a hub at rest (nothing goes round), takes the still spot nearest the centre, and says so', () => {
    const pick = pickMarkerTrackWithNote(storeOf([still(29, 22, 60), still(241, 120, 60)]), centre);
    expect(pick.index).toBe(1);
    expect(pick.note).toBe('2 spots kept still at a steady distance from --center, and the one nearest it (81 px) was taken for the marker; if the rotor may have turned, check in preview.png that this is the marker before reading its rate');
    expect(pickMarkerTrackWithNote(storeOf([still(241, 120, 60)]), centre).note).toBeNull(); // one spot: nothing to choose
  });

  it('keeps the far better score: a spot that scores under 0.9 of the best is not taken for moving more', () => {
    const drift = { x: Float64Array.from({ length: 60 }, (_, i) => 60 + 3 * i), y: new Float64Array(60).fill(100) }; // a particle crossing
    expect(pickMarkerTrack(storeOf([drift, still(241, 120, 60)]), centre)).toBe(1);
  });
});

describe('firstCandidates', () => {
  // eight squares of a still pattern in a corner, each bigger than the marker, and the marker on the hub
  const pattern = Array.from({ length: 8 }, (_, i) => ({ x_px: 10 + 11 * (i % 4), y_px: 10 + 11 * Math.floor(i / 4), area_px: 121 }));
  const marker = { x_px: 442, y_px: 180, area_px: 50 };
  const biggestFirst = [...pattern, marker];

  it('about a given centre takes the nearest spots, so a bigger still pattern far off cannot crowd out the marker', () => {
    const chosen = firstCandidates(biggestFirst, { x_px: 320, y_px: 180 });
    expect(chosen).toHaveLength(6);
    expect(chosen[0]).toBe(marker);
  });

  it('leaves out a spot on the centre itself (it cannot go round), and without a centre takes the six biggest', () => {
    const hubCap = { x_px: 320.5, y_px: 180, area_px: 200 };
    expect(firstCandidates([hubCap, marker], { x_px: 320, y_px: 180 })).toEqual([marker]);
    expect(firstCandidates(biggestFirst, null)).toEqual(pattern.slice(0, 6));
  });

  it('lets trackVideo follow the marker of a whole 640×360 frame with the still checkerboard in its corner, given --center (and names the cause without it)', async () => {
    // our renderer's default scene (fixed 4×4 checkerboard top-left) turning at −1.5 deg/s for 3 s; truth from the renderer
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-firstcand-'));
    try {
      const clip = await renderClip({ seed: 1, width_px: 640, height_px: 360, fps: 30, duration_s: 3, profile: { kind: 'steady', rate_deg_s: -1.5 }, realism: { noise_sigma: 2, crf: 23 } }, join(dir, 'check.mp4'));
      // without a centre the six biggest spots are followed, all of them checkerboard squares: say so, not "give --center"
      await expect(trackVideo(clip.videoPath)).rejects.toThrow(/^the spot followed did not move, and the first frame showed 3 more spots than could be followed \(the biggest were\), so the marker may not have been among them; give --roi around the marker's circle$/);
      const r = await trackVideo(clip.videoPath, { centre: { x: 320, y: 180 } });
      expect(r.summary.frames.lost).toBe(0);
      const a = r.series.angle_deg;
      const turned = a[a.length - 1]! - a[0]!;
      const truth = clip.truth.angle_deg[clip.truth.angle_deg.length - 1]! - clip.truth.angle_deg[0]!;
      expect(Math.abs(turned - truth)).toBeLessThan(0.3);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
});

describe('offCircle and rotorPlaneRadius', () => {
  it('every point of a tilted view ellipse has the semi-major axis as its rotor-plane radius, and none is off', () => {
    // ellipse: semi-major 80 px along 30°, axis ratio cos 40° (a rotor tilted 40°)
    const view = { cx_px: 100, cy_px: 90, axis_ratio: Math.cos((40 * Math.PI) / 180), major_axis_deg: 30 };
    const phi = (30 * Math.PI) / 180;
    const xs: number[] = [];
    const ys: number[] = [];
    for (let k = 0; k < 72; k++) {
      const t = (k * 5 * Math.PI) / 180;
      const along = 80 * Math.cos(t);
      const across = 80 * view.axis_ratio * Math.sin(t);
      const u = along * Math.cos(phi) - across * Math.sin(phi);
      const v = along * Math.sin(phi) + across * Math.cos(phi);
      xs.push(100 + u);
      ys.push(90 - v);
      expect(rotorPlaneRadius(100 + u, 90 - v, view)).toBeCloseTo(80, 9);
    }
    const r = offCircle(xs, ys, view);
    expect(r.median_radius_px).toBeCloseTo(80, 9);
    expect(Array.from(r.off).every((v) => v === 0)).toBe(true);
  });

  it('flags the points of a straight drift whose distance from the centre is far from the median, and a stray point on a circle', () => {
    const view = { cx_px: 160, cy_px: 120, axis_ratio: 1, major_axis_deg: 0 };
    // a chord passing 40 px from the centre, 200 px long: distances 40 … 108 px
    const drift = line(60, 80, 2, 0, 101);
    const r = offCircle(drift.x, drift.y, view);
    const flagged = r.off.reduce((s, v) => s + v, 0);
    expect(flagged).toBeGreaterThan(20);
    const marker = arc(160, 120, 81, 0, 5, 40);
    marker.x[7] = 160 + 20; // a particle 20 px from the centre
    marker.y[7] = 120;
    marker.x[9] = NaN;
    const m = offCircle(marker.x, marker.y, view);
    expect(Array.from(m.off).map((v, i) => (v ? i : -1)).filter((i) => i >= 0)).toEqual([7]);
  });

  it('narrows the band to the marker\'s own scatter: a particle followed a few pixels inward is flagged', () => {
    // a slow marker (a 6° arc) with ±0.05 px scatter, and 12 detections of a particle drifting inward 1 px per frame
    // from 2 px inside the circle: a fixed 25 % band (20 px) would keep them all
    const view = { cx_px: 160, cy_px: 120, axis_ratio: 1, major_axis_deg: 0 };
    const marker = arc(160, 120, 81, 10, 0.1, 60);
    for (let i = 0; i < 60; i++) marker.x[i] += 0.05 * Math.sin(2.3 * i);
    const xs = [...marker.x];
    const ys = [...marker.y];
    for (let k = 0; k < 12; k++) {
      xs.push(160 + (79 - k) * Math.cos((12 * Math.PI) / 180));
      ys.push(120 - (79 - k) * Math.sin((12 * Math.PI) / 180));
    }
    const r = offCircle(xs, ys, view);
    expect(r.band_px).toBe(2); // the floor: 5 robust SDs of the marker's scatter are far less
    // the particle's distances are 79, 78, … 68 px: the first (2 px in) is inside the floor, the rest are flagged
    expect(Array.from(r.off).map((v, i) => (v ? i : -1)).filter((i) => i >= 0)).toEqual(Array.from({ length: 11 }, (_, k) => 61 + k));
  });

  it('keeps the whole path of an oblique view measured as if square-on, whose distances vary with the angle', () => {
    // a 40°-tilted circle seen without its view fitted: distances from 80·cos 40° = 61 px to 80 px along a 150° arc
    const ratio = Math.cos((40 * Math.PI) / 180);
    const xs: number[] = [];
    const ys: number[] = [];
    for (let k = 0; k <= 150; k++) {
      const t = (k * Math.PI) / 180;
      xs.push(100 + 80 * Math.cos(t));
      ys.push(90 - 80 * ratio * Math.sin(t));
    }
    const r = offCircle(xs, ys, { cx_px: 100, cy_px: 90, axis_ratio: 1, major_axis_deg: 0 });
    expect(Array.from(r.off).every((v) => v === 0)).toBe(true);
  });
});

describe('findSpots at the window edge', () => {
  it('leaves out a spot cut by the window border (a background corner) but keeps a whole one inside', () => {
    const w = 60;
    const h = 60;
    const img = new Uint8Array(w * h).fill(100);
    // a bright corner wedge at the top-left (x + y < 8) and a 5×5 spot at 30..34
    for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) if (x + y < 8) img[y * w + x] = 220;
    for (let y = 30; y < 35; y++) for (let x = 30; x < 35; x++) img[y * w + x] = 200;
    const win = { x0: 0, y0: 0, x1: w, y1: h };
    const kept = findSpots(img, w, win).spots;
    expect(kept.length).toBe(1);
    expect(kept[0].x_px).toBeCloseTo(32, 6);
    expect(kept[0].y_px).toBeCloseTo(32, 6);
    const all = findSpots(img, w, win, { keep_edge_spots: true }).spots;
    expect(all.length).toBe(2);
  });
});
