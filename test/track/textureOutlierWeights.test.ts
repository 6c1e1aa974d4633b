import { describe, expect, it } from 'vitest';
import { applyRowWeights, outlierWeights, shiftRowWeights } from '../../src/track/textureOutlierWeights.js';

const rows = 6;
const bins = 64;
/** A smooth periodic row pattern, turned by `shift` bins: value(j) = f(j − shift). */
const pattern = (shift: number) =>
  Float64Array.from({ length: rows * bins }, (_, i) => {
    const r = Math.floor(i / bins);
    const j = i % bins;
    const a = (2 * Math.PI * (j - shift)) / bins;
    return 100 + 30 * Math.sin(2 * a + r) + 20 * Math.cos(5 * a - 0.5 * r);
  });

// Truth: patterns built here in closed form and weights worked by hand in the comments (no outside source needed).
describe('outlierWeights', () => {
  it('gives weight 0 to a blob that does not turn with the pattern (and its neighbours), about 1 elsewhere', () => {
    const ref = pattern(0);
    const cur = pattern(3);
    for (let r = 2; r <= 3; r++) for (let j = 20; j <= 23; j++) cur[r * bins + j] = 250;
    const w = outlierWeights(cur, ref, rows, bins, 3);
    for (let r = 1; r <= 4; r++) for (let j = 19; j <= 24; j++) expect(w[r * bins + j]).toBe(0);
    let far = 0;
    for (let r = 0; r < rows; r++) for (let j = 30; j < 60; j++) far = Math.max(far, 1 - w[r * bins + j]);
    // Not exactly 1: a blob this large (1/8 of its rows) still nudges its rows' medians a little.
    expect(far).toBeLessThan(0.15);
  });

  it('is all ones for an exact turned copy', () => {
    const w = outlierWeights(pattern(5), pattern(0), rows, bins, 5);
    expect(Math.min(...w)).toBe(1);
  });
});

describe('applyRowWeights and shiftRowWeights', () => {
  it('removes each row’s weighted mean before weighting, and moves weights by whole and fractional bins', () => {
    const polar = Float64Array.from({ length: 2 * 4 }, (_, i) => i);
    const weights = Float64Array.from([1, 1, 0, 0, 0.5, 0.5, 0.5, 0.5]);
    // Row 0: weighted mean of 0, 1 is 0.5 → [−0.5, 0.5, 0, 0]; row 1: mean 5.5 → 0.5·[−1.5, −0.5, 0.5, 1.5].
    expect(Array.from(applyRowWeights(polar, weights, 2, 4))).toEqual([-0.5, 0.5, 0, 0, -0.75, -0.25, 0.25, 0.75]);
    // w_ref(j) = w(j + 1.5): row 0 → [avg(w1,w2), avg(w2,w3), avg(w3,w0), avg(w0,w1)] = [0.5, 0, 0.5, 1].
    expect(Array.from(shiftRowWeights(weights, 2, 4, 1.5)).slice(0, 4)).toEqual([0.5, 0, 0.5, 1]);
  });
});
