/** Median of a sample (mean of the two middle values for an even count); 0 for an empty sample. */
export function median(values: readonly number[]): number {
  if (values.length === 0) return 0;
  const s = [...values].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/** Sample standard deviation (n − 1 in the denominator); NaN for fewer than two values. */
export function sampleSd(values: readonly number[]): number {
  const n = values.length;
  if (n < 2) return Number.NaN;
  let mean = 0;
  for (const v of values) mean += v;
  mean /= n;
  let ss = 0;
  for (const v of values) ss += (v - mean) ** 2;
  return Math.sqrt(ss / (n - 1));
}

/** The 2.5 % and 97.5 % points of a sample (nearest rank after sorting), e.g. a bootstrap percentile interval; NaN for an empty sample. */
export function percentileInterval95(values: readonly number[]): [number, number] {
  if (values.length === 0) return [Number.NaN, Number.NaN];
  const s = [...values].sort((a, b) => a - b);
  const at = (q: number): number => s[Math.min(s.length - 1, Math.max(0, Math.round(q * (s.length - 1))))];
  return [at(0.025), at(0.975)];
}
