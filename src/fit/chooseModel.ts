/**
 * Choice among fitted models (steady, spin-up, coast-down) by the Bayesian information criterion
 * (Schwarz 1978) computed on an effective sample size.
 *
 * For Gaussian errors BIC = n·ln(RSS/n) + k·ln(n). Tracking residuals are autocorrelated, and treating n
 * correlated points as independent inflates every likelihood difference by about n/n_eff, so a richer model
 * would win on noise alone. We therefore count n_eff points, as the best-fitting candidate reports it (the
 * dynamics fits use batch means of their residuals, batchMeansEffectiveSize.ts, which also sees slow wander):
 *   score = n_eff·ln(RSS/n) + k·ln(n_eff).
 * The same n_eff is used for every candidate so the scores stay comparable. The lowest score wins; the choice
 * is called ambiguous when the runner-up is within 2 (Kass & Raftery 1995: a BIC difference of 0–2 is
 * "not worth more than a bare mention"; from memory). A candidate marked `excluded` (not physically
 * meaningful, e.g. a coast-down that gains speed) is scored but not chosen while another candidate is left. This is a simple correction, not a full likelihood for
 * correlated errors: it is honest about the direction of the bias, not exact.
 */
import type { ModelName } from './FitReport.js';
import type { ModelCandidate, ModelChoice } from './ModelFit.js';

export interface ChooseModelOptions {
  /** Score difference below which the choice is reported as ambiguous. Default 2. */
  ambiguityMargin?: number;
}

/** Picks the model with the lowest effective-sample BIC and says whether the runner-up is too close to call. */
export function chooseModel(candidates: ModelCandidate[], options: ChooseModelOptions = {}): ModelChoice {
  if (candidates.length === 0) throw new RangeError('chooseModel needs at least one candidate.');
  const margin = options.ambiguityMargin ?? 2;
  const n = candidates[0]!.n;
  for (const c of candidates) {
    if (c.n !== n) throw new RangeError(`chooseModel got candidates fitted to different numbers of points (${n} and ${c.n}); fit every model to the same window.`);
  }
  const withEff = candidates.filter((c) => c.n_eff !== undefined && Number.isFinite(c.n_eff));
  const reference = withEff.length > 0 ? withEff.reduce((a, b) => (b.rss < a.rss ? b : a)) : undefined;
  const nEff = Math.max(2, Math.min(n, reference?.n_eff ?? n));
  // Floor on RSS so a perfect fit does not give −∞ (relative to the largest RSS).
  const floor = Math.max(...candidates.map((c) => c.rss)) * 1e-300 || Number.MIN_VALUE;
  const scores: Partial<Record<ModelName, number>> = {};
  for (const c of candidates) scores[c.model] = nEff * Math.log(Math.max(c.rss, floor) / n) + c.k * Math.log(nEff);
  // Candidates flagged as not physically meaningful are scored but only chosen if nothing else is left.
  const eligible = candidates.some((c) => c.excluded === undefined) ? candidates.filter((c) => c.excluded === undefined) : candidates;
  const ranked = eligible.map((c) => ({ model: c.model, score: scores[c.model]! })).sort((a, b) => a.score - b.score);
  const best = ranked[0]!;
  const ambiguous = ranked.length > 1 && ranked[1]!.score - best.score < margin;
  const rule =
    `lowest BIC on an effective sample size (score = n_eff·ln(RSS/n) + k·ln(n_eff), n_eff = ${nEff.toFixed(1)} of n = ${n} from the residuals of the best-fitting model); ` +
    `ambiguous when the runner-up is within ${margin}` +
    candidates.filter((c) => c.excluded !== undefined).map((c) => `; ${c.model} not eligible: ${c.excluded}`).join('');
  return { chosen: best.model, scores, ambiguous, rule };
}
