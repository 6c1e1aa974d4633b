import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { createAnchorTracker, removeCameraMotion, applyCameraMotion, type AnchorTrackerOptions } from '../../src/track/anchorTracker.js';
import { drawStillScene, makeStillScene } from './anchorScene.js';

// Truth comes from the drawing: the still scene is drawn through a known camera pose (anchorScene.ts).
const W = 320;
const H = 240;
const scene = makeStillScene(3, W, H);
const anchor = { x: 60, y: 40, w: 64, h: 64 };
const pivotOf = (a: { x: number; y: number; w: number; h: number }) => ({ x_px: a.x + (a.w - 1) / 2, y_px: a.y + (a.h - 1) / 2 });
type Pose = { dx_px: number; dy_px: number; rotation_deg: number };
const poses: Pose[] = [
  { dx_px: 1.37, dy_px: -2.61, rotation_deg: 0.23 },
  { dx_px: -0.25, dy_px: 0.5, rotation_deg: -0.3 },
  { dx_px: 2.9, dy_px: 2.2, rotation_deg: 0.05 },
  { dx_px: -3, dy_px: 0.1, rotation_deg: -0.17 },
  { dx_px: 0.04, dy_px: -0.03, rotation_deg: 0.01 },
];

function run(options: AnchorTrackerOptions, noise: number, light: (i: number) => number = () => 1) {
  const tracker = createAnchorTracker(options);
  const pivot = pivotOf(options.anchor);
  const frame = (pose: Pose, seed: number) => {
    const data = drawStillScene(scene, { ...pose, pivot_x_px: pivot.x_px, pivot_y_px: pivot.y_px }, noise, seed);
    const g = light(seed);
    for (let i = 0; i < data.length; i++) data[i] = Math.min(255, Math.round(data[i] * g));
    return { data, width: W, height: H, origin_x_px: 0, origin_y_px: 0 };
  };
  expect(tracker.update(frame({ dx_px: 0, dy_px: 0, rotation_deg: 0 }, 1))).toEqual({ dx_px: 0, dy_px: 0, rotation_deg: 0, quality: 1 });
  expect(tracker.pivot).toEqual(pivot);
  return poses.map((pose, i) => {
    const got = tracker.update(frame(pose, i + 2));
    return { dx: got.dx_px - pose.dx_px, dy: got.dy_px - pose.dy_px, rot: got.rotation_deg - pose.rotation_deg, quality: got.quality };
  });
}

describe('createAnchorTracker', () => {
  it('recovers sub-pixel shifts and small rotations of a 64 px anchor within 0.05 px and 0.02°', () => {
    for (const e of run({ anchor }, 0)) {
      expect(Math.abs(e.dx)).toBeLessThan(0.05);
      expect(Math.abs(e.dy)).toBeLessThan(0.05);
      expect(Math.abs(e.rot)).toBeLessThan(0.02);
      expect(e.quality).toBeGreaterThan(0.99);
    }
  });

  it('ignores lighting flicker', () => {
    for (const e of run({ anchor }, 0, (i) => 0.75 + 0.1 * (i % 3))) {
      expect(Math.abs(e.dx)).toBeLessThan(0.05);
      expect(Math.abs(e.dy)).toBeLessThan(0.05);
      expect(Math.abs(e.rot)).toBeLessThan(0.02);
    }
  });

  it('measures rotation better with a second, distant anchor than with one small one, under sensor noise', () => {
    const worst = (list: { rot: number }[]) => Math.max(...list.map((e) => Math.abs(e.rot)));
    const small = run({ anchor: { x: 60, y: 40, w: 32, h: 32 } }, 4);
    const pair = run({ anchor: { x: 60, y: 40, w: 32, h: 32 }, second_anchor: { x: 240, y: 160, w: 32, h: 32 } }, 4);
    for (const e of pair) {
      expect(Math.abs(e.dx)).toBeLessThan(0.05);
      expect(Math.abs(e.dy)).toBeLessThan(0.05);
      expect(Math.abs(e.rot)).toBeLessThan(0.02);
    }
    expect(worst(pair)).toBeLessThan(worst(small));
  });

  it('works on cropped frames (origin not at 0,0)', () => {
    const tracker = createAnchorTracker({ anchor });
    const pivot = pivotOf(anchor);
    const crop = (pose: Pose) => {
      const full = drawStillScene(scene, { ...pose, pivot_x_px: pivot.x_px, pivot_y_px: pivot.y_px });
      const ox = 30;
      const oy = 20;
      const w = 150;
      const h = 120;
      const data = new Uint8Array(w * h);
      for (let y = 0; y < h; y++) data.set(full.subarray((y + oy) * W + ox, (y + oy) * W + ox + w), y * w);
      return { data, width: w, height: h, origin_x_px: ox, origin_y_px: oy };
    };
    tracker.update(crop({ dx_px: 0, dy_px: 0, rotation_deg: 0 }));
    const got = tracker.update(crop(poses[0]));
    expect(got.dx_px).toBeCloseTo(poses[0].dx_px, 1);
    expect(Math.abs(got.dx_px - poses[0].dx_px)).toBeLessThan(0.05);
    expect(Math.abs(got.dy_px - poses[0].dy_px)).toBeLessThan(0.05);
    expect(Math.abs(got.rotation_deg - poses[0].rotation_deg)).toBeLessThan(0.02);
  });

  it('reports NaN with quality 0 when the anchor content is gone', () => {
    const tracker = createAnchorTracker({ anchor });
    const pivot = pivotOf(anchor);
    tracker.update({ data: drawStillScene(scene, { dx_px: 0, dy_px: 0, rotation_deg: 0, pivot_x_px: pivot.x_px, pivot_y_px: pivot.y_px }), width: W, height: H, origin_x_px: 0, origin_y_px: 0 });
    const other = makeStillScene(99, W, H);
    const got = tracker.update({ data: drawStillScene(other, { dx_px: 0, dy_px: 0, rotation_deg: 0, pivot_x_px: 0, pivot_y_px: 0 }), width: W, height: H, origin_x_px: 0, origin_y_px: 0 });
    expect(got.quality).toBe(0);
    expect(got.dx_px).toBeNaN();
  });

  it('refuses an anchor outside the frame or too small to register', () => {
    const blank = { data: new Uint8Array(W * H), width: W, height: H, origin_x_px: 0, origin_y_px: 0 };
    expect(() => createAnchorTracker({ anchor: { x: 300, y: 200, w: 64, h: 64 } }).update(blank)).toThrow(InputError);
    expect(() => createAnchorTracker({ anchor: { x: 10, y: 10, w: 4, h: 40 } })).toThrow(/at least 8/);
  });
});

describe('removeCameraMotion', () => {
  it('maps a point seen in a moved frame back to where the first frame had it', () => {
    const pivot = { x_px: 91.5, y_px: 71.5 };
    const motion = { dx_px: 2.5, dy_px: -1.25, rotation_deg: 0.8 };
    const phi = (motion.rotation_deg * Math.PI) / 180;
    for (const p0 of [{ x_px: 200, y_px: 150 }, { x_px: 10, y_px: 5 }, { x_px: 91.5, y_px: 71.5 }]) {
      // Forward model written out: X = pivot + t + R(φ)(X0 − pivot), R(φ) = [[cos, sin], [−sin, cos]] (CCW as displayed).
      const u = p0.x_px - pivot.x_px;
      const v = p0.y_px - pivot.y_px;
      const seen = { x_px: pivot.x_px + motion.dx_px + Math.cos(phi) * u + Math.sin(phi) * v, y_px: pivot.y_px + motion.dy_px - Math.sin(phi) * u + Math.cos(phi) * v };
      const back = removeCameraMotion(seen, motion, pivot);
      expect(back.x_px).toBeCloseTo(p0.x_px, 10);
      expect(back.y_px).toBeCloseTo(p0.y_px, 10);
      const again = applyCameraMotion(p0, motion, pivot);
      expect(again.x_px).toBeCloseTo(seen.x_px, 10);
      expect(again.y_px).toBeCloseTo(seen.y_px, 10);
    }
  });

  it('turns a point to the right of the pivot upward on screen for a counterclockwise camera roll', () => {
    const seen = applyCameraMotion({ x_px: 110, y_px: 50 }, { dx_px: 0, dy_px: 0, rotation_deg: 90 }, { x_px: 100, y_px: 50 });
    expect(seen.x_px).toBeCloseTo(100, 10);
    expect(seen.y_px).toBeCloseTo(40, 10);
  });
});
