/** The upper median of a sample: the middle value after sorting (the higher of the two middle ones for an even count); NaN for an empty sample. */
export function upperMedian(values: readonly number[]): number {
  const s = [...values].sort((a, b) => a - b);
  return s.length > 0 ? s[s.length >> 1] : Number.NaN;
}

/**
 * Centre and robust spread of a sample: its upper median and 1.4826 × the upper median of the absolute deviations
 * from it (the MAD scaled to a standard deviation for normal data; common practice, no source).
 */
export function robustSpread(values: readonly number[]): { median: number; sigma: number } {
  const median = upperMedian(values);
  return { median, sigma: 1.4826 * upperMedian(values.map((v) => Math.abs(v - median))) };
}
