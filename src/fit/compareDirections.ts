import jstatModule from 'jstat';
import { InputError } from '../errors.js';

const { jStat } = jstatModule;

/** A rate with its standard error, deg/s, and the degrees of freedom behind it (Infinity: normal theory). */
export interface RateEstimate {
  value_deg_s: number;
  se_deg_s: number;
  df: number;
}

/** Two-sided quantile of Student's t (normal when df is infinite or huge): P(T ≤ q) = p. */
export function studentQuantile(p: number, df: number): number {
  return Number.isFinite(df) && df < 1e7 ? jStat.studentt.inv(p, df) : jStat.normal.inv(p, 0, 1);
}

/** Cumulative distribution of Student's t (normal when df is infinite or huge). */
export function studentCdf(x: number, df: number): number {
  return Number.isFinite(df) && df < 1e7 ? jStat.studentt.cdf(x, df) : jStat.normal.cdf(x, 0, 1);
}

/** A confidence set for a ratio: a bounded interval, the complement of an interval (two rays), or everything. */
export interface RatioInterval {
  kind: 'bounded' | 'exclusive' | 'unbounded';
  /** For 'bounded': [lo, hi]; for 'exclusive': the set is (-∞, lo] ∪ [hi, ∞); for 'unbounded': [-∞, ∞]. */
  bounds: [number, number];
  level: number;
}

export interface RatioOptions {
  /** Confidence level, default 0.95. */
  level?: number;
}

/**
 * Fieller's (1954) confidence set for the ratio ρ = numerator/denominator of two independent estimates:
 * all ρ with (N − ρD)² ≤ t²(se_N² + ρ²se_D²), t the two-sided Student quantile at the smaller of the two df.
 * Bounded only when the denominator differs from zero at this level (D² > t²·se_D²).
 */
export function fiellerInterval(numerator: RateEstimate, denominator: RateEstimate, options: RatioOptions = {}): RatioInterval {
  const level = options.level ?? 0.95;
  checkEstimate(numerator, 'numerator');
  checkEstimate(denominator, 'denominator');
  const t = studentQuantile(1 - (1 - level) / 2, Math.min(numerator.df, denominator.df));
  const n = numerator.value_deg_s;
  const d = denominator.value_deg_s;
  const vn = numerator.se_deg_s ** 2;
  const vd = denominator.se_deg_s ** 2;
  const a = d * d - t * t * vd;
  const quarterDiscriminant = t * t * (n * n * vd + d * d * vn - t * t * vn * vd);
  if (a > 0) {
    const root = Math.sqrt(Math.max(0, quarterDiscriminant));
    return { kind: 'bounded', bounds: [(n * d - root) / a, (n * d + root) / a], level };
  }
  if (quarterDiscriminant > 0 && a < 0) {
    const root = Math.sqrt(quarterDiscriminant);
    const r1 = (n * d - root) / a;
    const r2 = (n * d + root) / a;
    return { kind: 'exclusive', bounds: [Math.min(r1, r2), Math.max(r1, r2)], level };
  }
  return { kind: 'unbounded', bounds: [-Infinity, Infinity], level };
}

/**
 * First-order delta-method interval for ρ = N/D of independent estimates: se(ρ) = |ρ|·√((se_N/N)² + (se_D/D)²),
 * written as √(se_N² + ρ²se_D²)/|D| so it stays finite when N = 0; t at the smaller df.
 */
export function deltaRatioInterval(numerator: RateEstimate, denominator: RateEstimate, options: RatioOptions = {}): { value: number; se: number; ci: [number, number]; level: number } {
  const level = options.level ?? 0.95;
  checkEstimate(numerator, 'numerator');
  checkEstimate(denominator, 'denominator');
  const rho = numerator.value_deg_s / denominator.value_deg_s;
  const se = Math.sqrt(numerator.se_deg_s ** 2 + rho * rho * denominator.se_deg_s ** 2) / Math.abs(denominator.value_deg_s);
  const t = studentQuantile(1 - (1 - level) / 2, Math.min(numerator.df, denominator.df));
  return { value: rho, se, ci: [rho - t * se, rho + t * se], level };
}

export interface CompareOptions {
  /** Confidence level of intervals, default 0.95; tests use α = 1 − level. */
  level?: number;
  /** Equivalence margin for "reverse does not turn", deg/s; null or absent: no equivalence test. */
  margin_deg_s?: number | null;
  /** Power for the minimum detectable rate, default 0.8. */
  power?: number;
}

/** Forward against reverse at one setting. */
export interface DirectionComparison {
  forward: RateEstimate;
  reverse: RateEstimate;
  level: number;
  /** reverse/forward (negative: the reverse direction turns the other way). */
  ratio: {
    value: number;
    fieller: RatioInterval;
    delta: { se: number; ci: [number, number] };
  };
  /** One-sided p-value of H0 "reverse turns the same way as forward, or not at all" (t test on the reverse rate). */
  p_opposite: number;
  /** Schuirmann's two one-sided tests of |reverse| < margin; null without a margin. */
  equivalence: { margin_deg_s: number; p_value: number; equivalent: boolean } | null;
  /** Smallest |reverse rate| a two-sided test at α = 1 − level detects with the given power: (t_{1−α/2} + t_{power})·se. */
  min_detectable_deg_s: number;
  power: number;
}

/**
 * Compares the reverse rate with the forward rate at one setting (independent estimates):
 * ratio with Fieller's interval and the delta-method interval, p-value that reverse turns opposite to forward,
 * equivalence of the reverse rate to zero within ±margin (TOST, Schuirmann 1987), minimum detectable reverse rate.
 */
export function compareDirections(forward: RateEstimate, reverse: RateEstimate, options: CompareOptions = {}): DirectionComparison {
  const level = options.level ?? 0.95;
  const power = options.power ?? 0.8;
  checkEstimate(forward, 'forward');
  checkEstimate(reverse, 'reverse');
  const alpha = 1 - level;
  const fieller = fiellerInterval(reverse, forward, { level });
  const delta = deltaRatioInterval(reverse, forward, { level });
  const forwardSign = Math.sign(forward.value_deg_s);
  const z = reverse.value_deg_s / reverse.se_deg_s;
  const p_opposite = forwardSign === 0 ? Number.NaN : 1 - studentCdf(-forwardSign * z, reverse.df);
  let equivalence: DirectionComparison['equivalence'] = null;
  const margin = options.margin_deg_s;
  if (margin !== null && margin !== undefined) {
    if (!(margin > 0) || !Number.isFinite(margin)) throw new InputError(`The equivalence margin ${margin} deg/s is not a positive number; give a margin above zero.`);
    const pLower = 1 - studentCdf((reverse.value_deg_s + margin) / reverse.se_deg_s, reverse.df);
    const pUpper = studentCdf((reverse.value_deg_s - margin) / reverse.se_deg_s, reverse.df);
    const p = Math.max(pLower, pUpper);
    equivalence = { margin_deg_s: margin, p_value: p, equivalent: p < alpha };
  }
  const min_detectable_deg_s = (studentQuantile(1 - alpha / 2, reverse.df) + studentQuantile(power, reverse.df)) * reverse.se_deg_s;
  return {
    forward,
    reverse,
    level,
    ratio: { value: delta.value, fieller, delta: { se: delta.se, ci: delta.ci } },
    p_opposite,
    equivalence,
    min_detectable_deg_s,
    power,
  };
}

function checkEstimate(e: RateEstimate, what: string): void {
  if (!Number.isFinite(e.value_deg_s) || !(e.se_deg_s > 0) || !Number.isFinite(e.se_deg_s) || !(e.df > 0)) {
    throw new InputError(`The ${what} rate (${e.value_deg_s} ± ${e.se_deg_s} deg/s, df ${e.df}) is not a usable estimate; it needs a finite value, a positive standard error and positive degrees of freedom.`);
  }
}
