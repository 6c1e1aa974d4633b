import jstatModule from 'jstat';

const { jStat } = jstatModule;

/**
 * Smallest |rate| a two-sided test at level `level` detects with the given power (default 0.8):
 * (t_{1−α/2, df} + t_{power, df})·se, α = 1 − level (the usual normal-approximation sample-size formula
 * with Student-t quantiles; e.g. Chow, Shao & Wang, Sample Size Calculations in Clinical Research, §3.2).
 */
export function minDetectableRate(se: number, df: number, level = 0.95, power = 0.8): number {
  const alpha = 1 - level;
  return (jStat.studentt.inv(1 - alpha / 2, df) + jStat.studentt.inv(power, df)) * se;
}
