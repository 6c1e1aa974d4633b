import type { ModelName } from './FitReport.js';

/**
 * What a model-choice rule needs from one fitted model: its name, the number of points n,
 * the number of fitted parameters k and the residual sum of squares (deg²).
 * `n_eff` (optional) is the effective number of independent points when residuals are autocorrelated;
 * `excluded` (optional) says why the model should not be chosen automatically.
 */
export interface ModelCandidate {
  model: ModelName;
  n: number;
  k: number;
  rss: number;
  n_eff?: number;
  /** Set when the fit is not physically meaningful (e.g. negative friction): scored, but not chosen automatically. */
  excluded?: string;
}

/** The outcome of a model choice: the chosen model, each candidate's score (lower is better), whether the choice is ambiguous, and the rule in words. */
export interface ModelChoice {
  chosen: ModelName;
  scores: Partial<Record<ModelName, number>>;
  ambiguous: boolean;
  rule: string;
}

/**
 * A fitted dynamics model: the report-ready result (estimates with intervals), its model-choice
 * candidate, residuals (deg, data − model), prediction of angle (deg) and rate (deg/s) at a time (s),
 * whether the optimiser converged, and warnings for a person.
 */
export interface ModelFit<R> {
  result: R;
  candidate: ModelCandidate;
  residuals_deg: Float64Array;
  predict_deg: (t_s: number) => number;
  rate_deg_s: (t_s: number) => number;
  converged: boolean;
  warnings: string[];
}
