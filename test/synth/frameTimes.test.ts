import { describe, expect, it } from 'vitest';
import { frameTimes } from '../../src/synth/frameTimes.js';
import { resolveSynthSpec } from '../../src/synth/SynthSpec.js';

describe('frameTimes', () => {
  // frame k of a constant-rate clip is shown at k/fps (common practice, no source)
  it('gives k/fps without jitter or drops', () => {
    const t = frameTimes(resolveSynthSpec({ fps: 25, duration_s: 2 }));
    expect(t).toHaveLength(50);
    t.forEach((v, k) => expect(v).toBeCloseTo(k / 25, 9));
  });

  it('jitters intervals, leaves out the given slots and stays strictly increasing', () => {
    const spec = resolveSynthSpec({ fps: 30, duration_s: 3, seed: 4, realism: { timing: { jitter_s: 0.01, dropped_frames: [10, 11, 40] } } });
    const t = frameTimes(spec);
    expect(t).toHaveLength(90 - 3);
    expect(t[0]).toBe(0);
    const intervals = Array.from(t.subarray(1), (v, i) => v - t[i]);
    expect(Math.min(...intervals)).toBeGreaterThan(0);
    // frame i is kept slot k_i: it lies within ±jitter of k_i/fps (plus half a 1/90000 s tick of rounding)
    const kept = Array.from({ length: 90 }, (_, k) => k).filter((k) => ![10, 11, 40].includes(k));
    const offsets = kept.map((k, i) => t[i] - k / 30);
    for (const d of offsets) expect(Math.abs(d)).toBeLessThanOrEqual(0.01 + 1 / 180000);
    // the frames either side of a drop are about two and three nominal intervals apart
    expect(t[10] - t[9]).toBeGreaterThan(3 / 30 - 0.02 - 1e-9);
    expect(t[38] - t[37]).toBeGreaterThan(2 / 30 - 0.02 - 1e-9);
    // jitter is really there: offsets uniform on ±10 ms have a standard deviation of 10/√3 ≈ 5.8 ms
    // (variance of a uniform distribution, common practice, no source)
    const mean = offsets.reduce((a, b) => a + b, 0) / offsets.length;
    const sd = Math.sqrt(offsets.reduce((a, b) => a + (b - mean) ** 2, 0) / (offsets.length - 1));
    expect(sd).toBeGreaterThan(0.004);
    expect(sd).toBeLessThan(0.0075);
    // every time is a whole tick of a 1/90000 s time scale (the usual MPEG video clock, common practice, no source)
    for (const v of t) expect(Math.abs(v * 90000 - Math.round(v * 90000))).toBeLessThan(1e-6);
  });

  it('is deterministic for a seed and changes with the seed', () => {
    const a = resolveSynthSpec({ seed: 5, realism: { timing: { jitter_s: 0.005 } } });
    expect(frameTimes(a)).toEqual(frameTimes(a));
    expect(frameTimes(resolveSynthSpec({ ...a, seed: 6 }))).not.toEqual(frameTimes(a));
  });
});
