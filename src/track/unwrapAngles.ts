import { wrapDeg } from './rotorPlaneAngle.js';

export interface UnwrapOptions {
  /** A gap is split when the rotation over it is uncertain by more than this, deg (default 90). */
  max_ambiguity_deg?: number;
  /** Allowed relative change of the rate across a gap (default 0.25 = 25 %). */
  rate_change_fraction?: number;
  /** Number of recent good frames whose least-squares slope predicts the next step (default 30). */
  history?: number;
  /** Consecutive good frames after a gap whose slope gives the rate the rotor came out of the gap with (default 6). */
  lookahead?: number;
}

export interface UnwrapSplit {
  /** Index (into the input arrays) of the last good frame before the gap. */
  after_index: number;
  t_s: number;
  gap_s: number;
}

export interface UnwrapResult {
  /** Unwrapped, cumulative angle, deg; NaN where the input was NaN. */
  angle_deg: Float64Array;
  splits: UnwrapSplit[];
  /** Rotation per frame between consecutive good frames, |deg| (one entry per pair). */
  step_deg: Float64Array;
}

/**
 * Unwraps per-frame angles (deg, wrapped, NaN for a lost frame) into a cumulative angle.
 * Each step is taken as the wrapped difference nearest to the prediction `rate × Δt`, where the rate is
 * the least-squares slope of the last `history` good frames. The first good frame keeps its wrapped value.
 * Rule for gaps: the rotor may speed up or slow down while it is not seen, so the rate it comes out with is
 * measured too, from the next `lookahead` consecutive good frames (their steps taken nearest to zero). The
 * rotation over a gap of Δt seconds is predicted with the mean of the rates before and after it (the
 * trapezoid rule: right for a steady change of rate) and is uncertain by
 * Δt × (3·se(rate) + rate_change_fraction·max(|rate before|, |rate after|) + |rate after − rate before| / 2);
 * with fewer than 3 recent frames it is unknown (a gap then always splits). When that exceeds
 * max_ambiguity_deg the whole-turn count across the gap cannot be known: the series is split there, the
 * angle after the gap is still placed nearest to the prediction (a best guess of the turn count), the rate
 * history restarts, and the split is reported so that rates are fitted within segments only.
 * @param t_s frame times, seconds, increasing
 */
export function unwrapAngles(t_s: Float64Array, wrapped_deg: Float64Array, options: UnwrapOptions = {}): UnwrapResult {
  const maxAmbiguity = options.max_ambiguity_deg ?? 90;
  const fraction = options.rate_change_fraction ?? 0.25;
  const historySize = options.history ?? 30;
  const lookahead = options.lookahead ?? 6;
  const n = t_s.length;
  const angle = new Float64Array(n).fill(Number.NaN);
  const splits: UnwrapSplit[] = [];
  const steps: number[] = [];
  const recentT: number[] = [];
  const recentA: number[] = [];
  let prev = -1;
  for (let i = 0; i < n; i++) {
    const w = wrapped_deg[i];
    if (Number.isNaN(w)) continue;
    if (prev < 0) {
      angle[i] = w;
      prev = i;
      recentT.push(t_s[i]);
      recentA.push(w);
      continue;
    }
    const dt = t_s[i] - t_s[prev];
    const { rate, se } = rateEstimate(recentT, recentA);
    // across a gap, the rate the rotor comes out with (when the frames after it show one)
    const after = i - prev > 1 ? rateAfter(t_s, wrapped_deg, i, lookahead) : null;
    const rateOut = after ?? rate;
    const predicted = ((rate + rateOut) / 2) * dt;
    const uncertainty = dt * (3 * se + fraction * Math.max(Math.abs(rate), Math.abs(rateOut)) + Math.abs(rateOut - rate) / 2);
    const delta = predicted + wrapDeg(w - angle[prev] - predicted);
    angle[i] = angle[prev] + delta;
    if (i - prev > 1 && uncertainty > maxAmbiguity) {
      splits.push({ after_index: prev, t_s: t_s[prev], gap_s: dt });
      recentT.length = 0;
      recentA.length = 0;
    }
    recentT.push(t_s[i]);
    recentA.push(angle[i]);
    if (recentT.length > historySize) {
      recentT.shift();
      recentA.shift();
    }
    if (i - prev === 1) steps.push(Math.abs(delta));
    prev = i;
  }
  return { angle_deg: angle, splits, step_deg: Float64Array.from(steps) };
}

/**
 * Rate (deg/s) over the good frames from index `from` on that follow each other without a lost frame (at most
 * `count`), each step taken nearest to zero (so below 180° per frame); null when fewer than 3 such frames follow.
 */
function rateAfter(t_s: Float64Array, wrapped_deg: Float64Array, from: number, count: number): number | null {
  const t: number[] = [t_s[from]];
  const a: number[] = [wrapped_deg[from]];
  for (let k = from + 1; k < t_s.length && t.length < count && !Number.isNaN(wrapped_deg[k]); k++) {
    t.push(t_s[k]);
    a.push(a[a.length - 1] + wrapDeg(wrapped_deg[k] - wrapped_deg[k - 1]));
  }
  return t.length >= 3 ? rateEstimate(t, a).rate : null;
}

/** Least-squares slope of angle on time (deg/s) and its standard error; se = ∞ with fewer than 3 points. */
function rateEstimate(t: number[], a: number[]): { rate: number; se: number } {
  const n = t.length;
  if (n < 2) return { rate: 0, se: Number.POSITIVE_INFINITY };
  const t0 = t[n - 1];
  let mt = 0;
  let ma = 0;
  for (let k = 0; k < n; k++) {
    mt += t[k] - t0;
    ma += a[k];
  }
  mt /= n;
  ma /= n;
  let stt = 0;
  let sta = 0;
  for (let k = 0; k < n; k++) {
    const dt = t[k] - t0 - mt;
    stt += dt * dt;
    sta += dt * (a[k] - ma);
  }
  if (!(stt > 0)) return { rate: 0, se: Number.POSITIVE_INFINITY };
  const rate = sta / stt;
  if (n < 3) return { rate, se: Number.POSITIVE_INFINITY };
  let rss = 0;
  for (let k = 0; k < n; k++) rss += (a[k] - ma - rate * (t[k] - t0 - mt)) ** 2;
  return { rate, se: Math.sqrt(rss / (n - 2) / stt) };
}
