import { describe, expect, it } from 'vitest';
import { thinBand, thinSeries } from '../../src/report/thinSeries.js';

const ramp = (n: number, dt = 1 / 60) => Float64Array.from({ length: n }, (_, i) => i * dt);

describe('thinSeries (min/max per bucket)', () => {
  it('passes a short series through unchanged', () => {
    const t = ramp(50);
    const y = Float64Array.from(t, (x) => Math.sin(x));
    const out = thinSeries(t, y, { buckets: 100 });
    expect([...out.t_s]).toEqual([...t]);
    expect([...out.y]).toEqual([...y]);
  });

  it('keeps a one-sample spike and dip in a long series', () => {
    const n = 36_000;
    const t = ramp(n);
    const y = Float64Array.from(t, (x) => Math.sin(x / 7));
    y[12_345] = 40;
    y[30_001] = -25;
    const out = thinSeries(t, y, { buckets: 300 });
    expect(out.y.length).toBeLessThanOrEqual(600);
    expect(Math.max(...out.y)).toBe(40);
    expect(Math.min(...out.y)).toBe(-25);
    expect(out.t_s[out.y.indexOf(40)]).toBe(t[12_345]);
    // times stay in order
    for (let i = 1; i < out.t_s.length; i++) expect(out.t_s[i]!).toBeGreaterThanOrEqual(out.t_s[i - 1]!);
  });

  it('turns lost samples and long time gaps into breaks', () => {
    const n = 20_000;
    const t = ramp(n);
    for (let i = 15_000; i < n; i++) t[i]! += 5; // 5 s without frames
    const y = Float64Array.from(t, (x) => x);
    for (let i = 6_000; i < 6_400; i++) y[i] = Number.NaN;
    const out = thinSeries(t, y, { buckets: 200 });
    const breaks = [...out.y].map((v, i) => (Number.isNaN(v) ? out.t_s[i]! : null)).filter((v) => v !== null);
    expect(breaks.length).toBe(2);
    expect(breaks[0]).toBeGreaterThanOrEqual(t[6_000]! - 1);
    expect(breaks[0]).toBeLessThanOrEqual(t[6_400]!);
    expect(breaks[1]).toBeGreaterThan(t[14_999]! - 1);
    expect(breaks[1]).toBeLessThanOrEqual(t[15_000]!);
    // no finite sample is invented: every kept value is one of the input values at its own time
    for (let i = 0; i < out.y.length; i++) if (!Number.isNaN(out.y[i]!)) expect(out.y[i]).toBe(out.t_s[i]);
  });

  it('can skip missing samples instead of breaking (for series whose gaps are drawn another way)', () => {
    const t = ramp(10_000);
    const y = Float64Array.from(t, (_, i) => (i % 50 === 0 ? Number.NaN : 0.8 + (i % 7) / 100));
    const out = thinSeries(t, y, { buckets: 100, skip_missing: true });
    expect([...out.y].some(Number.isNaN)).toBe(false);
    expect(Math.min(...out.y)).toBeCloseTo(0.8, 12);
    expect(Math.max(...out.y)).toBeCloseTo(0.86, 12);
  });

  it('keeps the widest band per bucket', () => {
    const t = ramp(1000);
    const lo = Float64Array.from(t, () => -1);
    const hi = Float64Array.from(t, () => 1);
    lo[501] = -9;
    hi[10] = 7;
    const b = thinBand(t, lo, hi, { buckets: 10 });
    expect(Math.min(...b.lo)).toBe(-9);
    expect(Math.max(...b.hi)).toBe(7);
    expect(b.t_s.length).toBe(10);
  });
});
