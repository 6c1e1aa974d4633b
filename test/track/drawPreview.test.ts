// markPreview: the set-up marks a person checks at a glance — region, centre, and one fitted path per marker.
import { describe, expect, it } from 'vitest';
import { markPreview, type PreviewImage } from '../../src/track/drawPreview.js';

const W = 240;
const H = 200;
const blank = (): PreviewImage => ({ width: W, height: H, rgb: new Uint8Array(W * H * 3) });
const colourAt = (img: PreviewImage, x: number, y: number) => Array.from(img.rgb.subarray(3 * (y * W + x), 3 * (y * W + x) + 3));
const GREEN = [60, 230, 60];
const YELLOW = [255, 210, 0];
const RED = [255, 40, 40];

/** How many green (path) pixels lie at each whole-pixel distance from (cx, cy). */
function greenByRadius(img: PreviewImage, cx: number, cy: number): Map<number, number> {
  const out = new Map<number, number>();
  for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) {
    if (colourAt(img, x, y).join() !== GREEN.join()) continue;
    const r = Math.round(Math.hypot(x - cx, y - cy));
    out.set(r, (out.get(r) ?? 0) + 1);
  }
  return out;
}

/** n points on a circle of radius r about (cx, cy), px (counterclockwise as displayed: y = cy − r sin θ). */
function circle(cx: number, cy: number, r: number, n: number) {
  return Array.from({ length: n }, (_, k) => ({ x_px: cx + r * Math.cos((2 * Math.PI * k) / n), y_px: cy - r * Math.sin((2 * Math.PI * k) / n) }));
}

describe('markPreview', () => {
  const view = { cx_px: 120, cy_px: 100, axis_ratio: 1, major_axis_deg: 0 };

  it('draws the region, the centre cross and the path of a single marker through its detections', () => {
    const img = blank();
    markPreview(img, { roi: { x: 10, y: 10, w: 220, h: 180 }, anchor: null, view, centre: { x_px: 120, y_px: 100 }, detections: circle(120, 100, 60, 40) });
    expect(colourAt(img, 10, 50)).toEqual(YELLOW); // left edge of the region
    expect(colourAt(img, 120, 95)).toEqual(RED); // the centre cross
    // the path is the circle through the points (radius 60, closed form): every green pixel lies at 59–61 px
    const green = greenByRadius(img, 120, 100);
    expect([...green.keys()].every((r) => r >= 59 && r <= 61)).toBe(true);
    expect((green.get(60) ?? 0)).toBeGreaterThan(100);
  });

  it('draws one path per marker when several markers sit at different radii', () => {
    const img = blank();
    markPreview(img, { roi: { x: 0, y: 0, w: W, h: H }, anchor: null, view, centre: { x_px: 120, y_px: 100 }, detections: circle(120, 100, 60, 40), other_markers: [circle(120, 100, 35, 10)] });
    const green = greenByRadius(img, 120, 100);
    const near = (r: number) => (green.get(r - 1) ?? 0) + (green.get(r) ?? 0) + (green.get(r + 1) ?? 0);
    expect(near(60)).toBeGreaterThan(150); // first marker's path (circumference ≈ 377 px, partly under the detection dots)
    expect(near(35)).toBeGreaterThan(100); // second marker's path (circumference ≈ 220 px)
    expect([...green.keys()].every((r) => Math.abs(r - 60) <= 1 || Math.abs(r - 35) <= 1)).toBe(true);
  });
});
