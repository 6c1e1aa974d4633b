import { InputError } from '../errors.js';

/** Checks the inputs shared by the dynamics fits; throws InputError with one sentence. */
export function checkDynamicsSeries(t_s: Float64Array, angle_deg: Float64Array, what: string, minPoints: number): void {
  if (t_s.length !== angle_deg.length) throw new InputError(`The ${what} fit got ${t_s.length} times but ${angle_deg.length} angles; give one angle per time.`);
  if (t_s.length < minPoints) throw new InputError(`The ${what} fit needs at least ${minPoints} points but got ${t_s.length}; widen the time window.`);
  for (let i = 0; i < t_s.length; i++) {
    if (!Number.isFinite(t_s[i]!) || !Number.isFinite(angle_deg[i]!)) throw new InputError(`The ${what} fit got a missing or non-finite value at row ${i + 1}; drop or fill lost frames first.`);
    if (i > 0 && !(t_s[i]! > t_s[i - 1]!)) throw new InputError(`The ${what} fit needs strictly increasing times, but row ${i + 1} (t = ${t_s[i]} s) does not follow row ${i}; sort the series and drop duplicate times.`);
  }
}
