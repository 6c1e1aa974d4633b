import { InputError } from '../errors.js';

/**
 * A gray image region cut from a displayed video frame: one byte per pixel, row-major; the
 * array's pixel (0,0) sits at (origin_x_px, origin_y_px) in full-frame px. Pixel centres lie on
 * integer coordinates (pixel column i covers x in [i − 0.5, i + 0.5]).
 */
export interface GrayCrop {
  data: Uint8Array;
  width: number;
  height: number;
  origin_x_px: number;
  origin_y_px: number;
}

export interface PolarGridOptions {
  /** Inner radius of the annulus, px (≥ 0). */
  r_inner_px: number;
  /** Outer radius of the annulus, px (> r_inner_px). */
  r_outer_px: number;
  /** Number of angle samples around the circle (columns of the unwrapped image). */
  angular_bins: number;
  /** Distance between sampled radii, px. Default 1. */
  radial_step_px?: number;
}

/** Where an annulus is sampled: radii (rows) and angles (columns), precomputed once. */
export interface PolarGrid {
  radii_px: Float64Array;
  angular_bins: number;
  /** cos and sin of the column angles θ_j = 360·j/angular_bins deg, counterclockwise from +x as displayed. */
  cos: Float64Array;
  sin: Float64Array;
}

/** Builds the sampling grid of an annulus: radii every radial_step_px from r_inner_px to r_outer_px, angles evenly spaced. */
export function createPolarGrid(options: PolarGridOptions): PolarGrid {
  const step = options.radial_step_px ?? 1;
  const { r_inner_px, r_outer_px, angular_bins } = options;
  if (!(r_inner_px >= 0) || !(r_outer_px > r_inner_px)) {
    throw new InputError(`the texture annulus needs 0 ≤ inner radius < outer radius, got ${r_inner_px} and ${r_outer_px} px; give two radii in that order`);
  }
  if (!Number.isInteger(angular_bins) || angular_bins < 8) {
    throw new InputError(`the texture annulus needs at least 8 whole angle samples, got ${angular_bins}; give a larger number`);
  }
  if (!(step > 0)) throw new InputError(`the radial step of the texture annulus must be positive, got ${step} px`);
  const rows = Math.max(1, Math.floor((r_outer_px - r_inner_px) / step + 1e-9) + 1);
  const radii_px = new Float64Array(rows);
  for (let r = 0; r < rows; r++) radii_px[r] = r_inner_px + r * step;
  const cos = new Float64Array(angular_bins);
  const sin = new Float64Array(angular_bins);
  for (let j = 0; j < angular_bins; j++) {
    const theta = (2 * Math.PI * j) / angular_bins;
    cos[j] = Math.cos(theta);
    sin[j] = Math.sin(theta);
  }
  return { radii_px, angular_bins, cos, sin };
}

/**
 * Unwraps an annulus of a gray image into polar form by bilinear sampling: row r is the circle of
 * radius grid.radii_px[r] around `centre` (full-frame px), column j the angle 360·j/bins deg
 * counterclockwise from +x as displayed (image y points down, so a point at angle θ sits at
 * x = cx + r·cos θ, y = cy − r·sin θ). Returns rows × bins gray values, row-major.
 * Throws InputError when the annulus reaches outside the crop.
 */
export function polarUnwrap(frame: GrayCrop, grid: PolarGrid, centre: { x_px: number; y_px: number }): Float64Array {
  const { data, width, height } = frame;
  const cx = centre.x_px - frame.origin_x_px;
  const cy = centre.y_px - frame.origin_y_px;
  const rows = grid.radii_px.length;
  const bins = grid.angular_bins;
  const rMax = grid.radii_px[rows - 1];
  if (!(cx - rMax >= 0 && cy - rMax >= 0 && cx + rMax <= width - 1 && cy + rMax <= height - 1)) {
    throw new InputError(
      `the texture annulus (centre ${centre.x_px.toFixed(1)},${centre.y_px.toFixed(1)} px, outer radius ${rMax} px) reaches outside the ` +
        `${width}×${height} region at ${frame.origin_x_px},${frame.origin_y_px}; enlarge the region of interest or give a smaller radius`,
    );
  }
  const out = new Float64Array(rows * bins);
  for (let r = 0; r < rows; r++) {
    const radius = grid.radii_px[r];
    const rowOffset = r * bins;
    for (let j = 0; j < bins; j++) {
      const x = cx + radius * grid.cos[j];
      const y = cy - radius * grid.sin[j];
      let x0 = Math.floor(x);
      let y0 = Math.floor(y);
      // Keep the 2×2 neighbourhood inside the image when x or y sits exactly on the last pixel.
      if (x0 >= width - 1) x0 = width - 2;
      if (y0 >= height - 1) y0 = height - 2;
      const fx = x - x0;
      const fy = y - y0;
      const i00 = y0 * width + x0;
      const top = data[i00] + fx * (data[i00 + 1] - data[i00]);
      const bottom = data[i00 + width] + fx * (data[i00 + width + 1] - data[i00 + width]);
      out[rowOffset + j] = top + fy * (bottom - top);
    }
  }
  return out;
}
