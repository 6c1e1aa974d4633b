import type { PlacedImage } from './anchorSmoothing.js';
import { parabolicPeakOffset } from './circularShift.js';

/** Where a template was found: its displacement from its own placement, px, and the match score there. */
export interface TranslationMatch {
  dx_px: number;
  dy_px: number;
  /** Zero-mean normalised cross-correlation at the best whole-pixel displacement, −1..1. */
  score: number;
}

export interface TranslationSearchOptions {
  /** Expected displacement, px (rounded to whole pixels). Default 0, 0. */
  predicted_dx_px?: number;
  predicted_dy_px?: number;
  /** Displacements searched: every whole pixel within this many px of the prediction, in x and y. Default 12. */
  radius_px?: number;
  /** Share of the template that must lie inside the image at a displacement for it to count (the rest may have left the frame). Default 0.6. */
  min_overlap?: number;
}

/**
 * Finds the whole-pixel displacement of `template` (placed where it was cut) inside `image` that
 * maximises the zero-mean normalised cross-correlation over the overlap (exhaustive search around a
 * prediction; part of the template may fall outside the image, e.g. at the frame edge), then a
 * parabolic 3-point fit per axis for a sub-pixel start value. Score −Infinity when no displacement fits.
 */
export function searchTranslation(template: PlacedImage, image: PlacedImage, options: TranslationSearchOptions = {}): TranslationMatch {
  const tw = template.width;
  const th = template.height;
  const t = template.data;
  const minOverlap = options.min_overlap ?? 0.6;
  const px = Math.round(options.predicted_dx_px ?? 0);
  const py = Math.round(options.predicted_dy_px ?? 0);
  const radius = Math.max(1, Math.round(options.radius_px ?? 12));
  const side = 2 * radius + 1;
  const scores = new Float64Array(side * side).fill(Number.NEGATIVE_INFINITY);
  let best = -1;
  let bestScore = Number.NEGATIVE_INFINITY;
  for (let sy = 0; sy < side; sy++) {
    for (let sx = 0; sx < side; sx++) {
      const ox = template.x0_px + px + sx - radius - image.x0_px;
      const oy = template.y0_px + py + sy - radius - image.y0_px;
      // Template pixels that land inside the image at this displacement.
      const x0 = Math.max(0, -ox);
      const y0 = Math.max(0, -oy);
      const x1 = Math.min(tw, image.width - ox);
      const y1 = Math.min(th, image.height - oy);
      const n = (x1 - x0) * (y1 - y0);
      if (x1 <= x0 || y1 <= y0 || n < minOverlap * tw * th) continue;
      let si = 0;
      let sii = 0;
      let st = 0;
      let stt = 0;
      let sit = 0;
      for (let y = y0; y < y1; y++) {
        const row = (oy + y) * image.width + ox;
        const trow = y * tw;
        for (let x = x0; x < x1; x++) {
          const v = image.data[row + x];
          const w = t[trow + x];
          si += v;
          sii += v * v;
          st += w;
          stt += w * w;
          sit += v * w;
        }
      }
      const iEnergy = sii - (si * si) / n;
      const tEnergy = stt - (st * st) / n;
      const score = iEnergy > 0 && tEnergy > 0 ? (sit - (si * st) / n) / Math.sqrt(iEnergy * tEnergy) : 0;
      scores[sy * side + sx] = score;
      if (score > bestScore) {
        bestScore = score;
        best = sy * side + sx;
      }
    }
  }
  if (best < 0) return { dx_px: Number.NaN, dy_px: Number.NaN, score: Number.NEGATIVE_INFINITY };
  const bx = best % side;
  const by = Math.floor(best / side);
  const at = (x: number, y: number): number => (x >= 0 && y >= 0 && x < side && y < side ? scores[y * side + x] : Number.NEGATIVE_INFINITY);
  const subpixel = (l: number, c: number, r: number): number => (Number.isFinite(l) && Number.isFinite(r) ? parabolicPeakOffset(l, c, r) : 0);
  return {
    dx_px: px + bx - radius + subpixel(at(bx - 1, by), bestScore, at(bx + 1, by)),
    dy_px: py + by - radius + subpixel(at(bx, by - 1), bestScore, at(bx, by + 1)),
    score: bestScore,
  };
}
