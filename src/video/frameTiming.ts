/** What the frame presentation times of a clip say about its timing. */
export interface FrameTiming {
  /** Frame intervals, seconds: smallest, median and largest, and mean. */
  interval_s: { min: number; median: number; max: number; mean: number };
  /** 1 / median interval, frames per second. */
  median_fps: number;
  /** True when some interval is neither a whole number of median intervals nor a duplicate (jitter beyond the time step). */
  variable_frame_rate: boolean;
  /** Frames missing from the median-interval grid: each gap of k median intervals counts k − 1; `at_s` lists the time of the frame before each gap. */
  dropped: { count: number; at_s: number[] };
  /** Frames that come less than half a median interval after the previous one (including repeated timestamps); `at_s` lists their times. */
  duplicated: { count: number; at_s: number[] };
}

/** How strict the timing analysis is. */
export interface FrameTimingOptions {
  /** The container's time step, seconds (e.g. 1/90000): deviations up to two steps are rounding, not jitter. Default 1e-6. */
  tick_s?: number;
  /** Relative deviation from the interval grid still counted as constant rate (default 0.005 = 0.5 %). */
  tolerance?: number;
}

/**
 * Frame-interval statistics from per-frame presentation times (seconds, sorted ascending).
 * The base period is the median interval (robust to a few drops and duplicates). An interval of about
 * k periods (k ≥ 2, rounded) means k − 1 dropped frames; an interval under half a period is a
 * duplicate; the rate is variable when an interval is off its nearest whole number of periods by
 * more than max(2 ticks, tolerance × period). Needs at least two frames for intervals; with fewer,
 * intervals are NaN and nothing is flagged.
 */
export function frameTiming(t_s: ArrayLike<number>, options: FrameTimingOptions = {}): FrameTiming {
  const tick_s = options.tick_s ?? 1e-6;
  const tolerance = options.tolerance ?? 0.005;
  const n = t_s.length;
  const intervals = new Float64Array(Math.max(0, n - 1));
  for (let i = 0; i + 1 < n; i++) intervals[i] = t_s[i + 1]! - t_s[i]!;
  if (intervals.length === 0) {
    return { interval_s: { min: NaN, median: NaN, max: NaN, mean: NaN }, median_fps: NaN, variable_frame_rate: false, dropped: { count: 0, at_s: [] }, duplicated: { count: 0, at_s: [] } };
  }
  const sorted = Float64Array.from(intervals).sort();
  const m = sorted.length;
  const median = m % 2 === 1 ? sorted[(m - 1) / 2]! : (sorted[m / 2 - 1]! + sorted[m / 2]!) / 2;
  const mean = (t_s[n - 1]! - t_s[0]!) / m;
  const allowed = Math.max(2 * tick_s, tolerance * median);
  let vfr = false;
  const dropped: number[] = [];
  let droppedCount = 0;
  const duplicated: number[] = [];
  for (let i = 0; i < m; i++) {
    const d = intervals[i]!;
    if (d < 0.5 * median) { duplicated.push(t_s[i + 1]!); continue; }
    const k = Math.round(d / median);
    if (Math.abs(d - k * median) > allowed * Math.max(1, k)) vfr = true;
    if (k >= 2) { droppedCount += k - 1; dropped.push(t_s[i]!); }
  }
  return {
    interval_s: { min: sorted[0]!, median, max: sorted[m - 1]!, mean },
    median_fps: median > 0 ? 1 / median : NaN,
    variable_frame_rate: vfr,
    dropped: { count: droppedCount, at_s: dropped },
    duplicated: { count: duplicated.length, at_s: duplicated },
  };
}
