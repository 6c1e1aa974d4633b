export interface ThinOptions {
  /** Number of buckets along the series (about the chart's width in pixels / 2), default 300. */
  buckets?: number;
  /** A time step longer than this many median steps is drawn as a break, default 10. */
  gap_factor?: number;
  /** Skip missing samples (NaN) instead of breaking the line there (when they are shown another way), default false. */
  skip_missing?: boolean;
}

/** A thinned series; NaN in y marks a break in the line. */
export interface ThinnedSeries {
  t_s: Float64Array;
  y: Float64Array;
}

/**
 * Thins a long series for display without hiding extremes or gaps: the series is cut into equal runs of
 * samples and each keeps its minimum and maximum in time order (min/max decimation); a lost sample (NaN) or a
 * time gap longer than gap_factor median steps becomes a break (NaN) at its place. Short series pass through.
 * @param t_s times, seconds, increasing
 * @param y   values, NaN where missing
 */
export function thinSeries(t_s: ArrayLike<number>, y: ArrayLike<number>, options: ThinOptions = {}): ThinnedSeries {
  const buckets = Math.max(1, Math.floor(options.buckets ?? 300));
  const gapFactor = options.gap_factor ?? 10;
  const skipMissing = options.skip_missing ?? false;
  const n = Math.min(t_s.length, y.length);
  const gap_s = gapFactor * medianStep(t_s, n);
  const outT: number[] = [];
  const outY: number[] = [];
  const pushBreak = (t: number): void => {
    if (outY.length > 0 && !Number.isNaN(outY[outY.length - 1]!)) {
      outT.push(t);
      outY.push(Number.NaN);
    }
  };
  if (n <= 2 * buckets) {
    for (let i = 0; i < n; i++) {
      if (i > 0 && t_s[i]! - t_s[i - 1]! > gap_s) pushBreak((t_s[i]! + t_s[i - 1]!) / 2);
      if (Number.isFinite(y[i]!)) {
        outT.push(t_s[i]!);
        outY.push(y[i]!);
      } else if (!skipMissing) pushBreak(t_s[i]!);
    }
    return { t_s: Float64Array.from(outT), y: Float64Array.from(outY) };
  }
  const size = n / buckets;
  for (let b = 0; b < buckets; b++) {
    const i0 = Math.floor(b * size);
    const i1 = Math.min(n, Math.floor((b + 1) * size));
    let iMin = -1;
    let iMax = -1;
    let iBreak = -1;
    for (let i = i0; i < i1; i++) {
      const v = y[i]!;
      const gapBefore = i > 0 && t_s[i]! - t_s[i - 1]! > gap_s;
      if ((!Number.isFinite(v) && !skipMissing) || gapBefore) {
        if (iBreak < 0) iBreak = i;
      }
      if (!Number.isFinite(v)) continue;
      if (iMin < 0 || v < y[iMin]!) iMin = i;
      if (iMax < 0 || v > y[iMax]!) iMax = i;
    }
    const keep = [iMin, iMax].filter((i) => i >= 0).sort((a, b2) => a - b2);
    let placedBreak = iBreak < 0;
    for (let k = 0; k < keep.length; k++) {
      const i = keep[k]!;
      if (k > 0 && i === keep[k - 1]) continue;
      if (!placedBreak && iBreak <= i) {
        pushBreak(iBreak > 0 && !Number.isFinite(y[iBreak]!) ? t_s[iBreak]! : (t_s[iBreak]! + t_s[Math.max(0, iBreak - 1)]!) / 2);
        placedBreak = true;
      }
      outT.push(t_s[i]!);
      outY.push(y[i]!);
    }
    if (!placedBreak) pushBreak(t_s[iBreak]!);
  }
  return { t_s: Float64Array.from(outT), y: Float64Array.from(outY) };
}

/** Per-bucket envelope of an interval band: lowest lower bound and highest upper bound (bucket-centre time). */
export function thinBand(t_s: ArrayLike<number>, lo: ArrayLike<number>, hi: ArrayLike<number>, options: { buckets?: number } = {}): { t_s: Float64Array; lo: Float64Array; hi: Float64Array } {
  const n = Math.min(t_s.length, lo.length, hi.length);
  const buckets = Math.max(1, Math.min(n, Math.floor(options.buckets ?? 300)));
  const outT = new Float64Array(buckets);
  const outLo = new Float64Array(buckets);
  const outHi = new Float64Array(buckets);
  const size = n / buckets;
  for (let b = 0; b < buckets; b++) {
    const i0 = Math.floor(b * size);
    const i1 = Math.min(n, Math.max(i0 + 1, Math.floor((b + 1) * size)));
    let l = Infinity;
    let h = -Infinity;
    for (let i = i0; i < i1; i++) {
      if (lo[i]! < l) l = lo[i]!;
      if (hi[i]! > h) h = hi[i]!;
    }
    outT[b] = (t_s[i0]! + t_s[i1 - 1]!) / 2;
    outLo[b] = Number.isFinite(l) ? l : Number.NaN;
    outHi[b] = Number.isFinite(h) ? h : Number.NaN;
  }
  return { t_s: outT, lo: outLo, hi: outHi };
}

function medianStep(t_s: ArrayLike<number>, n: number): number {
  if (n < 2) return Infinity;
  const stride = Math.max(1, Math.floor((n - 1) / 2001));
  const steps: number[] = [];
  for (let i = 1; i < n; i += stride) steps.push(t_s[i]! - t_s[i - 1]!);
  steps.sort((a, b) => a - b);
  return steps[Math.floor(steps.length / 2)]!;
}
