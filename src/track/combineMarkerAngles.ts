import { wrapDeg } from './rotorPlaneAngle.js';
import { unwrapAngles } from './unwrapAngles.js';

export interface CombinedMarkerAngles {
  /** Per frame: the hub angle from the markers found, deg, wrapped to (−180, 180]; NaN when none was found. */
  wrapped_deg: Float64Array;
  /** Per frame: how many markers were found. */
  found: Uint8Array;
  /** Per marker: its angle relative to the first marker in the rotor plane, deg (0 for the first). */
  phase_offset_deg: number[];
  /** Index of the first frame where every marker was found (−1 when there is none). */
  first_all_index: number;
  /** Frames where every marker was found (the offsets are averaged over them). */
  all_found_frames: number;
}

/**
 * Combines several markers' rotor-plane angles (deg, wrapped, NaN when lost; one array per marker) into one
 * hub angle per frame. Each marker is unwrapped on its own (unwrapAngles); its fixed phase offset — its angle
 * relative to the first marker, taken at the first frame where all are found and refined by the mean
 * difference over every frame where all are found — is subtracted, so each marker reads the first marker's
 * angle; the frame's angle is the mean over the markers found in it (each first moved by whole turns to
 * within 180° of the lowest-numbered marker found, so a marker's own turn count cannot pull the mean).
 * The result is wrapped again so that the whole-turn count is decided once, on the combined series.
 * @param t_s frame times, seconds, increasing
 */
export function combineMarkerAngles(t_s: Float64Array, wrapped_deg: Float64Array[]): CombinedMarkerAngles {
  const n = t_s.length;
  const m = wrapped_deg.length;
  const unwrapped = wrapped_deg.map((w) => unwrapAngles(t_s, w).angle_deg);
  const found = new Uint8Array(n);
  let first = -1;
  let allCount = 0;
  const diffSum = new Float64Array(m);
  for (let i = 0; i < n; i++) {
    let c = 0;
    for (let k = 0; k < m; k++) if (Number.isFinite(wrapped_deg[k][i])) c++;
    found[i] = c;
    if (c !== m) continue;
    if (first < 0) first = i;
    allCount++;
  }
  // offsets: at the first all-found frame, then the mean wrapped departure from it over all such frames
  const offset = new Array<number>(m).fill(0);
  if (first >= 0) {
    for (let k = 1; k < m; k++) offset[k] = wrapDeg(wrapped_deg[k][first] - wrapped_deg[0][first]);
    for (let i = first; i < n; i++) {
      if (found[i] !== m) continue;
      for (let k = 1; k < m; k++) diffSum[k] += wrapDeg(wrapped_deg[k][i] - wrapped_deg[0][i] - offset[k]);
    }
    for (let k = 1; k < m; k++) offset[k] = wrapDeg(offset[k] + diffSum[k] / allCount);
  }
  const out = new Float64Array(n).fill(Number.NaN);
  for (let i = 0; i < n; i++) {
    if (found[i] === 0) continue;
    let ref = Number.NaN;
    let sum = 0;
    for (let k = 0; k < m; k++) {
      const u = unwrapped[k][i];
      if (!Number.isFinite(u)) continue;
      let v = u - offset[k];
      if (Number.isNaN(ref)) ref = v;
      else v -= 360 * Math.round((v - ref) / 360);
      sum += v;
    }
    out[i] = wrapDeg(sum / found[i]);
  }
  return { wrapped_deg: out, found, phase_offset_deg: offset, first_all_index: first, all_found_frames: allCount };
}
