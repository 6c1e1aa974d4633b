/** How the rotor plane appears in the image: an ellipse centred on the axis (a circle when axis_ratio = 1). */
export interface ViewGeometry {
  cx_px: number;
  cy_px: number;
  /** semi-minor / semi-major, in (0, 1]. */
  axis_ratio: number;
  /** Major axis direction, degrees counterclockwise from +x as displayed. */
  major_axis_deg: number;
}

/**
 * Angle of an image point in the rotor's own plane, degrees in (−180, 180], counterclockwise positive
 * as seen in the displayed video, measured from the +x direction of the image.
 * Under an affine (weak-perspective) view the rotor circle appears as the ellipse `view`; the point is
 * rotated into the ellipse's axes, the minor-axis component is stretched by 1/axis_ratio back to the
 * circle, and the major-axis direction is added back. With axis_ratio = 1 this is the plain polar angle
 * atan2(−(y − cy), x − cx).
 */
export function rotorPlaneAngle(x_px: number, y_px: number, view: ViewGeometry): number {
  const u = x_px - view.cx_px;
  const v = -(y_px - view.cy_px);
  if (view.axis_ratio === 1) return wrapDeg((Math.atan2(v, u) * 180) / Math.PI);
  const phi = (view.major_axis_deg * Math.PI) / 180;
  const c = Math.cos(phi);
  const s = Math.sin(phi);
  const along = u * c + v * s;
  const across = (-u * s + v * c) / view.axis_ratio;
  return wrapDeg((Math.atan2(across, along) * 180) / Math.PI + view.major_axis_deg);
}

/** Wraps an angle in degrees into (−180, 180]. */
export function wrapDeg(a_deg: number): number {
  let a = a_deg % 360;
  if (a <= -180) a += 360;
  else if (a > 180) a -= 360;
  return a;
}
