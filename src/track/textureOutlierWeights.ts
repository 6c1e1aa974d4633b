/**
 * Robust weights for a polar image compared with a reference turned by shift_bins: residuals
 * e = cur − median_r(cur) − g·(ref(θ − shift) − median_r(ref)) per sample (row medians; linear
 * interpolation along the angle; one gain g over the image, refitted once without the first outliers),
 * scaled by 1.4826 × their median absolute value (but at least 3/4 of the texture's own standard
 * deviation), and weighted with Tukey's biweight, w = (1 − (e / (c·σ))²)² inside c·σ, 0 outside
 * (c = 4.685; Huber & Ronchetti, Robust Statistics, 2009 — cited from memory). Samples covered by
 * something that does not turn with the hub (a bubble, glare) get weight 0, and so do their 3×3
 * neighbours. Both images are rows × bins, row-major.
 */
export function outlierWeights(cur: Float64Array, ref: Float64Array, rows: number, bins: number, shift_bins: number, tuning = 4.685): Float64Array {
  const n = rows * bins;
  const shifted = new Float64Array(n);
  const centred = new Float64Array(n);
  const floor = Math.floor(shift_bins);
  const whole = ((floor % bins) + bins) % bins;
  const frac = shift_bins - floor;
  let energy = 0;
  for (let r = 0; r < rows; r++) {
    const base = r * bins;
    // Row medians, not means: a bubble must not shift its whole row.
    const midCur = median(cur.subarray(base, base + bins));
    const midRef = median(ref.subarray(base, base + bins));
    for (let j = 0; j < bins; j++) {
      // ref(θ − s) at bin j: between bins j − whole − 1 and j − whole (wrapping round).
      let ia = j - whole;
      if (ia < 0) ia += bins;
      const ib = ia === 0 ? bins - 1 : ia - 1;
      const a = ref[base + ia];
      shifted[base + j] = a + frac * (ref[base + ib] - a) - midRef;
      const c = cur[base + j] - midCur;
      centred[base + j] = c;
      energy += c * c;
    }
  }
  // Never call a sample an outlier for less than 3/4 of the texture's own spread: a slightly wrong shift leaves
  // residuals on every edge of the texture, and masking those would pull the shift further off.
  const floorLimit = 0.75 * Math.sqrt(energy / n);
  // One gain over the image, fitted twice: plainly, then with the outliers of the first fit left out.
  const fitGain = (weights: Float64Array | null): number => {
    let sxy = 0;
    let sxx = 0;
    for (let i = 0; i < n; i++) {
      const w = weights ? weights[i] : 1;
      sxy += w * shifted[i] * centred[i];
      sxx += w * shifted[i] * shifted[i];
    }
    return sxx > 0 ? sxy / sxx : 0;
  };
  const first = tukey(centred, shifted, fitGain(null), tuning, floorLimit);
  return erode(tukey(centred, shifted, fitGain(first), tuning, floorLimit), rows, bins);
}

/** Median of an array, by quickselect on a copy (Hoare's selection; average O(n)). */
function median(values: Float64Array): number {
  const a = values.slice();
  const n = a.length;
  const kth = (k: number): number => {
    let lo = 0;
    let hi = n - 1;
    while (lo < hi) {
      const pivot = a[(lo + hi) >> 1];
      let i = lo;
      let j = hi;
      while (i <= j) {
        while (a[i] < pivot) i++;
        while (a[j] > pivot) j--;
        if (i <= j) {
          const t = a[i];
          a[i] = a[j];
          a[j] = t;
          i++;
          j--;
        }
      }
      if (k <= j) hi = j;
      else if (k >= i) lo = i;
      else return a[k];
    }
    return a[k];
  };
  if (n % 2) return kth((n - 1) / 2);
  const upper = kth(n / 2);
  // The lower middle is the largest value left of n/2 after the selection.
  let lower = -Infinity;
  for (let i = 0; i < n / 2; i++) if (a[i] > lower) lower = a[i];
  return 0.5 * (lower + upper);
}

/** Tukey biweights of the residuals centred − gain·shifted, with the scale limited below by floorLimit. */
function tukey(centred: Float64Array, shifted: Float64Array, gain: number, tuning: number, floorLimit: number): Float64Array {
  const n = centred.length;
  const residual = new Float64Array(n);
  for (let i = 0; i < n; i++) residual[i] = Math.abs(centred[i] - gain * shifted[i]);
  // Median absolute residual from every 4th sample (plenty for a scale, and cheaper).
  const sample = new Float64Array(Math.ceil(n / 4));
  for (let i = 0, k = 0; i < n; i += 4, k++) sample[k] = residual[i];
  const limit = Math.max(tuning * 1.4826 * median(sample), floorLimit);
  const weights = new Float64Array(n);
  if (!(limit > 0)) return weights.fill(1);
  const inv = 1 / limit;
  for (let i = 0; i < n; i++) {
    const z = residual[i] * inv;
    weights[i] = z < 1 ? (1 - z * z) * (1 - z * z) : 0;
  }
  return weights;
}

/** Spreads each low weight to its 3×3 neighbours (angle wraps round, radius does not), so the soft rim of a bubble goes too. */
function erode(weights: Float64Array, rows: number, bins: number): Float64Array {
  const across = new Float64Array(weights.length);
  for (let r = 0; r < rows; r++) {
    const base = r * bins;
    for (let j = 0; j < bins; j++) {
      const left = weights[base + (j === 0 ? bins - 1 : j - 1)];
      const right = weights[base + (j === bins - 1 ? 0 : j + 1)];
      across[base + j] = Math.min(left, weights[base + j], right);
    }
  }
  const out = new Float64Array(weights.length);
  for (let r = 0; r < rows; r++) {
    const base = r * bins;
    const up = r > 0 ? base - bins : base;
    const down = r < rows - 1 ? base + bins : base;
    for (let j = 0; j < bins; j++) out[base + j] = Math.min(across[up + j], across[base + j], across[down + j]);
  }
  return out;
}

/** Each row minus its weighted mean, times the weights: what is left of an image once its outliers are masked. */
export function applyRowWeights(polar: Float64Array, weights: Float64Array, rows: number, bins: number): Float64Array {
  const out = new Float64Array(rows * bins);
  for (let r = 0; r < rows; r++) {
    const base = r * bins;
    let sw = 0;
    let swx = 0;
    for (let j = 0; j < bins; j++) {
      sw += weights[base + j];
      swx += weights[base + j] * polar[base + j];
    }
    const mean = sw > 0 ? swx / sw : 0;
    for (let j = 0; j < bins; j++) out[base + j] = weights[base + j] * (polar[base + j] - mean);
  }
  return out;
}

/** Weights carried along with the texture: w_ref(θ) = w(θ + shift_bins), linear interpolation along the angle. */
export function shiftRowWeights(weights: Float64Array, rows: number, bins: number, shift_bins: number): Float64Array {
  const out = new Float64Array(rows * bins);
  const whole = Math.floor(shift_bins);
  const frac = shift_bins - whole;
  for (let r = 0; r < rows; r++) {
    const base = r * bins;
    for (let j = 0; j < bins; j++) {
      const a = weights[base + ((((j + whole) % bins) + bins) % bins)];
      const b = weights[base + ((((j + whole + 1) % bins) + bins) % bins)];
      out[base + j] = a + frac * (b - a);
    }
  }
  return out;
}
