import jstatModule from 'jstat';
import type { ZeroTest } from './FitReport.js';

const { jStat } = jstatModule;

/** Options of zeroTest. */
export interface ZeroTestOptions {
  /** Equivalence margin, deg/s (> 0): adds a two one-sided tests (TOST) equivalence test. */
  margin_deg_s?: number;
  /** Level of the report (default 0.95); TOST uses α = 1 − level for each one-sided test. */
  level?: number;
}

/**
 * Tests on a rate estimate with standard error se and Student-t reference with df degrees of freedom:
 * the two-sided p-value of H0: rate = 0; p_sign, the one-sided p-value of H0: the rate is zero or has
 * the opposite sign of the estimate; and with a margin, Schuirmann's (1987) TOST: the rate lies within
 * ±margin when both one-sided tests reject at α = 1 − level (equivalently the (1 − 2α) interval lies inside).
 */
export function zeroTest(rate_deg_s: number, se: number, df: number, options: ZeroTestOptions = {}): ZeroTest {
  const statistic = rate_deg_s / se;
  const upper = 1 - jStat.studentt.cdf(Math.abs(statistic), df);
  const test: ZeroTest = { p_value: Math.min(1, 2 * upper), p_sign: upper, statistic, df };
  if (options.margin_deg_s !== undefined) {
    const m = options.margin_deg_s;
    const alpha = 1 - (options.level ?? 0.95);
    const pLower = 1 - jStat.studentt.cdf((rate_deg_s + m) / se, df); // H0: rate ≤ −m
    const pUpper = jStat.studentt.cdf((rate_deg_s - m) / se, df); // H0: rate ≥ +m
    test.margin_deg_s = m;
    test.equivalence_p_value = Math.max(pLower, pUpper);
    test.equivalent_to_zero = test.equivalence_p_value < alpha;
  }
  return test;
}
