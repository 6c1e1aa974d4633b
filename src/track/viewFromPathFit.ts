import type { Ellipse } from './fitEllipse.js';
import type { ViewGeometry } from './rotorPlaneAngle.js';
import type { TrackSummary } from './TrackSummary.js';

/** What the view step needs from a fitted marker path (one ellipse, or concentric ones sharing their shape). */
export interface PathFitShape {
  /** The (first) fitted ellipse, full-frame px. */
  ellipse: Ellipse;
  /** semi-minor / semi-major of the path. */
  axis_ratio: number;
  se: { cx_px: number; cy_px: number; axis_ratio: number };
  ci95: { cx_px: [number, number]; cy_px: [number, number]; axis_ratio: [number, number] };
}

/** Where the view comes from besides the path: a given centre, and a given camera tilt (deg) about an image axis (deg). */
export interface ViewSettings {
  centre: { x_px: number; y_px: number } | null;
  tilt_deg?: number;
  tilt_axis_deg?: number;
}

export interface ViewResult {
  view: ViewGeometry;
  view_summary: NonNullable<TrackSummary['view']>;
  centre_summary: TrackSummary['centre'];
}

/** A quantity that was given, not measured: zero standard error, a point interval. */
export function givenQuantity(value: number) {
  return { value, se: 0, ci: [value, value] as [number, number], level: 0.95 };
}

/** arccos in degrees, with the argument clamped to [−1, 1]. */
export function acosDeg(r: number): number {
  return (Math.acos(Math.max(-1, Math.min(1, r))) * 180) / Math.PI;
}

/**
 * The view (centre, axis ratio, major-axis direction) from a fitted marker path: the path's ellipse is used
 * when it differs from a circle by more than 2 standard errors (and 0.2 %), else the camera is taken as
 * square-on; a given tilt overrides the ratio (cos tilt). The summary reports the implied tilt (deg) with
 * its standard error from d(tilt)/d(ratio) = −1/sin(tilt) and an interval that starts at 0° when the path
 * is not distinguishable from a circle, and the centre as fitted or as given.
 * `max_correction_deg` is left 0 for the caller to fill in.
 */
export function viewFromPathFit(fit: PathFitShape, settings: ViewSettings): ViewResult {
  const e = fit.ellipse;
  const ratio = fit.axis_ratio;
  const significant = 1 - ratio > Math.max(0.002, 2 * fit.se.axis_ratio);
  let useRatio = significant ? ratio : 1;
  let axis = e.major_axis_deg;
  if (settings.tilt_deg !== undefined) {
    useRatio = Math.cos((settings.tilt_deg * Math.PI) / 180);
    if (!significant) axis = settings.tilt_axis_deg ?? 0;
  }
  const tiltSe = ratio < 1 ? (fit.se.axis_ratio / Math.sqrt(1 - ratio * ratio)) * (180 / Math.PI) : Number.NaN;
  const centre = settings.centre;
  return {
    view: { cx_px: e.cx_px, cy_px: e.cy_px, axis_ratio: useRatio, major_axis_deg: axis },
    view_summary: {
      semi_major_px: e.semi_major_px,
      semi_minor_px: e.semi_minor_px,
      major_axis_deg: axis,
      axis_ratio: ratio,
      tilt_deg: settings.tilt_deg !== undefined
        ? givenQuantity(settings.tilt_deg)
        // a path not distinguishable from a circle: the interval reaches down to square-on (the ratio of a noisy
        // circle's fitted ellipse is below 1 by construction, so its own interval would exclude 0°)
        : { value: acosDeg(ratio), se: tiltSe, ci: [significant ? acosDeg(fit.ci95.axis_ratio[1]) : 0, acosDeg(fit.ci95.axis_ratio[0])], level: 0.95 },
      max_correction_deg: 0,
      corrected: useRatio !== 1,
    },
    centre_summary: centre
      ? { x_px: givenQuantity(centre.x_px), y_px: givenQuantity(centre.y_px), source: 'given' }
      : {
          x_px: { value: e.cx_px, se: fit.se.cx_px, ci: fit.ci95.cx_px, level: 0.95 },
          y_px: { value: e.cy_px, se: fit.se.cy_px, ci: fit.ci95.cy_px, level: 0.95 },
          source: 'ellipse-fit',
        },
  };
}

/**
 * The view about a given centre when the markers swept too little of their circle to measure it: the given
 * tilt, or square-on with a warning naming the arc (`swept` says who swept it, e.g. "The marker").
 */
export function viewWithoutPathFit(cx_px: number, cy_px: number, settings: ViewSettings, arc_deg: number, swept: string, warnings: string[]): ViewResult {
  const ratio = settings.tilt_deg !== undefined ? Math.cos((settings.tilt_deg * Math.PI) / 180) : 1;
  const view: ViewGeometry = { cx_px, cy_px, axis_ratio: ratio, major_axis_deg: settings.tilt_axis_deg ?? 0 };
  if (settings.tilt_deg === undefined) {
    warnings.push(`${swept} swept only ${arc_deg.toFixed(0)}° about --center, too little to measure the view; angles assume a square-on camera (give the tilt in degrees with --tilt if it is not).`);
  }
  return {
    view,
    view_summary: {
      semi_major_px: Number.NaN,
      semi_minor_px: Number.NaN,
      major_axis_deg: view.major_axis_deg,
      axis_ratio: ratio,
      tilt_deg: givenQuantity(settings.tilt_deg ?? 0),
      max_correction_deg: 0,
      corrected: ratio !== 1,
    },
    centre_summary: { x_px: givenQuantity(cx_px), y_px: givenQuantity(cy_px), source: 'given' },
  };
}
