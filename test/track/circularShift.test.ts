import { describe, expect, it } from 'vitest';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';
import { CircularShiftEstimator, isPowerOfTwo, parabolicPeakOffset } from '../../src/track/circularShift.js';

function randomRows(seed: number, rows: number, bins: number): Float64Array {
  const rng = xoroshiro128plus(seed);
  return Float64Array.from({ length: rows * bins }, () => 100 + 50 * uniformFloat64(rng));
}

/** Direct O(n²) normalised circular cross-correlation Σ_r Σ_j a_r(j)·b_r(j+s) of mean-removed rows (independent of the FFT path). */
function directCorrelation(a: Float64Array, b: Float64Array, rows: number, bins: number, s: number): number {
  let cross = 0;
  let ea = 0;
  let eb = 0;
  for (let r = 0; r < rows; r++) {
    let ma = 0;
    let mb = 0;
    for (let j = 0; j < bins; j++) {
      ma += a[r * bins + j];
      mb += b[r * bins + j];
    }
    ma /= bins;
    mb /= bins;
    for (let j = 0; j < bins; j++) {
      const av = a[r * bins + j] - ma;
      const bv = b[r * bins + ((j + s) % bins + bins) % bins] - mb;
      cross += av * bv;
      ea += av * av;
      eb += (b[r * bins + j] - mb) ** 2;
    }
  }
  return cross / Math.sqrt(ea * eb);
}

/** A band-limited periodic row: Σ_k a_k cos(2πk(j − shift)/n + p_k) for k ≤ kMax, so a fractional shift is exact. */
function bandLimitedRows(seed: number, rows: number, bins: number, kMax: number, shift: number): Float64Array {
  const rng = xoroshiro128plus(seed);
  const out = new Float64Array(rows * bins);
  for (let r = 0; r < rows; r++) {
    const amps = Array.from({ length: kMax }, () => uniformFloat64(rng));
    const phases = Array.from({ length: kMax }, () => 2 * Math.PI * uniformFloat64(rng));
    for (let j = 0; j < bins; j++) {
      let v = 80;
      for (let k = 1; k <= kMax; k++) v += 20 * amps[k - 1] * Math.cos((2 * Math.PI * k * (j - shift)) / bins + phases[k - 1]);
      out[r * bins + j] = v;
    }
  }
  return out;
}

describe('parabolicPeakOffset', () => {
  // Vertex of a parabola y = −(x − x0)² + c sampled at −1, 0, 1 must come back exactly (common practice, no source).
  it('returns the vertex of an exact parabola', () => {
    for (const x0 of [-0.4, -0.1, 0, 0.23, 0.49]) {
      const y = (x: number): number => 5 - 3 * (x - x0) ** 2;
      expect(parabolicPeakOffset(y(-1), y(0), y(1))).toBeCloseTo(x0, 12);
    }
  });
  it('gives 0 for a flat or upward-curving triple', () => {
    expect(parabolicPeakOffset(1, 1, 1)).toBe(0);
    expect(parabolicPeakOffset(2, 1, 2)).toBe(0);
  });
});

describe('CircularShiftEstimator', () => {
  it('accepts only powers of two', () => {
    expect(isPowerOfTwo(512)).toBe(true);
    expect(isPowerOfTwo(720)).toBe(false);
    expect(() => new CircularShiftEstimator(720)).toThrow(RangeError);
  });

  // Cross-check of the FFT path against a direct O(n²) correlation written here.
  it('finds whole-bin circular shifts with the correlation a direct sum gives', () => {
    const rows = 3;
    const bins = 64;
    const ref = randomRows(11, rows, bins);
    const est = new CircularShiftEstimator(bins);
    const refSpectra = est.spectra(ref, rows);
    for (const shift of [0, 1, 5, -7, 31, -32]) {
      const cur = new Float64Array(rows * bins);
      // cur(j) = ref(j − shift), with a gain and an offset (flicker) that the normalisation removes.
      for (let r = 0; r < rows; r++) for (let j = 0; j < bins; j++) cur[r * bins + j] = 0.6 * ref[r * bins + (((j - shift) % bins) + bins) % bins] + 17;
      const got = est.estimate(refSpectra, est.spectra(cur, rows));
      const expectedShift = shift === -32 ? -32 : shift; // reported in [−bins/2, bins/2)
      expect(got.shift_bins).toBeCloseTo(expectedShift, 6);
      expect(got.correlation).toBeCloseTo(directCorrelation(ref, cur, rows, bins, Math.round(got.shift_bins)), 9);
      expect(got.correlation).toBeCloseTo(1, 9);
    }
  });

  it('gives the same correlation as a direct O(n²) sum at every whole shift of unrelated images', () => {
    const rows = 3;
    const bins = 64;
    const est = new CircularShiftEstimator(bins);
    const a = randomRows(21, rows, bins);
    const b = randomRows(22, rows, bins);
    const sa = est.spectra(a, rows);
    const sb = est.spectra(b, rows);
    for (let s = -32; s < 32; s++) expect(est.correlationAt(sa, sb, s)).toBeCloseTo(directCorrelation(a, b, rows, bins, s), 10);
  });

  it('recovers fractional shifts of band-limited periodic rows to 1e-6 bin', () => {
    const rows = 4;
    const bins = 256;
    const est = new CircularShiftEstimator(bins);
    const ref = est.spectra(bandLimitedRows(5, rows, bins, 30, 0), rows);
    for (const shift of [0.25, -3.7, 10.5, 100.123, -127.9]) {
      const got = est.estimate(ref, est.spectra(bandLimitedRows(5, rows, bins, 30, shift), rows));
      expect(got.shift_bins).toBeCloseTo(shift, 6);
      expect(got.correlation).toBeCloseTo(1, 9);
    }
  });

  it('searches only the window around the prediction', () => {
    const rows = 2;
    const bins = 128;
    const est = new CircularShiftEstimator(bins);
    // A row with period 32 bins (k = 4 only): shifts 3, 35, 67, 99 all match equally well.
    const ref = est.spectra(bandLimitedRows(9, rows, bins, 0, 0).map((v, i) => v + 10 * Math.cos((2 * Math.PI * 4 * (i % bins)) / bins)), rows);
    const cur = est.spectra(bandLimitedRows(9, rows, bins, 0, 0).map((v, i) => v + 10 * Math.cos((2 * Math.PI * 4 * ((i % bins) - 3)) / bins)), rows);
    expect(est.estimate(ref, cur, { predicted_bins: 35, window_bins: 10 }).shift_bins).toBeCloseTo(35, 6);
    expect(est.estimate(ref, cur, { predicted_bins: 0, window_bins: 10 }).shift_bins).toBeCloseTo(3, 6);
  });

  it('reports NaN and correlation 0 for a blank image', () => {
    const est = new CircularShiftEstimator(64);
    const ref = est.spectra(randomRows(1, 1, 64), 1);
    const blank = est.spectra(new Float64Array(64).fill(90), 1);
    const got = est.estimate(ref, blank);
    expect(got.shift_bins).toBeNaN();
    expect(got.correlation).toBe(0);
  });
});
