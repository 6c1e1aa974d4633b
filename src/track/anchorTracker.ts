import { InputError } from '../errors.js';
import { registerRigid, type AnchorTemplate, type RigidMotion, type TemplatePart } from './anchorRegistration.js';
import { searchTranslation } from './anchorSearch.js';
import { smoothRegion, type PixelRect, type PlacedImage } from './anchorSmoothing.js';
import type { GrayCrop } from './polarUnwrap.js';

export type { GrayCrop } from './polarUnwrap.js';
export type { RigidMotion } from './anchorRegistration.js';
export type { PixelRect } from './anchorSmoothing.js';

export interface AnchorTrackerOptions {
  /** A part of the scene that does not move (full-frame px of the first frame): its texture gives the camera motion. */
  anchor: PixelRect;
  /**
   * Optional second fixed region, far from the first: both are registered together, so the rotation is
   * measured over their distance instead of across one small patch. Default none.
   */
  second_anchor?: PixelRect;
  /** Largest camera shift between two successive frames, px (whole-pixel search range). Default 16. */
  search_px?: number;
  /** Gaussian smoothing of template and frame before registering, sigma in px. Default 1. */
  smoothing_px?: number;
  /** Correlation under which a frame's camera motion is reported unknown (NaN, quality 0). Default 0.5. */
  min_quality?: number;
}

/** Camera motion of one frame relative to the first, about the tracker's pivot (see RigidMotion), and how well it was measured. */
export interface CameraMotion extends RigidMotion {
  /** Normalised correlation of the anchor content with the first frame's, 0..1; 0 with NaN motion when lost. */
  quality: number;
}

export interface AnchorTracker {
  /** Camera motion of this frame relative to the first (the first frame gives zero motion, quality 1). */
  update(frame: GrayCrop): CameraMotion;
  /** The point the rotation is measured about: centre of the first anchor in the first frame, full-frame px. */
  readonly pivot: { x_px: number; y_px: number };
}

/**
 * Maps a point measured in a frame back into the first frame's coordinates by undoing the camera
 * motion: X0 = pivot + R(−rotation)(X − pivot − (dx, dy)), full-frame px. `pivot` must be the one the
 * motion was measured about (AnchorTracker.pivot). NaN motion gives a NaN point.
 */
export function removeCameraMotion(
  point: { x_px: number; y_px: number },
  motion: RigidMotion,
  pivot: { x_px: number; y_px: number },
): { x_px: number; y_px: number } {
  const phi = (motion.rotation_deg * Math.PI) / 180;
  const c = Math.cos(phi);
  const s = Math.sin(phi);
  const ax = point.x_px - pivot.x_px - motion.dx_px;
  const ay = point.y_px - pivot.y_px - motion.dy_px;
  return { x_px: pivot.x_px + c * ax - s * ay, y_px: pivot.y_px + s * ax + c * ay };
}

/** Applies a camera motion to a first-frame point: where it appears in the moved frame (inverse of removeCameraMotion). */
export function applyCameraMotion(
  point: { x_px: number; y_px: number },
  motion: RigidMotion,
  pivot: { x_px: number; y_px: number },
): { x_px: number; y_px: number } {
  const phi = (motion.rotation_deg * Math.PI) / 180;
  const c = Math.cos(phi);
  const s = Math.sin(phi);
  const u = point.x_px - pivot.x_px;
  const v = point.y_px - pivot.y_px;
  return { x_px: pivot.x_px + motion.dx_px + c * u + s * v, y_px: pivot.y_px + motion.dy_px - s * u + c * v };
}

function checkRect(name: string, rect: PixelRect): void {
  const ok = [rect.x, rect.y, rect.w, rect.h].every(Number.isInteger) && rect.w >= 8 && rect.h >= 8;
  if (!ok) {
    throw new InputError(`${name} ${rect.x},${rect.y},${rect.w},${rect.h} must be whole pixels x,y,w,h with w and h at least 8; give a larger region of still scenery`);
  }
}

/**
 * Measures camera motion (shake, drift, a small roll of the camera) from fixed scene regions: each
 * region is found by an exhaustive whole-pixel normalised cross-correlation search around the previous
 * frame's motion (±3 px first, the whole search_px range when the best match lies on that edge or is poor), then translation, rotation and a brightness gain/offset are refined together by
 * Gauss–Newton on the smoothed pixels (registerRigid). Every frame is registered against the first
 * frame's content, so the motion does not drift.
 */
export function createAnchorTracker(options: AnchorTrackerOptions): AnchorTracker {
  const rects = [options.anchor, ...(options.second_anchor ? [options.second_anchor] : [])];
  checkRect('the anchor region', options.anchor);
  if (options.second_anchor) checkRect('the second anchor region', options.second_anchor);
  const searchPx = Math.max(1, Math.round(options.search_px ?? 16));
  const sigma = options.smoothing_px ?? 1;
  const minQuality = options.min_quality ?? 0.5;
  const centres = rects.map((r) => ({ x_px: r.x + (r.w - 1) / 2, y_px: r.y + (r.h - 1) / 2 }));
  const pivot = { ...centres[0] };
  let template: AnchorTemplate | null = null;
  let patches: PlacedImage[] = [];
  let last: RigidMotion = { dx_px: 0, dy_px: 0, rotation_deg: 0 };
  const lost: CameraMotion = { dx_px: Number.NaN, dy_px: Number.NaN, rotation_deg: Number.NaN, quality: 0 };

  const start = (frame: GrayCrop): CameraMotion => {
    const parts: TemplatePart[] = [];
    patches = rects.map((rect, k) => {
      const inside =
        rect.x >= frame.origin_x_px && rect.y >= frame.origin_y_px &&
        rect.x + rect.w <= frame.origin_x_px + frame.width && rect.y + rect.h <= frame.origin_y_px + frame.height;
      const patch = inside ? smoothRegion(frame, rect, sigma) : null;
      if (!patch) {
        throw new InputError(
          `${k === 0 ? 'the anchor region' : 'the second anchor region'} ${rect.x},${rect.y},${rect.w},${rect.h} lies outside the ` +
            `${frame.width}×${frame.height} image at ${frame.origin_x_px},${frame.origin_y_px}; give a region inside the frame`,
        );
      }
      const n = rect.w * rect.h;
      const part: TemplatePart = { x_px: new Float64Array(n), y_px: new Float64Array(n), value: new Float64Array(n) };
      for (let y = 0; y < rect.h; y++) {
        for (let x = 0; x < rect.w; x++) {
          const i = y * rect.w + x;
          part.x_px[i] = rect.x + x;
          part.y_px[i] = rect.y + y;
          part.value[i] = patch.data[i];
        }
      }
      parts.push(part);
      return patch;
    });
    template = { parts, pivot_x_px: pivot.x_px, pivot_y_px: pivot.y_px };
    last = { dx_px: 0, dy_px: 0, rotation_deg: 0 };
    return { dx_px: 0, dy_px: 0, rotation_deg: 0, quality: 1 };
  };

  return {
    pivot,
    update(frame: GrayCrop): CameraMotion {
      if (!template) return start(frame);
      const phi = (last.rotation_deg * Math.PI) / 180;
      const found: { x_px: number; y_px: number }[] = [];
      const regions: PlacedImage[] = [];
      for (let k = 0; k < rects.length; k++) {
        const rect = rects[k];
        const predicted = applyCameraMotion(centres[k], last, pivot);
        const pdx = Math.round(predicted.x_px - centres[k].x_px);
        const pdy = Math.round(predicted.y_px - centres[k].y_px);
        const turnMargin = Math.ceil(Math.abs(Math.sin(phi)) * Math.hypot(rect.w, rect.h) / 2);
        const margin = searchPx + 3 + turnMargin;
        const region = smoothRegion(frame, { x: rect.x + pdx - margin, y: rect.y + pdy - margin, w: rect.w + 2 * margin, h: rect.h + 2 * margin }, sigma);
        if (!region) return { ...lost };
        // Near the prediction first (cheap); the whole range only if the best match sits on that small window's edge or is poor.
        const near = Math.min(3, searchPx);
        let match = searchTranslation(patches[k], region, { predicted_dx_px: pdx, predicted_dy_px: pdy, radius_px: near });
        const onEdge = Math.abs(Math.round(match.dx_px) - pdx) >= near || Math.abs(Math.round(match.dy_px) - pdy) >= near;
        if (searchPx > near && (onEdge || !(match.score >= 0.9))) {
          match = searchTranslation(patches[k], region, { predicted_dx_px: pdx, predicted_dy_px: pdy, radius_px: searchPx });
        }
        if (!(match.score >= minQuality)) return { ...lost };
        found.push({ x_px: centres[k].x_px + match.dx_px, y_px: centres[k].y_px + match.dy_px });
        regions.push(region);
      }
      // Start from this frame's shift of the first anchor and the last frame's roll; if that fails and there are
      // two anchors, start from the roll of the line joining them (an edge-like second anchor can mislead that).
      const init: RigidMotion = { dx_px: found[0].x_px - centres[0].x_px, dy_px: found[0].y_px - centres[0].y_px, rotation_deg: last.rotation_deg };
      let result = registerRigid(template, regions, init);
      if ((!result.converged || !(result.correlation >= minQuality)) && rects.length === 2) {
        const before = Math.atan2(-(centres[1].y_px - centres[0].y_px), centres[1].x_px - centres[0].x_px);
        const after = Math.atan2(-(found[1].y_px - found[0].y_px), found[1].x_px - found[0].x_px);
        result = registerRigid(template, regions, { ...init, rotation_deg: ((after - before) * 180) / Math.PI });
      }
      if (!result.converged || !(result.correlation >= minQuality)) return { ...lost };
      last = result.motion;
      return { ...result.motion, quality: Math.min(1, Math.max(0, result.correlation)) };
    },
  };
}
