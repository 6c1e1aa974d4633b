import FFT from 'fft.js';

/**
 * Spectra of the rows of a polar image (rows × bins, bins a power of two), each row with its mean
 * removed, kept as the half spectrum k = 0..bins/2 (re, im interleaved per row), plus the rows'
 * total energy Σ(x − mean)² used to normalise correlations (so gain and offset changes drop out).
 */
export interface RowSpectra {
  rows: number;
  bins: number;
  /** rows × (bins/2 + 1) complex values, interleaved re, im. */
  half: Float64Array;
  energy: number;
}

/** A circular shift found between two polar images, in angle bins, and how alike they are there. */
export interface CircularShiftEstimate {
  /** Shift of the current image against the reference, bins, in [−bins/2, bins/2): cur(θ) ≈ ref(θ − shift). */
  shift_bins: number;
  /** Normalised cross-correlation at the shift, −1..1 (1 = identical up to gain and offset). */
  correlation: number;
}

export interface CircularShiftOptions {
  /** Expected shift, bins; the peak is searched around it. Default 0. */
  predicted_bins?: number;
  /** Half-width of the searched range around predicted_bins, bins. Default bins/2 (the whole circle). */
  window_bins?: number;
  /** Newton steps on the Fourier interpolant after the 3-point fit. Default 4. */
  refine_steps?: number;
}

/** True when n is a power of two ≥ 4 (what the FFT needs). */
export function isPowerOfTwo(n: number): boolean {
  return Number.isInteger(n) && n >= 4 && (n & (n - 1)) === 0;
}

/** Sub-sample offset of a peak from three samples around it (vertex of the parabola through them), in (−0.5, 0.5) when the middle one is the largest. */
export function parabolicPeakOffset(left: number, centre: number, right: number): number {
  // Vertex of the parabola through (−1, left), (0, centre), (1, right): common practice, no source.
  const curvature = left - 2 * centre + right;
  if (!(curvature < 0)) return 0;
  const offset = (0.5 * (left - right)) / curvature;
  return Math.max(-0.5, Math.min(0.5, offset));
}

/**
 * Estimates circular shifts between polar images by FFT cross-correlation summed over rows.
 * Built once per number of angle bins (a power of two); its methods reuse the FFT tables.
 */
export class CircularShiftEstimator {
  readonly bins: number;
  private readonly fft: FFT;
  private readonly rowIn: number[];
  private readonly rowOut: number[];
  private readonly cross: number[];
  private readonly corr: number[];

  constructor(bins: number) {
    if (!isPowerOfTwo(bins)) throw new RangeError(`angle bins must be a power of two ≥ 4, got ${bins}`);
    this.bins = bins;
    this.fft = new FFT(bins);
    this.rowIn = new Array<number>(bins).fill(0);
    this.rowOut = this.fft.createComplexArray() as number[];
    this.cross = this.fft.createComplexArray() as number[];
    this.corr = this.fft.createComplexArray() as number[];
  }

  /** Half spectra of each mean-removed row of a rows × bins polar image. */
  spectra(polar: Float64Array, rows: number): RowSpectra {
    const n = this.bins;
    const halfLen = n / 2 + 1;
    const half = new Float64Array(rows * halfLen * 2);
    let energy = 0;
    for (let r = 0; r < rows; r++) {
      let mean = 0;
      for (let j = 0; j < n; j++) mean += polar[r * n + j];
      mean /= n;
      for (let j = 0; j < n; j++) {
        const v = polar[r * n + j] - mean;
        this.rowIn[j] = v;
        energy += v * v;
      }
      this.fft.realTransform(this.rowOut, this.rowIn);
      const base = r * halfLen * 2;
      for (let k = 0; k < halfLen; k++) {
        half[base + 2 * k] = this.rowOut[2 * k];
        half[base + 2 * k + 1] = this.rowOut[2 * k + 1];
      }
    }
    return { rows, bins: n, half, energy };
  }

  /**
   * Circular shift of `cur` against `ref` maximising Σ_rows Σ_θ ref(θ)·cur(θ + s): integer peak of the
   * FFT cross-correlation inside the search window, 3-point parabolic fit, then Newton steps on the
   * correlation's own trigonometric (Fourier-series) interpolant, which is exact for a band-limited
   * periodic shift. NaN shift and correlation 0 when either image has no texture.
   */
  estimate(ref: RowSpectra, cur: RowSpectra, options: CircularShiftOptions = {}): CircularShiftEstimate {
    const n = this.bins;
    const norm = Math.sqrt(ref.energy * cur.energy);
    if (!(norm > 0)) return { shift_bins: Number.NaN, correlation: 0 };
    const { pRe, pIm } = this.crossSpectrum(ref, cur);
    const halfLen = n / 2 + 1;
    // Full Hermitian spectrum, then c(s) = (1/n) Σ_k P_k e^{+2πiks/n} (fft.js divides by n in the inverse).
    const cross = this.cross;
    for (let k = 0; k < halfLen; k++) {
      cross[2 * k] = pRe[k];
      cross[2 * k + 1] = pIm[k];
    }
    for (let k = halfLen; k < n; k++) {
      cross[2 * k] = pRe[n - k];
      cross[2 * k + 1] = -pIm[n - k];
    }
    this.fft.inverseTransform(this.corr, cross);
    const corrAt = (i: number): number => this.corr[2 * (((i % n) + n) % n)];

    const predicted = options.predicted_bins ?? 0;
    const window = Math.min(options.window_bins ?? n / 2, n / 2);
    const lo = Math.ceil(predicted - window);
    const hi = Math.floor(predicted + window);
    let best = Math.round(predicted);
    let bestValue = -Infinity;
    for (let i = lo; i <= hi; i++) {
      const v = corrAt(i);
      if (v > bestValue) {
        bestValue = v;
        best = i;
      }
    }
    let shift = best + parabolicPeakOffset(corrAt(best - 1), bestValue, corrAt(best + 1));
    shift = this.refine(pRe, pIm, shift, best, options.refine_steps ?? 4);
    const wrapped = shift - n * Math.floor((shift + n / 2) / n);
    const correlation = this.interpolant(pRe, pIm, shift).value / norm;
    return { shift_bins: wrapped, correlation: Math.max(-1, Math.min(1, correlation)) };
  }

  /** Normalised cross-correlation Σ_rows Σ_θ ref(θ)·cur(θ + s) / √(E_ref·E_cur) at any shift s (bins), from the Fourier interpolant. */
  correlationAt(ref: RowSpectra, cur: RowSpectra, shift_bins: number): number {
    const norm = Math.sqrt(ref.energy * cur.energy);
    if (!(norm > 0)) return 0;
    const { pRe, pIm } = this.crossSpectrum(ref, cur);
    return this.interpolant(pRe, pIm, shift_bins).value / norm;
  }

  /** Cross spectrum P_k = Σ_r conj(R_rk)·C_rk for k = 0..n/2. */
  private crossSpectrum(ref: RowSpectra, cur: RowSpectra): { pRe: Float64Array; pIm: Float64Array } {
    const n = this.bins;
    if (ref.bins !== n || cur.bins !== n || ref.rows !== cur.rows) {
      throw new RangeError(`spectra sizes differ: ${ref.rows}×${ref.bins} and ${cur.rows}×${cur.bins} against ${n} bins`);
    }
    const halfLen = n / 2 + 1;
    const pRe = new Float64Array(halfLen);
    const pIm = new Float64Array(halfLen);
    for (let r = 0; r < ref.rows; r++) {
      const base = r * halfLen * 2;
      for (let k = 0; k < halfLen; k++) {
        const aRe = ref.half[base + 2 * k];
        const aIm = ref.half[base + 2 * k + 1];
        const bRe = cur.half[base + 2 * k];
        const bIm = cur.half[base + 2 * k + 1];
        pRe[k] += aRe * bRe + aIm * bIm;
        pIm[k] += aRe * bIm - aIm * bRe;
      }
    }
    return { pRe, pIm };
  }

  /** Newton steps toward the maximum of the trigonometric interpolant; stays within one bin of the integer peak. */
  private refine(pRe: Float64Array, pIm: Float64Array, start: number, peak: number, steps: number): number {
    let s = start;
    for (let it = 0; it < steps; it++) {
      const { slope, curvature } = this.interpolant(pRe, pIm, s);
      if (!(curvature < 0)) break;
      const next = s - slope / curvature;
      if (!(Math.abs(next - peak) <= 1)) break;
      const done = Math.abs(next - s) < 1e-9;
      s = next;
      if (done) break;
    }
    return s;
  }

  /**
   * The cross-correlation as a trigonometric polynomial of a continuous shift s (bins), with its first
   * two derivatives: c(s) = (1/n)[P_0 + 2 Σ_{0<k<n/2} Re(P_k e^{iωks}) + Re(P_{n/2}) cos(πs)], ω = 2π/n.
   */
  private interpolant(pRe: Float64Array, pIm: Float64Array, s: number): { value: number; slope: number; curvature: number } {
    const n = this.bins;
    const omega = (2 * Math.PI) / n;
    let value = pRe[0];
    let slope = 0;
    let curvature = 0;
    for (let k = 1; k < n / 2; k++) {
      const phase = omega * k * s;
      const c = Math.cos(phase);
      const sn = Math.sin(phase);
      const re = pRe[k] * c - pIm[k] * sn;
      const im = pRe[k] * sn + pIm[k] * c;
      const wk = omega * k;
      value += 2 * re;
      slope -= 2 * wk * im;
      curvature -= 2 * wk * wk * re;
    }
    const nyq = pRe[n / 2];
    value += nyq * Math.cos(Math.PI * s);
    slope -= nyq * Math.PI * Math.sin(Math.PI * s);
    curvature -= nyq * Math.PI * Math.PI * Math.cos(Math.PI * s);
    return { value: value / n, slope: slope / n, curvature: curvature / n };
  }
}
