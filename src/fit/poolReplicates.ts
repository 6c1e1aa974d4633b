import { InputError } from '../errors.js';
import { type RateEstimate, studentQuantile } from './compareDirections.js';

export interface PoolOptions {
  /** Confidence level, default 0.95. */
  level?: number;
}

/** Replicate runs combined into one rate, with the between-run spread. */
export interface PooledRate extends RateEstimate {
  ci_deg_s: [number, number];
  level: number;
  /** Number of runs pooled. */
  k: number;
  /** Between-run variance τ², (deg/s)², DerSimonian–Laird moment estimate; NaN for one run. */
  tau2_deg2_s2: number;
  /** Standard error of the DerSimonian–Laird estimate, √(1/Σw_i), before the Hartung–Knapp adjustment. */
  se_dl_deg_s: number;
  /** Cochran's Q and I² = max(0, (Q − (k−1))/Q); NaN for one run. */
  q: number;
  i2: number;
  /** A sentence naming the method. */
  method: string;
}

/**
 * Random-effects pooling of replicate runs (DerSimonian & Laird 1986): τ² by the method of moments,
 * weights 1/(se_i² + τ²); the interval uses the Hartung–Knapp–Sidik–Jonkman variance with t on k − 1 df,
 * never narrower than the DerSimonian–Laird one (the modification of Röver, Knapp & Friede 2015).
 * One run is returned as it is (no between-run spread can be estimated from it).
 */
export function poolReplicates(estimates: readonly RateEstimate[], options: PoolOptions = {}): PooledRate {
  const level = options.level ?? 0.95;
  const k = estimates.length;
  if (k === 0) throw new InputError('No runs were given to pool; give at least one run with a rate.');
  for (const e of estimates) {
    if (!Number.isFinite(e.value_deg_s) || !(e.se_deg_s > 0) || !Number.isFinite(e.se_deg_s)) {
      throw new InputError(`A replicate rate (${e.value_deg_s} ± ${e.se_deg_s} deg/s) has no usable standard error; each run needs a finite rate and a positive standard error.`);
    }
  }
  if (k === 1) {
    const e = estimates[0]!;
    const t = studentQuantile(1 - (1 - level) / 2, e.df);
    return {
      value_deg_s: e.value_deg_s,
      se_deg_s: e.se_deg_s,
      df: e.df,
      ci_deg_s: [e.value_deg_s - t * e.se_deg_s, e.value_deg_s + t * e.se_deg_s],
      level,
      k,
      tau2_deg2_s2: Number.NaN,
      se_dl_deg_s: e.se_deg_s,
      q: Number.NaN,
      i2: Number.NaN,
      method: 'Single run: its own interval; the spread between runs is unknown without replicates.',
    };
  }
  // Fixed-effect (inverse-variance) step for Cochran's Q.
  let sw = 0;
  let sw2 = 0;
  let swy = 0;
  for (const e of estimates) {
    const w = 1 / e.se_deg_s ** 2;
    sw += w;
    sw2 += w * w;
    swy += w * e.value_deg_s;
  }
  const fixedMean = swy / sw;
  let q = 0;
  for (const e of estimates) q += (e.value_deg_s - fixedMean) ** 2 / e.se_deg_s ** 2;
  const tau2 = Math.max(0, (q - (k - 1)) / (sw - sw2 / sw));
  // Random-effects step.
  let swr = 0;
  let swry = 0;
  for (const e of estimates) {
    const w = 1 / (e.se_deg_s ** 2 + tau2);
    swr += w;
    swry += w * e.value_deg_s;
  }
  const mean = swry / swr;
  let qHk = 0;
  for (const e of estimates) qHk += (e.value_deg_s - mean) ** 2 / (e.se_deg_s ** 2 + tau2);
  qHk /= k - 1;
  const se = Math.sqrt(Math.max(1, qHk) / swr);
  const df = k - 1;
  const t = studentQuantile(1 - (1 - level) / 2, df);
  return {
    value_deg_s: mean,
    se_deg_s: se,
    df,
    ci_deg_s: [mean - t * se, mean + t * se],
    level,
    k,
    tau2_deg2_s2: tau2,
    se_dl_deg_s: Math.sqrt(1 / swr),
    q,
    i2: q > 0 ? Math.max(0, (q - (k - 1)) / q) : 0,
    method: `Random-effects pooling of ${k} runs (DerSimonian–Laird between-run variance; Hartung–Knapp interval on ${df} df, never narrower than DerSimonian–Laird).`,
  };
}
