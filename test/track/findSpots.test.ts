import { describe, expect, it } from 'vitest';
import { findSpots } from '../../src/track/findSpots.js';
import { createSpotFollower } from '../../src/track/spotFollower.js';
import { colourSimilarityTable, rgbToLab } from '../../src/track/colourDistanceTable.js';

/** A 0–255 image with a background level and anti-aliased discs (area coverage by 8×8 supersampling). */
function draw(width: number, height: number, background: number, discs: { x: number; y: number; r: number; level: number }[]): Uint8Array {
  const img = new Uint8Array(width * height);
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      let v = background;
      for (const d of discs) {
        if (Math.abs(x - d.x) > d.r + 1 || Math.abs(y - d.y) > d.r + 1) continue;
        let inside = 0;
        for (let sy = 0; sy < 8; sy++) for (let sx = 0; sx < 8; sx++) if (Math.hypot(x - 0.5 + (sx + 0.5) / 8 - d.x, y - 0.5 + (sy + 0.5) / 8 - d.y) < d.r) inside++;
        v = v + ((d.level - v) * inside) / 64;
      }
      img[y * width + x] = Math.round(v);
    }
  }
  return img;
}

describe('findSpots', () => {
  // Truth: the disc centres we drew (area-weighted anti-aliasing, so the centroid is sub-pixel)
  it('locates an anti-aliased disc to a small fraction of a pixel', () => {
    for (const [x, y] of [[30.3, 20.7], [31.55, 22.1], [29.9, 19.25]]) {
      const img = draw(64, 48, 60, [{ x, y, r: 5, level: 230 }]);
      const { spots } = findSpots(img, 64, { x0: 0, y0: 0, x1: 64, y1: 48 });
      expect(spots.length).toBe(1);
      expect(Math.abs(spots[0].x_px - x)).toBeLessThan(0.05);
      expect(Math.abs(spots[0].y_px - y)).toBeLessThan(0.05);
    }
  });

  it('does not care about the overall brightness (flicker)', () => {
    const a = draw(64, 48, 60, [{ x: 30.4, y: 20.2, r: 5, level: 200 }]);
    const b = Uint8Array.from(a, (v) => Math.round(v * 0.7));
    const pa = findSpots(a, 64, { x0: 0, y0: 0, x1: 64, y1: 48 }).spots[0];
    const pb = findSpots(b, 64, { x0: 0, y0: 0, x1: 64, y1: 48 }).spots[0];
    expect(Math.abs(pa.x_px - pb.x_px)).toBeLessThan(0.05);
    expect(Math.abs(pa.y_px - pb.y_px)).toBeLessThan(0.05);
  });

  it('finds nothing in a flat region', () => {
    const img = draw(64, 48, 90, []);
    expect(findSpots(img, 64, { x0: 0, y0: 0, x1: 64, y1: 48 }).spots).toEqual([]);
  });
});

describe('createSpotFollower', () => {
  it('refuses a frame where a particle sits on the marker instead of inventing a position', () => {
    const f = createSpotFollower({ region: { x0: 0, y0: 0, x1: 120, y1: 120 } });
    const at = (k: number) => ({ x: 60 + 40 * Math.cos(0.1 * k), y: 60 - 40 * Math.sin(0.1 * k) });
    for (let k = 0; k < 10; k++) {
      const p = at(k);
      const r = f.update(draw(120, 120, 60, [{ ...p, r: 4, level: 230 }]), 120, k / 30);
      expect(r.flag).toBe('');
      expect(Math.hypot(r.x_px - p.x, r.y_px - p.y)).toBeLessThan(0.1);
    }
    // frame 10: a bright particle merges with the marker's edge
    const p = at(10);
    const merged = f.update(draw(120, 120, 60, [{ ...p, r: 4, level: 230 }, { x: p.x + 5, y: p.y + 2, r: 4, level: 230 }]), 120, 10 / 30);
    expect(merged.flag).toMatch(/^lost:(shape|gate)$/);
    expect(Number.isNaN(merged.x_px)).toBe(true);
    // frame 11: a particle nearby but separate; the marker is still taken
    const q = at(11);
    const sep = f.update(draw(120, 120, 60, [{ ...q, r: 4, level: 230 }, { x: q.x - 14, y: q.y + 9, r: 4, level: 230 }]), 120, 11 / 30);
    expect(sep.flag).toBe('');
    expect(Math.hypot(sep.x_px - q.x, sep.y_px - q.y)).toBeLessThan(0.1);
  });
});

describe('colour similarity', () => {
  // Reference values: sRGB → CIELAB (D65) for pure red and white, as tabulated by Bruce Lindbloom's colour
  // calculator (brucelindbloom.com): red (255,0,0) → L 53.24, a 80.09, b 67.20; white → L 100, a 0, b 0
  // (values from memory; they agree with the sRGB (IEC 61966-2-1) and CIELAB (CIE 15) formulas evaluated separately).
  it('converts sRGB to CIELAB like the published tables', () => {
    const red = rgbToLab(255, 0, 0);
    expect(red.L).toBeCloseTo(53.24, 1);
    expect(red.a).toBeCloseTo(80.09, 0);
    expect(red.b).toBeCloseTo(67.2, 0);
    const white = rgbToLab(255, 255, 255);
    expect(white.L).toBeCloseTo(100, 1);
    expect(Math.abs(white.a)).toBeLessThan(0.05);
  });

  // design thresholds of the similarity table (no outside source): the marker colour scores near the top, other hues 0
  it('scores the marker colour high and other colours zero', () => {
    const t = colourSimilarityTable([220, 40, 40], 40);
    const at = (r: number, g: number, b: number) => t[((r >> 2) << 12) | ((g >> 2) << 6) | (b >> 2)];
    expect(at(220, 40, 40)).toBeGreaterThan(240);
    expect(at(180, 30, 30)).toBeGreaterThan(100); // same hue, darker (lighting)
    expect(at(40, 200, 40)).toBe(0);
    expect(at(150, 150, 150)).toBe(0);
  });
});
