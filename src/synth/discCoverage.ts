import type { Affine2d } from './affine2d.js';
import { affineStretch } from './affine2d.js';

/** Per-pixel coverage (0–1) over an image box. */
export interface CoverageMask {
  x0: number;
  y0: number;
  w: number;
  h: number;
  coverage: Float32Array;
}

/** Inclusive pixel box in the image. */
export interface PixelBox {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

/** Clips a real-valued box (grown by one pixel) to the frame; null when it lies outside. */
export function clipBox(xmin: number, ymin: number, xmax: number, ymax: number, width: number, height: number): PixelBox | null {
  const x0 = Math.max(0, Math.floor(xmin) - 1);
  const y0 = Math.max(0, Math.floor(ymin) - 1);
  const x1 = Math.min(width - 1, Math.ceil(xmax) + 1);
  const y1 = Math.min(height - 1, Math.ceil(ymax) + 1);
  return x0 > x1 || y0 > y1 ? null : { x0, y0, x1, y1 };
}

/**
 * Area coverage of a disc by each pixel of `box`, averaged over several disc centres (sub-times of an
 * exposure, for motion blur). The disc lives in a plane reached from image px by `toPlane` (so under an
 * oblique view it is seen as an ellipse). Pixel (i, j) covers [i−½, i+½]×[j−½, j+½]. Pixels whose footprint
 * is wholly inside or outside count 1 or 0; edge pixels are supersampled on an S×S grid.
 * @param centres plane coordinates u0, v0, u1, v1, … of the disc centre at each sub-time
 */
export function discCoverage(toPlane: Affine2d, centres: Float64Array, radius: number, box: PixelBox, supersample: number): CoverageMask {
  const w = box.x1 - box.x0 + 1;
  const h = box.y1 - box.y0 + 1;
  const coverage = new Float32Array(w * h);
  const k = centres.length / 2;
  const margin = 0.7072 * affineStretch(toPlane) + 1e-9;
  const inner = radius > margin ? (radius - margin) ** 2 : -1;
  const outer = (radius + margin) ** 2;
  const r2 = radius * radius;
  const s = supersample;
  const offU = new Float64Array(s * s);
  const offV = new Float64Array(s * s);
  for (let sy = 0; sy < s; sy++) {
    for (let sx = 0; sx < s; sx++) {
      const ox = (sx + 0.5) / s - 0.5;
      const oy = (sy + 0.5) / s - 0.5;
      offU[sy * s + sx] = toPlane.a * ox + toPlane.b * oy;
      offV[sy * s + sx] = toPlane.d * ox + toPlane.e * oy;
    }
  }
  const perSample = 1 / (s * s * k);
  for (let j = 0; j < h; j++) {
    const y = box.y0 + j;
    for (let i = 0; i < w; i++) {
      const x = box.x0 + i;
      const u = toPlane.a * x + toPlane.b * y + toPlane.c;
      const v = toPlane.d * x + toPlane.e * y + toPlane.f;
      let whole = 0;
      let samples = 0;
      for (let c = 0; c < k; c++) {
        const du = u - centres[2 * c];
        const dv = v - centres[2 * c + 1];
        const d2 = du * du + dv * dv;
        if (d2 >= outer) continue;
        if (d2 <= inner) {
          whole++;
          continue;
        }
        for (let q = 0; q < offU.length; q++) {
          const eu = du + offU[q];
          const ev = dv + offV[q];
          if (eu * eu + ev * ev < r2) samples++;
        }
      }
      coverage[j * w + i] = whole / k + samples * perSample;
    }
  }
  return { x0: box.x0, y0: box.y0, w, h, coverage };
}

/** Blends a colour into a float image (channels interleaved) by a coverage mask. */
export function blendCoverage(layer: Float32Array, width: number, channels: number, mask: CoverageMask, colour: readonly number[]): void {
  for (let j = 0; j < mask.h; j++) {
    for (let i = 0; i < mask.w; i++) {
      const c = mask.coverage[j * mask.w + i];
      if (c <= 0) continue;
      const p = ((mask.y0 + j) * width + mask.x0 + i) * channels;
      for (let ch = 0; ch < channels; ch++) layer[p + ch] += (colour[ch] - layer[p + ch]) * c;
    }
  }
}
