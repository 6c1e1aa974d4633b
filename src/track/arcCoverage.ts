/**
 * How much of a full turn the points sweep around a centre: 360° minus the largest empty angular gap,
 * degrees in [0, 360]. Angles are polar angles about (cx, cy); the result does not depend on direction.
 */
export function arcCoverage(x_px: ArrayLike<number>, y_px: ArrayLike<number>, cx_px: number, cy_px: number): number {
  const n = x_px.length;
  if (n < 2) return 0;
  const a = new Float64Array(n);
  for (let i = 0; i < n; i++) a[i] = (Math.atan2(-(y_px[i] - cy_px), x_px[i] - cx_px) * 180) / Math.PI;
  a.sort();
  let gap = a[0] + 360 - a[n - 1];
  for (let i = 1; i < n; i++) gap = Math.max(gap, a[i] - a[i - 1]);
  return 360 - gap;
}
