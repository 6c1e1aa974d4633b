import { describe, expect, it } from 'vitest';
import { gaussianKernel, smoothRegion } from '../../src/track/anchorSmoothing.js';
import { searchTranslation } from '../../src/track/anchorSearch.js';

describe('gaussianKernel', () => {
  it('is normalised, symmetric and has the asked standard deviation', () => {
    const k = gaussianKernel(1.5);
    expect(k.length).toBe(2 * Math.ceil(4.5) + 1);
    const r = (k.length - 1) / 2;
    let sum = 0;
    let variance = 0;
    for (let i = 0; i < k.length; i++) {
      sum += k[i];
      variance += k[i] * (i - r) ** 2;
      expect(k[i]).toBeCloseTo(k[k.length - 1 - i], 15);
    }
    expect(sum).toBeCloseTo(1, 12);
    // A sampled Gaussian truncated at 3σ keeps its variance within about 3% (common practice, no source).
    expect(Math.sqrt(variance)).toBeGreaterThan(1.5 * 0.97);
    expect(Math.sqrt(variance)).toBeLessThan(1.5 * 1.01);
  });
});

describe('smoothRegion', () => {
  // A symmetric normalised kernel leaves a linear ramp unchanged away from the borders (common practice, no source).
  it('keeps a linear ramp unchanged and places the region in the full frame', () => {
    const width = 40;
    const height = 30;
    const data = new Uint8Array(width * height);
    for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) data[y * width + x] = 10 + 3 * x + 2 * y;
    const frame = { data, width, height, origin_x_px: 200, origin_y_px: 100 };
    const region = smoothRegion(frame, { x: 210, y: 108, w: 12, h: 10 }, 1.2);
    expect(region).not.toBeNull();
    expect(region!.x0_px).toBe(210);
    expect(region!.y0_px).toBe(108);
    for (let y = 0; y < 10; y++) for (let x = 0; x < 12; x++) expect(region!.data[y * 12 + x]).toBeCloseTo(10 + 3 * (x + 10) + 2 * (y + 8), 3);
  });

  it('returns null for a region off the crop', () => {
    const frame = { data: new Uint8Array(100), width: 10, height: 10, origin_x_px: 0, origin_y_px: 0 };
    expect(smoothRegion(frame, { x: 20, y: 0, w: 5, h: 5 }, 1)).toBeNull();
  });
});

describe('searchTranslation', () => {
  it('finds a whole-pixel displacement exactly, with score 1', () => {
    const width = 60;
    const height = 50;
    const img = new Float32Array(width * height);
    for (let i = 0; i < img.length; i++) img[i] = Math.sin(i * 0.37) * 50 + Math.cos(i * 0.011) * 20; // aperiodic texture
    const tw = 16;
    const th = 12;
    const tpl = new Float32Array(tw * th);
    for (let y = 0; y < th; y++) for (let x = 0; x < tw; x++) tpl[y * tw + x] = img[(y + 20 + 3) * width + (x + 15 - 5)];
    // Template placed at (15, 20); its content sits at (10, 23) in the image: displacement (−5, +3).
    const match = searchTranslation({ data: tpl, width: tw, height: th, x0_px: 15, y0_px: 20 }, { data: img, width, height, x0_px: 0, y0_px: 0 }, { radius_px: 8 });
    expect(Math.round(match.dx_px)).toBe(-5);
    expect(Math.round(match.dy_px)).toBe(3);
    expect(match.score).toBeCloseTo(1, 6);
  });
});
