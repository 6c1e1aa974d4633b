/**
 * Robust weights for a polar image compared with a reference turned by shift_bins: residuals
 * e = cur − median_r(cur) − g·(ref(θ − shift) − median_r(ref)) per sample (row medians; linear
 * interpolation along the angle; one gain g over the image, refitted once without the first outliers), scaled by 1.4826 × their median absolute value (but at least 3/4 of the
 * texture's own standard deviation), and weighted with Tukey's
 * biweight, w = (1 − (e / (c·σ))²)² inside c·σ, 0 outside (c = 4.685; Huber & Ronchetti, Robust
 * Statistics, 2009 — cited from memory). Samples covered by something that does not turn with the hub
 * (a bubble, glare) get weight 0, and so do their 3×3 neighbours. Both images are rows × bins, row-major.
 */
export function outlierWeights(cur: Float64Array, ref: Float64Array, rows: number, bins: number, shift_bins: number, tuning = 4.685): Float64Array {
  const n = rows * bins;
  const shifted = new Float64Array(n);
  const centred = new Float64Array(n);
  const whole = Math.floor(shift_bins);
  const frac = shift_bins - whole;
  for (let r = 0; r < rows; r++) {
    const base = r * bins;
    // Row medians, not means: a bubble must not shift its whole row.
    const meanCur = median(cur.subarray(base, base + bins));
    const meanRef = median(ref.subarray(base, base + bins));
    for (let j = 0; j < bins; j++) {
      // ref(θ − s) at bin j: between bins j − whole − 1 and j − whole.
      const a = ref[base + ((((j - whole) % bins) + bins) % bins)];
      const b = ref[base + ((((j - whole - 1) % bins) + bins) % bins)];
      shifted[base + j] = a + frac * (b - a) - meanRef;
      centred[base + j] = cur[base + j] - meanCur;
    }
  }
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
  const first = tukey(centred, shifted, fitGain(null), tuning);
  return erode(tukey(centred, shifted, fitGain(first), tuning), rows, bins);
}

/** Median of an array (a copy is sorted). */
function median(values: Float64Array): number {
  const sorted = Float64Array.from(values).sort();
  const n = sorted.length;
  return n % 2 ? sorted[(n - 1) / 2] : 0.5 * (sorted[n / 2 - 1] + sorted[n / 2]);
}

/** Tukey biweights of the residuals centred − gain·shifted. */
function tukey(centred: Float64Array, shifted: Float64Array, gain: number, tuning: number): Float64Array {
  const n = centred.length;
  const residual = new Float64Array(n);
  for (let i = 0; i < n; i++) residual[i] = Math.abs(centred[i] - gain * shifted[i]);
  const mad = median(residual);
  // Never call a sample an outlier for less than 3/4 of the texture's own spread: a slightly wrong shift leaves
  // residuals on every edge of the texture, and masking those would pull the shift further off.
  let spread = 0;
  for (let i = 0; i < n; i++) spread += centred[i] * centred[i];
  spread = Math.sqrt(spread / n);
  const limit = Math.max(tuning * 1.4826 * mad, 0.75 * spread);
  const weights = new Float64Array(n);
  if (!(limit > 0)) return weights.fill(1);
  for (let i = 0; i < n; i++) {
    const z = residual[i] / limit;
    weights[i] = z < 1 ? (1 - z * z) ** 2 : 0;
  }
  return weights;
}

/** Spreads each low weight to its 3×3 neighbours (angle wraps round), so the soft rim of a bubble goes too. */
function erode(weights: Float64Array, rows: number, bins: number): Float64Array {
  const n = weights.length;
  const eroded = new Float64Array(n);
  for (let r = 0; r < rows; r++) {
    for (let j = 0; j < bins; j++) {
      let w = weights[r * bins + j];
      for (let dr = -1; dr <= 1; dr++) {
        const rr = r + dr;
        if (rr < 0 || rr >= rows) continue;
        for (let dj = -1; dj <= 1; dj++) w = Math.min(w, weights[rr * bins + ((j + dj + bins) % bins)]);
      }
      eroded[r * bins + j] = w;
    }
  }
  return eroded;
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
