import { InputError } from '../errors.js';
import { thinSeries } from './fitDynamicsCurve.js';

/** Checks the inputs shared by the dynamics fits; throws InputError with one sentence. */
export function checkDynamicsSeries(t_s: Float64Array, angle_deg: Float64Array, what: string, minPoints: number): void {
  if (t_s.length !== angle_deg.length) throw new InputError(`The ${what} fit got ${t_s.length} times but ${angle_deg.length} angles; give one angle per time.`);
  if (t_s.length < minPoints) throw new InputError(`The ${what} fit needs at least ${minPoints} points but got ${t_s.length}; widen the time window.`);
  for (let i = 0; i < t_s.length; i++) {
    if (!Number.isFinite(t_s[i]!) || !Number.isFinite(angle_deg[i]!)) throw new InputError(`The ${what} fit got a missing or non-finite value at row ${i + 1}; drop or fill lost frames first.`);
    if (i > 0 && !(t_s[i]! > t_s[i - 1]!)) throw new InputError(`The ${what} fit needs strictly increasing times, but row ${i + 1} (t = ${t_s[i]} s) does not follow row ${i}; sort the series and drop duplicate times.`);
  }
}

/**
 * Checks a dynamics fit's series and puts it on the fit's own clock: times relative to the first
 * frame (s), plus a thinned copy for the start-value search.
 */
export function dynamicsWindow(
  t_s: Float64Array,
  angle_deg: Float64Array,
  what: string,
  thinnedPoints: number,
): { tRef: number; t: Float64Array; thin: { t: Float64Array; y: Float64Array } } {
  checkDynamicsSeries(t_s, angle_deg, what, 8);
  const tRef = t_s[0]!;
  const t = new Float64Array(t_s.length);
  for (let i = 0; i < t_s.length; i++) t[i] = t_s[i]! - tRef;
  return { tRef, t, thin: thinSeries(t, angle_deg, thinnedPoints) };
}
