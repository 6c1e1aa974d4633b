import type { SynthSpec } from './SynthSpec.js';

/**
 * A region (x, y, w, h, px) around the fixed fiducial, grown by the shake allowance, that an anchor tracker
 * can lock onto; null when the scene has no fiducial.
 */
export function anchorRegion(spec: SynthSpec): { x: number; y: number; w: number; h: number } | null {
  const fid = spec.background.fiducial;
  if (!fid) return null;
  const { translation_px, rotation_deg } = spec.realism.shake;
  const halfDiagonal_px = Math.hypot(spec.width_px, spec.height_px) / 2;
  const grow = Math.ceil(4 + 3 * (translation_px + (rotation_deg * Math.PI / 180) * halfDiagonal_px));
  const x = Math.max(0, fid.x_px - grow);
  const y = Math.max(0, fid.y_px - grow);
  return { x, y, w: Math.min(spec.width_px, fid.x_px + fid.size_px + grow) - x, h: Math.min(spec.height_px, fid.y_px + fid.size_px + grow) - y };
}
