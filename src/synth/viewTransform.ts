import type { Affine2d } from './affine2d.js';
import { composeAffine } from './affine2d.js';
import type { SynthSpec } from './SynthSpec.js';

/** Camera shake at one instant: image translation, px, and rotation about the frame centre, degrees CCW. */
export interface ShakeState {
  dx_px: number;
  dy_px: number;
  rotation_deg: number;
}

export const NO_SHAKE: ShakeState = { dx_px: 0, dy_px: 0, rotation_deg: 0 };

/**
 * Rotor plane → scene: rotor-plane coordinates (u, v) in px, v pointing up, origin at the centre of
 * rotation, are projected orthographically with the plane tilted by tilt_deg about the in-image axis at
 * axis_deg, so a circle appears as an ellipse with axis ratio cos(tilt) and its major axis along the tilt axis.
 */
export function rotorToScene(spec: Pick<SynthSpec, 'hub' | 'realism'>): Affine2d {
  const alpha = (spec.realism.oblique.axis_deg * Math.PI) / 180;
  const squash = Math.cos((spec.realism.oblique.tilt_deg * Math.PI) / 180);
  const ax = Math.cos(alpha);
  const ay = Math.sin(alpha);
  const nx = -ay;
  const ny = ax;
  // (X, Yup) = (a aᵀ + cosT · n nᵀ) (u, v); image y points down: y = cy − Yup
  const m00 = ax * ax + squash * nx * nx;
  const m01 = ax * ay + squash * nx * ny;
  const m10 = ay * ax + squash * ny * nx;
  const m11 = ay * ay + squash * ny * ny;
  return { a: m00, b: m01, c: spec.hub.cx_px, d: -m10, e: -m11, f: spec.hub.cy_px };
}

/** Scene → displayed image: rotation about the frame centre by the shake angle (CCW as seen), then translation. */
export function sceneToImage(spec: Pick<SynthSpec, 'width_px' | 'height_px'>, shake: ShakeState): Affine2d {
  const rho = (shake.rotation_deg * Math.PI) / 180;
  const c = Math.cos(rho);
  const s = Math.sin(rho);
  const cx = (spec.width_px - 1) / 2;
  const cy = (spec.height_px - 1) / 2;
  // image y points down, so a visually CCW rotation is x' = c·x + s·y, y' = −s·x + c·y about the centre
  return { a: c, b: s, c: cx - c * cx - s * cy + shake.dx_px, d: -s, e: c, f: cy + s * cx - c * cy + shake.dy_px };
}

/** Rotor plane → displayed image for one shake state. */
export function rotorToImage(spec: Pick<SynthSpec, 'hub' | 'realism' | 'width_px' | 'height_px'>, shake: ShakeState): Affine2d {
  return composeAffine(sceneToImage(spec, shake), rotorToScene(spec));
}
