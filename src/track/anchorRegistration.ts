import { Matrix, solve } from 'ml-matrix';
import type { PlacedImage } from './anchorSmoothing.js';

/**
 * Rigid motion of the image about a pivot: a point X0 of the first frame appears at
 * X = pivot + (dx, dy) + R(rotation)(X0 − pivot) in this frame, full-frame px; rotation in deg,
 * counterclockwise positive as displayed (y down, so R(φ) = [[cos φ, sin φ], [−sin φ, cos φ]]).
 */
export interface RigidMotion {
  dx_px: number;
  dy_px: number;
  rotation_deg: number;
}

/** Template pixels of one fixed region in the first frame: positions (full-frame px) and smoothed gray values. */
export interface TemplatePart {
  x_px: Float64Array;
  y_px: Float64Array;
  value: Float64Array;
}

/** The fixed regions' pixels (one part per region) and the pivot of the motion, full-frame px. */
export interface AnchorTemplate {
  parts: TemplatePart[];
  pivot_x_px: number;
  pivot_y_px: number;
}

export interface RigidRegistrationOptions {
  /** Gauss–Newton iterations at most. Default 40. */
  max_iterations?: number;
  /** Stop when no template pixel moves more than this between iterations, px. Default 1e-4. */
  tolerance_px?: number;
  /** Share of template pixels that must land inside the image (the rest may have left the frame). Default 0.6. */
  min_inside?: number;
}

export interface RigidRegistration {
  motion: RigidMotion;
  /** Zero-mean normalised cross-correlation of template and warped image at the end, −1..1 (0 on failure). */
  correlation: number;
  converged: boolean;
  iterations: number;
}

/** Central-difference gradients of a placed image, per px (one-sided at the borders). */
function gradients(image: PlacedImage): { gx: Float32Array; gy: Float32Array } {
  const { data, width: w, height: h } = image;
  const gx = new Float32Array(w * h);
  const gy = new Float32Array(w * h);
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      const i = y * w + x;
      const xl = x > 0 ? x - 1 : x;
      const xr = x < w - 1 ? x + 1 : x;
      const yu = y > 0 ? y - 1 : y;
      const yd = y < h - 1 ? y + 1 : y;
      gx[i] = xr > xl ? (data[y * w + xr] - data[y * w + xl]) / (xr - xl) : 0;
      gy[i] = yd > yu ? (data[yd * w + x] - data[yu * w + x]) / (yd - yu) : 0;
    }
  }
  return { gx, gy };
}

/**
 * Refines the rigid motion (translation, rotation) that maps the template into the images (images[k]
 * holds the current frame around template part k), together with a gain and offset of brightness, by Gauss–Newton least squares on the pixel differences
 * (forward-additive Lucas–Kanade; Baker & Matthews, "Lucas-Kanade 20 years on", IJCV 2004 — cited from
 * memory), sampling the image and its gradients bilinearly. Starts from `init`.
 */
export function registerRigid(template: AnchorTemplate, images: PlacedImage[], init: RigidMotion, options: RigidRegistrationOptions = {}): RigidRegistration {
  const maxIterations = options.max_iterations ?? 40;
  const tolerance = options.tolerance_px ?? 1e-4;
  const minInside = options.min_inside ?? 0.6;
  if (images.length !== template.parts.length) throw new RangeError(`need one image per template part, got ${images.length} for ${template.parts.length}`);
  const parts = template.parts.map((part, k) => {
    const n = part.value.length;
    const u = new Float64Array(n);
    const v = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      u[i] = part.x_px[i] - template.pivot_x_px;
      v[i] = part.y_px[i] - template.pivot_y_px;
    }
    return { part, image: images[k], ...gradients(images[k]), u, v, sampled: new Float64Array(n), valid: new Uint8Array(n) };
  });
  let total = 0;
  let reach = 0;
  for (const p of parts) {
    total += p.u.length;
    for (let i = 0; i < p.u.length; i++) reach = Math.max(reach, Math.hypot(p.u[i], p.v[i]));
  }
  let tx = init.dx_px;
  let ty = init.dy_px;
  let phi = (init.rotation_deg * Math.PI) / 180;
  let gain = 1;
  let offset = 0;
  const failure = (iterations: number): RigidRegistration => ({
    motion: { dx_px: Number.NaN, dy_px: Number.NaN, rotation_deg: Number.NaN },
    correlation: 0,
    converged: false,
    iterations,
  });

  let converged = false;
  let iterations = 0;
  const J = new Float64Array(5);
  for (; iterations < maxIterations && !converged; iterations++) {
    const c = Math.cos(phi);
    const s = Math.sin(phi);
    const H = new Float64Array(25);
    const g = new Float64Array(5);
    let inside = 0;
    for (const p of parts) {
      const { image, gx, gy, u, v, sampled, valid } = p;
      const value = p.part.value;
      const w = image.width;
      const h = image.height;
      const px = template.pivot_x_px + tx - image.x0_px;
      const py = template.pivot_y_px + ty - image.y0_px;
      for (let i = 0; i < u.length; i++) {
        const x = px + c * u[i] + s * v[i];
        const y = py - s * u[i] + c * v[i];
        const x0 = Math.floor(x);
        const y0 = Math.floor(y);
        if (x0 < 0 || y0 < 0 || x0 >= w - 1 || y0 >= h - 1) {
          valid[i] = 0;
          continue;
        }
        valid[i] = 1;
        inside++;
        const fx = x - x0;
        const fy = y - y0;
        const k = y0 * w + x0;
        const w00 = (1 - fx) * (1 - fy);
        const w10 = fx * (1 - fy);
        const w01 = (1 - fx) * fy;
        const w11 = fx * fy;
        const iv = w00 * image.data[k] + w10 * image.data[k + 1] + w01 * image.data[k + w] + w11 * image.data[k + w + 1];
        const ix = w00 * gx[k] + w10 * gx[k + 1] + w01 * gx[k + w] + w11 * gx[k + w + 1];
        const iy = w00 * gy[k] + w10 * gy[k + 1] + w01 * gy[k + w] + w11 * gy[k + w + 1];
        sampled[i] = iv;
        const t = value[i];
        const e = iv - (gain * t + offset);
        J[0] = ix;
        J[1] = iy;
        J[2] = ix * (-s * u[i] + c * v[i]) + iy * (-c * u[i] - s * v[i]);
        J[3] = -t;
        J[4] = -1;
        for (let a = 0; a < 5; a++) {
          g[a] += J[a] * e;
          for (let b = a; b < 5; b++) H[a * 5 + b] += J[a] * J[b];
        }
      }
    }
    if (inside < minInside * total) return failure(iterations);
    for (let a = 0; a < 5; a++) for (let b = 0; b < a; b++) H[a * 5 + b] = H[b * 5 + a];
    let delta: number[];
    try {
      const rows = Array.from({ length: 5 }, (_, a) => Array.from(H.subarray(a * 5, a * 5 + 5)));
      delta = solve(new Matrix(rows), Matrix.columnVector(Array.from(g, (x) => -x))).to1DArray();
    } catch {
      return failure(iterations);
    }
    if (!delta.every(Number.isFinite)) return failure(iterations);
    tx += delta[0];
    ty += delta[1];
    phi += delta[2];
    gain += delta[3];
    offset += delta[4];
    converged = Math.hypot(delta[0], delta[1]) + Math.abs(delta[2]) * reach < tolerance;
  }

  // Correlation of template and the image sampled at the final motion, over all parts.
  let sumT = 0;
  let sumI = 0;
  let m = 0;
  for (const p of parts) {
    for (let i = 0; i < p.u.length; i++) {
      if (!p.valid[i]) continue;
      sumT += p.part.value[i];
      sumI += p.sampled[i];
      m++;
    }
  }
  const meanT = sumT / m;
  const meanI = sumI / m;
  let cross = 0;
  let eT = 0;
  let eI = 0;
  for (const p of parts) {
    for (let i = 0; i < p.u.length; i++) {
      if (!p.valid[i]) continue;
      const a = p.part.value[i] - meanT;
      const b = p.sampled[i] - meanI;
      cross += a * b;
      eT += a * a;
      eI += b * b;
    }
  }
  const correlation = eT > 0 && eI > 0 ? cross / Math.sqrt(eT * eI) : 0;
  return {
    motion: { dx_px: tx, dy_px: ty, rotation_deg: (phi * 180) / Math.PI },
    correlation,
    converged,
    iterations,
  };
}
