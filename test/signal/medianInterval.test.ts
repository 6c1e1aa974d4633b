import { describe, expect, it } from 'vitest';
import { median } from 'simple-statistics';
import { medianInterval } from '../../src/signal/medianInterval.js';
import { compensatedSumOfSquares } from '../../src/signal/compensatedSum.js';
import { normalSource } from '../../bench/fitScenarios.mjs';

function jitteredTimes(n: number, seed: number): number[] {
  const z = normalSource(seed);
  const t: number[] = [3600];
  for (let i = 1; i < n; i++) t.push(t[i - 1]! + (1 / 60) * (Math.abs(z()) < 2 ? 1 : 2) + 1e-4 * z() ** 2);
  return t;
}

describe('medianInterval', () => {
  // Reference: simple-statistics median of the same intervals (odd counts, where the median is one value).
  it('agrees with simple-statistics on jittered frame times with drops', () => {
    for (const n of [2, 4, 12, 102, 5002]) {
      const t = jitteredTimes(n, n);
      const intervals = t.slice(1).map((v, i) => v - t[i]!);
      expect(medianInterval(t)).toBe(median(intervals));
    }
  });

  // medianInterval's own convention (so the result is always one of the intervals): checked against a sort written here
  it('takes the lower middle value for an even number of intervals', () => {
    const t = jitteredTimes(11, 7);
    const sorted = t.slice(1).map((v, i) => v - t[i]!).sort((a, b) => a - b);
    expect(medianInterval(t)).toBe(sorted[4]);
  });
});

describe('compensatedSumOfSquares', () => {
  // (10⁸)² followed by 10⁶ ones: the exact sum 10¹⁶ + 10⁶ is a double, but a naive running sum stays at
  // 10¹⁶ (each +1 is half an ulp and rounds away).
  it('keeps the small terms a naive sum loses', () => {
    const v = new Float64Array(1_000_001).fill(1);
    v[0] = 1e8;
    let naive = 0;
    for (const x of v) naive += x * x;
    expect(naive).toBe(1e16);
    expect(compensatedSumOfSquares(v)).toBe(1e16 + 1e6);
  });
});
