import { robustSpread } from './robustSpread.js';
import type { ViewGeometry } from './rotorPlaneAngle.js';

/** A kept detection is off the marker's circle when its rotor-plane radius departs from the median by more than this share of it, at most. */
export const OFF_CIRCLE_SHARE = 0.25;
/** ... or by more than this many robust standard deviations of the radii (1.4826 × their median absolute deviation), if that is less. */
export const OFF_CIRCLE_SIGMAS = 5;
/** The band is never narrower than this, px (the marker's own wobble: compression, a slightly wrong centre). */
export const OFF_CIRCLE_MIN_PX = 2;

/**
 * Distance of an image point from the centre in the rotor's own plane, px of the major axis: the point is
 * rotated into the view ellipse's axes and its minor-axis component stretched by 1/axis_ratio (as in
 * rotorPlaneAngle), so every point of the marker's path has the same value.
 */
export function rotorPlaneRadius(x_px: number, y_px: number, view: ViewGeometry): number {
  const u = x_px - view.cx_px;
  const v = -(y_px - view.cy_px);
  const phi = (view.major_axis_deg * Math.PI) / 180;
  const along = u * Math.cos(phi) + v * Math.sin(phi);
  const across = (-u * Math.sin(phi) + v * Math.cos(phi)) / view.axis_ratio;
  return Math.hypot(along, across);
}

/**
 * Which detections (full-frame px; NaN entries are skipped and never flagged) lie off the marker's circle:
 * rotor-plane radius further from the median radius than a band of OFF_CIRCLE_SIGMAS robust standard
 * deviations of the radii (MAD × 1.4826; common practice, no source), kept between OFF_CIRCLE_MIN_PX and
 * OFF_CIRCLE_SHARE of the median radius. A marker keeps its distance from the axis to within its own scatter
 * (plus what an unfitted tilt adds, which the scatter then includes); a particle or reflection drifting across the region does not.
 * Returns 1 per off-circle detection, the median radius and the band used, px.
 */
export function offCircle(x_px: ArrayLike<number>, y_px: ArrayLike<number>, view: ViewGeometry): { off: Uint8Array; median_radius_px: number; band_px: number } {
  const n = x_px.length;
  const r = new Float64Array(n).fill(NaN);
  const finite: number[] = [];
  for (let i = 0; i < n; i++) {
    if (Number.isFinite(x_px[i]) && Number.isFinite(y_px[i])) {
      r[i] = rotorPlaneRadius(x_px[i], y_px[i], view);
      finite.push(r[i]);
    }
  }
  const off = new Uint8Array(n);
  if (finite.length === 0) return { off, median_radius_px: NaN, band_px: NaN };
  const { median, sigma } = robustSpread(finite);
  const band = Math.max(OFF_CIRCLE_MIN_PX, Math.min(OFF_CIRCLE_SHARE * median, OFF_CIRCLE_SIGMAS * sigma));
  for (let i = 0; i < n; i++) if (Number.isFinite(r[i]) && Math.abs(r[i] - median) > band) off[i] = 1;
  return { off, median_radius_px: median, band_px: band };
}
