/** Residuals this many times the frame-to-frame noise, and changing slowly, mean the curve misses the data's shape. */
const MISFIT_RATIO = 10;
/** Lag-1 autocorrelation of the residuals above which they are "changing slowly". */
const MISFIT_LAG1 = 0.8;

/**
 * The frame-to-frame noise of an angle series, deg: the median absolute second difference scaled to a standard
 * deviation (a white-noise σ has second differences of variance 6σ²; 1.4826·MAD for a normal σ; common practice, no
 * source). Smooth motion adds its own curvature, so this errs on the high side.
 */
export function frameNoise_deg(angle_deg: ArrayLike<number>): number {
  const d: number[] = [];
  for (let i = 2; i < angle_deg.length; i++) d.push(Math.abs(angle_deg[i]! - 2 * angle_deg[i - 1]! + angle_deg[i - 2]!));
  if (d.length === 0) return Number.NaN;
  d.sort((a, b) => a - b);
  return (1.4826 * d[d.length >> 1]!) / Math.sqrt(6);
}

/**
 * A sentence when a fitted curve does not describe the window, else null: its residuals (RMS, deg) are more than
 * MISFIT_RATIO times the frame-to-frame noise and change slowly (lag-1 autocorrelation above MISFIT_LAG1), as when a
 * coast-down window starts before the drive was cut. Both thresholds are our choices, no source.
 */
export function curveMisfit(model: string, residual_rms_deg: number, lag1: number, angle_deg: ArrayLike<number>): string | null {
  const noise = Math.max(frameNoise_deg(angle_deg), 1e-3);
  const ratio = residual_rms_deg / noise;
  if (!(ratio > MISFIT_RATIO && lag1 > MISFIT_LAG1)) return null;
  return `the ${model} curve does not describe this window: its residuals (RMS ${residual_rms_deg.toPrecision(2)}°) are ${Math.round(ratio)} times the frame-to-frame noise and change slowly, so its numbers and intervals are not to be trusted; check that the window holds only that motion (--from/--to: a coast-down starts when the drive is cut), or try another model`;
}
