import jstatModule from 'jstat';
import type { Estimate } from './FitReport.js';
import type { DynamicsCurveFit } from './fitDynamicsCurve.js';

const { jStat } = jstatModule;

/**
 * The Estimate of a reported quantity map(p_j) from a curve fit: the interval is p_j ± t·se(p_j) with t the
 * bootstrap-t quantile when the fit has one, else Student's t at the fit's degrees of freedom, mapped through the increasing function `map` (e.g. exp for a
 * parameter fitted on a log scale, which keeps the interval positive and asymmetric); se by the delta method, scaled so
 * that ±(Student t)·se on the fitting scale spans the reported interval. The bootstrap only ever widens the
 * Student-t interval: a quantile below Student's comes from replicates whose refits stayed near the estimate
 * along a flat ridge (Coulomb and viscous friction confounded in a window where the rate hardly changes gave
 * 0.007 instead of 2), which cannot be told from a real narrowing (a conservative choice of ours, no source).
 */
export function estimateFromCurve(fit: DynamicsCurveFit, j: number, level: number, map: (v: number) => number = (v) => v): Estimate {
  const k = Math.round(Math.sqrt(fit.covariance.length));
  const q = fit.params[j]!;
  const seRaw = Math.sqrt(fit.covariance[j * k + j]!);
  const tStudent = jStat.studentt.inv(0.5 + level / 2, Math.max(1, fit.dof));
  const tq = Math.max(fit.tQuantile?.[j] ?? tStudent, tStudent);
  // Reported se: scaled so that ±(Student t)·se spans the same interval on the fitting scale.
  const seQ = (seRaw * tq) / tStudent;
  const value = map(q);
  const h = Math.max(1e-7 * Math.abs(q), 1e-9);
  const slope = (map(q + h) - map(q - h)) / (2 * h);
  return { value, se: Math.abs(slope) * seQ, ci: [map(q - tStudent * seQ), map(q + tStudent * seQ)], level };
}
