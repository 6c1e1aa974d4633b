import jstatModule from 'jstat';
import { walkInformation, type AngleNoiseModel } from './angleNoiseModel.js';
import { restrictedLogLikelihood } from './stateSpaceGls.js';

const { jStat } = jstatModule;

/**
 * Upper bound (one-sided, at `level`) of a random-walk diffusion q (deg²/s) added to a noise model that has none —
 * the largest rate wander the window does not rule out. q alone is varied: the other noise parameters stay at the
 * variogram fit's values (a plug-in bound, not a full profile likelihood, which would refit them for each q), and the
 * bound is the largest q whose restricted likelihood (restrictedLogLikelihood) is within z²/2 of the best
 * (z = z_level; the one-sided likelihood-ratio form, Self & Liang 1987, J. Am. Stat. Assoc. 82:605, for a best q on
 * the boundary 0). Because the fitted stationary noise may have absorbed part of a real walk, the bound itself falls
 * below the true q more often than 1 − level (a review measured 46–89 % coverage of the bound for walks the fit
 * missed); the interval built on it (wanderAllowedVariance) still covered 95–100 % (bench/RESULTS.md).
 * The search runs on a doubling grid from the score test's detection scale 1/√I_qq (walkInformation, Whittle),
 * stopping three points after the likelihood has fallen below the cut, refines the peak between its neighbours
 * (golden section in ln q) and bisects in ln q for the crossing; at the grid's end
 * (2¹⁶ times that scale) it returns the grid's end. Rows [lo, hi) of t (s, increasing) and y (deg); level ≥ 0.5.
 */
export function walkUpperBound(t: Float64Array, y: Float64Array, lo: number, hi: number, model: AngleNoiseModel, level: number): number {
  const frames = hi - lo;
  const delta_s = (t[hi - 1]! - t[lo]!) / Math.max(1, frames - 1);
  const info = walkInformation({ ...model, walk_deg2_per_s: 0 }, delta_s, frames);
  const scale = Number.isFinite(info) && info > 0 ? 1 / Math.sqrt(info) : 0;
  if (!(scale > 0)) return 0;
  const z = jStat.normal.inv(Math.max(0.5, level), 0, 1);
  const like = (q: number): number => restrictedLogLikelihood(t, y, lo, hi, { ...model, walk_deg2_per_s: q });
  // walk up the grid until the likelihood has fallen below the cut for good (it has one peak in practice)
  const cutBelow = (z * z) / 2;
  const qs: number[] = [0];
  const values: number[] = [like(0)];
  let bestAt = 0;
  let below = 0;
  let ended = true;
  for (let k = -4; k <= 16; k++) {
    const q = scale * 2 ** k;
    const v = like(q);
    qs.push(q);
    values.push(v);
    if (v > values[bestAt]!) bestAt = values.length - 1;
    if (v >= values[bestAt]! - cutBelow) below = 0;
    else if (++below >= 3) { ended = false; break; }
  }
  if (ended) return scale * 2 ** 16; // still inside at the grid's end: a wander far above the detection scale
  // the peak between its grid neighbours (golden-section search in ln q), so the cut is measured from the true best
  let best = values[bestAt]!;
  if (bestAt > 0) {
    let a = Math.log(qs[Math.max(1, bestAt - 1)]!);
    let b = Math.log(qs[Math.min(qs.length - 1, bestAt + 1)]!);
    const g = (Math.sqrt(5) - 1) / 2;
    let c = b - g * (b - a);
    let d = a + g * (b - a);
    let fc = like(Math.exp(c));
    let fd = like(Math.exp(d));
    for (let step = 0; step < 12; step++) {
      if (fc > fd) { b = d; d = c; fd = fc; c = b - g * (b - a); fc = like(Math.exp(c)); }
      else { a = c; c = d; fc = fd; d = a + g * (b - a); fd = like(Math.exp(d)); }
    }
    best = Math.max(best, fc, fd);
  }
  // the last grid point above the cut and the next one bracket the bound; bisect in ln q between them
  let inside = bestAt;
  while (inside + 1 < qs.length && values[inside + 1]! >= best - cutBelow) inside++;
  let inQ = Math.max(qs[inside]!, scale * 2 ** -5);
  let outQ = inside + 1 < qs.length ? qs[inside + 1]! : 2 * inQ;
  for (let step = 0; step < 10 && outQ / inQ > 1.005; step++) {
    const mid = Math.sqrt(inQ * outQ);
    if (like(mid) >= best - cutBelow) inQ = mid;
    else outQ = mid;
  }
  return Math.sqrt(inQ * outQ);
}

/** A slope variance that allows for a walk up to a bound, with the Student-t df of that variance. */
export interface WanderAllowedVariance {
  /** Slope variance, (deg/s)². */
  variance: number;
  /** Satterthwaite degrees of freedom. */
  df: number;
}

/**
 * The steady slope's variance when the angle may carry a random walk up to q_U (deg²/s) that the noise model did
 * not include. Such a walk adds q·trueVar to the slope's variance but only q·jackknifeVar to the expected
 * jackknife variance (walkSensitivity in steadyRate.ts: the batches see a slow walk only in part), so the part
 * the jackknife cannot see, q_U·max(0, trueVar − jackknifeVar), is added to the jackknife variance J. The added
 * part is a fixed allowance, so by Satterthwaite (1946) the df grow with it: ν = ν_J·((J + allowance)/J)²,
 * at most 1000. A bound, not an estimate: it keeps the interval honest for any walk up to q_U (walkUpperBound) at the price of
 * a wider interval when there is none.
 * @param jackknifeVar_deg2_s2 the jackknife slope variance J (after its bias factor), (deg/s)²
 * @param jackknifeDf ν_J, the jackknife's own Satterthwaite df
 * @param sensitivity slope variance per unit walk diffusion: true, and expected in the (bias-corrected) jackknife
 */
export function wanderAllowedVariance(jackknifeVar_deg2_s2: number, jackknifeDf: number, walkBound_deg2_s: number,
  sensitivity: { trueVar: number; jackknifeVar: number }): WanderAllowedVariance {
  const allowance = walkBound_deg2_s * Math.max(0, sensitivity.trueVar - sensitivity.jackknifeVar);
  const variance = jackknifeVar_deg2_s2 + allowance;
  const df = jackknifeVar_deg2_s2 > 0 ? Math.min(1000, jackknifeDf * (variance / jackknifeVar_deg2_s2) ** 2) : jackknifeDf;
  return { variance, df };
}
