import { registerRigid, type TemplatePart } from './anchorRegistration.js';
import { smoothRegion } from './anchorSmoothing.js';
import type { GrayCrop } from './polarUnwrap.js';

export interface TextureCentreOptions {
  /** Present guess of the rotation centre in the first view, full-frame px. */
  centre: { x_px: number; y_px: number };
  r_inner_px: number;
  r_outer_px: number;
  /** Rotation of the hub from the first view to the later one, deg, counterclockwise as displayed (a start value, e.g. from the texture tracker). */
  angle_deg: number;
  /** How far the whole image moved between the views (camera shift at the centre), px. Default 0, 0. */
  offset?: { dx_px: number; dy_px: number };
  /** Gaussian smoothing before registering, sigma px. Default 1. */
  smoothing_px?: number;
  /** Smallest rotation that pins the centre down well enough, deg. Default 10. */
  min_angle_deg?: number;
}

/** The refined centre in the first view, full-frame px, and how well the turned texture matched. */
export interface TextureCentre {
  x_px: number;
  y_px: number;
  /** Normalised correlation of the annulus after registration, −1..1. */
  correlation: number;
  /** Rotation found by the registration, deg. */
  angle_deg: number;
}

/**
 * Finds the rotation centre of a textured hub from two views of it turned by a sizeable angle: the
 * annulus of the first view is registered rigidly onto the later view (registerRigid, about the present
 * guess p), giving X' = p + t + R(φ)(X − p); the centre is the motion's fixed point after removing the
 * camera offset o, (I − R(φ))(c − p) = t − o, solved in closed form. Returns null when the rotation is
 * too small to pin the centre down or the registration fails.
 */
export function refineTextureCentre(first: GrayCrop, later: GrayCrop, options: TextureCentreOptions): TextureCentre | null {
  const { centre, r_inner_px, r_outer_px } = options;
  const sigma = options.smoothing_px ?? 1;
  const ox = options.offset?.dx_px ?? 0;
  const oy = options.offset?.dy_px ?? 0;
  if (!(Math.abs(options.angle_deg) >= (options.min_angle_deg ?? 10))) return null;
  const reach = Math.ceil(r_outer_px) + 1;
  const left = Math.floor(centre.x_px) - reach;
  const top = Math.floor(centre.y_px) - reach;
  const side = 2 * reach + 1;
  const patch = smoothRegion(first, { x: left, y: top, w: side, h: side }, sigma);
  if (!patch || patch.x0_px !== left || patch.y0_px !== top || patch.width !== side || patch.height !== side) return null;
  const xs: number[] = [];
  const ys: number[] = [];
  const vs: number[] = [];
  for (let y = 0; y < side; y++) {
    for (let x = 0; x < side; x++) {
      const r = Math.hypot(left + x - centre.x_px, top + y - centre.y_px);
      if (r < r_inner_px || r > r_outer_px) continue;
      xs.push(left + x);
      ys.push(top + y);
      vs.push(patch.data[y * side + x]);
    }
  }
  const part: TemplatePart = { x_px: Float64Array.from(xs), y_px: Float64Array.from(ys), value: Float64Array.from(vs) };
  const margin = 4;
  const image = smoothRegion(later, { x: left + Math.round(ox) - margin, y: top + Math.round(oy) - margin, w: side + 2 * margin, h: side + 2 * margin }, sigma);
  if (!image) return null;
  const result = registerRigid({ parts: [part], pivot_x_px: centre.x_px, pivot_y_px: centre.y_px }, [image], {
    dx_px: ox,
    dy_px: oy,
    rotation_deg: options.angle_deg,
  });
  if (!result.converged) return null;
  const phi = (result.motion.rotation_deg * Math.PI) / 180;
  const c = Math.cos(phi);
  const s = Math.sin(phi);
  const det = (1 - c) * (1 - c) + s * s;
  const bx = result.motion.dx_px - ox;
  const by = result.motion.dy_px - oy;
  // (I − R)⁻¹ = [[1 − c, s], [−s, 1 − c]] / det for R = [[c, s], [−s, c]].
  const ux = ((1 - c) * bx + s * by) / det;
  const uy = (-s * bx + (1 - c) * by) / det;
  return { x_px: centre.x_px + ux, y_px: centre.y_px + uy, correlation: result.correlation, angle_deg: result.motion.rotation_deg };
}
