import type { GrayCrop } from './polarUnwrap.js';

/** A float image placed in the full frame: pixel (0,0) of `data` sits at (x0_px, y0_px), full-frame px. */
export interface PlacedImage {
  data: Float32Array;
  width: number;
  height: number;
  x0_px: number;
  y0_px: number;
}

/** A rectangle in full-frame px: x, y of the top-left pixel, width and height in pixels. */
export interface PixelRect {
  x: number;
  y: number;
  w: number;
  h: number;
}

/** Normalised 1-D Gaussian kernel of standard deviation sigma_px, radius ⌈3σ⌉ (σ ≤ 0 gives [1]). */
export function gaussianKernel(sigma_px: number): Float64Array {
  if (!(sigma_px > 0)) return Float64Array.of(1);
  const radius = Math.ceil(3 * sigma_px);
  const k = new Float64Array(2 * radius + 1);
  let sum = 0;
  for (let i = -radius; i <= radius; i++) {
    const v = Math.exp(-(i * i) / (2 * sigma_px * sigma_px));
    k[i + radius] = v;
    sum += v;
  }
  for (let i = 0; i < k.length; i++) k[i] /= sum;
  return k;
}

/**
 * Cuts `rect` (full-frame px, integer, clipped to the crop) out of a gray crop and smooths it with a
 * separable Gaussian of sigma_px, using the crop's pixels beyond the rectangle where they exist and
 * repeating the edge pixel where they do not. Returns null when the rectangle misses the crop.
 */
export function smoothRegion(frame: GrayCrop, rect: PixelRect, sigma_px: number): PlacedImage | null {
  const left = Math.max(frame.origin_x_px, Math.floor(rect.x));
  const top = Math.max(frame.origin_y_px, Math.floor(rect.y));
  const right = Math.min(frame.origin_x_px + frame.width, Math.floor(rect.x) + Math.ceil(rect.w));
  const bottom = Math.min(frame.origin_y_px + frame.height, Math.floor(rect.y) + Math.ceil(rect.h));
  const w = right - left;
  const h = bottom - top;
  if (w < 1 || h < 1) return null;
  const kernel = gaussianKernel(sigma_px);
  const radius = (kernel.length - 1) / 2;
  const fx0 = left - frame.origin_x_px;
  const fy0 = top - frame.origin_y_px;
  // Horizontal pass over the rows the vertical pass needs.
  const rowsTop = Math.max(0, fy0 - radius);
  const rowsBottom = Math.min(frame.height, fy0 + h + radius);
  const tmp = new Float64Array((rowsBottom - rowsTop) * w);
  for (let y = rowsTop; y < rowsBottom; y++) {
    const row = y * frame.width;
    for (let x = 0; x < w; x++) {
      let acc = 0;
      for (let i = -radius; i <= radius; i++) {
        const xi = Math.min(frame.width - 1, Math.max(0, fx0 + x + i));
        acc += kernel[i + radius] * frame.data[row + xi];
      }
      tmp[(y - rowsTop) * w + x] = acc;
    }
  }
  const out = new Float32Array(w * h);
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      let acc = 0;
      for (let i = -radius; i <= radius; i++) {
        const yi = Math.min(rowsBottom - 1, Math.max(rowsTop, fy0 + y + i));
        acc += kernel[i + radius] * tmp[(yi - rowsTop) * w + x];
      }
      out[y * w + x] = acc;
    }
  }
  return { data: out, width: w, height: h, x0_px: left, y0_px: top };
}
