import type { Estimate } from './FitReport.js';

/** Degrees per second to revolutions per minute (360° = 1 rev, 60 s = 1 min). */
export const RPM_PER_DEG_S = 60 / 360;
/** Degrees per second to revolutions per second. */
export const REV_S_PER_DEG_S = 1 / 360;

/** An estimate in other units: value, se and interval multiplied by a positive factor. */
export function scaleEstimate(e: Estimate, factor: number): Estimate {
  return { value: e.value * factor, se: e.se * factor, ci: [e.ci[0] * factor, e.ci[1] * factor], level: e.level };
}
