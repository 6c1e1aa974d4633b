// createSpotFollower on drawn images whose spot positions we know: a marker at rest that starts to turn.
import { describe, expect, it } from 'vitest';
import { createSpotFollower } from '../../src/track/spotFollower.js';
import { DRAWN_SIZE, drawDiscs } from './drawDiscs.js';

const W = DRAWN_SIZE;
const H = DRAWN_SIZE;

/** A drawn image (drawDiscs) with a marker disc of radius 4 px at (x, y) and any further discs. */
const drawSpot = (x: number, y: number, more: { x: number; y: number; r: number }[] = []): Uint8Array => drawDiscs([{ x, y, r: 4 }, ...more]);

/** Angle of a hub at rest until 10/30 s, then spinning up towards 1440°/s with τ = 0.4 s, deg (first-order spin-up in closed form; common practice, no source). */
const spinUpDeg = (t: number): number => (t <= 1 / 3 ? 0 : 1440 * (t - 1 / 3 - 0.4 * (1 - Math.exp(-(t - 1 / 3) / 0.4))));

describe('createSpotFollower', () => {
  // 40 frames at 30 fps of a spot on a circle of radius 60 px about (100, 100); counterclockwise as displayed
  const frames = Array.from({ length: 40 }, (_, k) => {
    const a = (spinUpDeg(k / 30) * Math.PI) / 180;
    return { t_s: k / 30, x: 100 + 60 * Math.cos(a), y: 100 - 60 * Math.sin(a) };
  });
  const images = frames.map((f) => drawSpot(f.x, f.y));
  const region = { x0: 0, y0: 0, x1: W, y1: H };
  const follow = (restart_after?: number) => {
    const f = createSpotFollower({ region, ...(restart_after !== undefined ? { restart_after } : {}) });
    return images.map((img, k) => f.update(img, W, frames[k].t_s));
  };

  it('picks up a marker that starts to turn from rest within two frames, and measures every kept frame where it is', () => {
    const readings = follow();
    const lost = readings.map((r, k) => (r.flag === '' ? -1 : k)).filter((k) => k >= 0);
    expect(lost.length).toBeLessThanOrEqual(2);
    readings.forEach((r, k) => {
      if (r.flag === '') expect(Math.hypot(r.x_px - frames[k].x, r.y_px - frames[k].y)).toBeLessThan(0.3);
    });
  });

  it('without that restart the tight gate of a still marker loses it for many frames (the behaviour the restart replaces)', () => {
    const readings = follow(Number.POSITIVE_INFINITY);
    expect(readings.filter((r) => r.flag !== '').length).toBeGreaterThan(8);
  });

  it('follows a marker standing exactly still (identical frames) in every frame', () => {
    // three identical points have no circle through them; the prediction must fall back to standing still
    const still = drawSpot(160, 100);
    const f = createSpotFollower({ region });
    const readings = Array.from({ length: 12 }, (_, k) => f.update(still, W, k / 30));
    expect(readings.map((r) => r.flag)).toEqual(Array(12).fill(''));
    for (const r of readings) expect(Math.hypot(r.x_px - 160, r.y_px - 100)).toBeLessThan(0.05);
  });

  it('refuses a blob of another size where a steady marker stands (a particle touching it) instead of following its centroid away', () => {
    // marker at rest at (160, 100); a particle of radius 5 drifts in from the upper left, 1.5 px per frame, touches
    // the marker for several frames and drifts on: the merged blob is 30–60 % bigger, inside a fixed factor of 1.6
    const f = createSpotFollower({ region, start: { x_px: 160, y_px: 100 } });
    const readings = Array.from({ length: 40 }, (_, k) => {
      const px = 130 + 1.5 * k;
      const py = 70 + 1.5 * k;
      return f.update(drawSpot(160, 100, [{ x: px, y: py, r: 5 }]), W, k / 30);
    });
    // every kept reading is the marker itself (never a centroid dragged towards the particle), and it is kept again afterwards
    for (const r of readings) if (r.flag === '') expect(Math.hypot(r.x_px - 160, r.y_px - 100)).toBeLessThan(0.3);
    expect(readings.slice(-5).every((r) => r.flag === '')).toBe(true);
  });

  it('about a given centre, keeps a particle that travels along the marker\'s circle and hides it for 17 frames from taking over', () => {
    // marker at rest at (160, 100), radius 60 about (100, 100); a particle of radius 5 comes along the same circle at
    // 1° per frame from 40° above, covers the marker (a merged blob) and goes on below it. Without the centre the
    // follower, after 15 lost frames, starts afresh on the merged blob and follows it away with the particle.
    const at = (k: number) => { const a = ((40 - k) * Math.PI) / 180; return { x: 100 + 60 * Math.cos(a), y: 100 - 60 * Math.sin(a), r: 5 }; };
    const images = Array.from({ length: 90 }, (_, k) => drawSpot(160, 100, [at(k)]));
    const run = (centre?: { x_px: number; y_px: number }) => {
      const f = createSpotFollower({ region, start: { x_px: 160, y_px: 100 }, ...(centre ? { centre } : {}) });
      return images.map((img, k) => f.update(img, W, k / 30));
    };
    const withCentre = run({ x_px: 100, y_px: 100 });
    for (const r of withCentre) if (r.flag === '') expect(Math.hypot(r.x_px - 160, r.y_px - 100)).toBeLessThan(0.3);
    expect(withCentre.slice(-10).every((r) => r.flag === '')).toBe(true);
    const without = run();
    expect(without.some((r) => r.flag === '' && Math.hypot(r.x_px - 160, r.y_px - 100) > 1)).toBe(true);
  });

  it('about a given centre, follows a marker on an oblique view\'s ellipse in every frame (its distance changes along it)', () => {
    // a hub tilted 45° about the horizontal: the marker's path is an ellipse of semi-axes 60 and 42.4 px, turning
    // 3° per frame; the distance from the centre sweeps 42–60 px and near the long axis barely changes for a while
    const f = createSpotFollower({ region, start: { x_px: 160, y_px: 100 }, centre: { x_px: 100, y_px: 100 } });
    const readings = Array.from({ length: 150 }, (_, k) => {
      const a = (3 * k * Math.PI) / 180;
      return f.update(drawSpot(100 + 60 * Math.cos(a), 100 - 60 * Math.SQRT1_2 * Math.sin(a)), W, k / 30);
    });
    expect(readings.filter((r) => r.flag !== '').length).toBe(0);
  });
});
