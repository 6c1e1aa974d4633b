import { wrapDeg } from './rotorPlaneAngle.js';
import { robustSpread, upperMedian } from './robustSpread.js';
import { unwrapAngles } from './unwrapAngles.js';

/** Markers whose phase-aligned angles lie further apart than this many robust SDs of their usual difference disagree… */
const DISAGREE_SIGMAS = 6;
/** …but the band is never narrower than this, deg (compression, noise, an uncorrected view)… */
const MIN_DISAGREE_DEG = 2;
/** …nor wider than this, deg: beyond it one of them has taken something else, whatever the scatter says. */
const MAX_DISAGREE_DEG = 15;

export interface CombinedMarkerAngles {
  /** Per frame: the hub angle from the markers found, deg, wrapped to (−180, 180]; NaN when none was found. */
  wrapped_deg: Float64Array;
  /** Per frame: how many markers were found. */
  found: Uint8Array;
  /** Per marker: its angle relative to the first marker in the rotor plane, deg (0 for the first). */
  phase_offset_deg: number[];
  /** Index of the first frame where every marker was found (−1 when there is none). */
  first_all_index: number;
  /** Frames where every marker was found (the offsets are the median over them). */
  all_found_frames: number;
  /** Per frame: 1 when the markers found disagreed about the hub's angle (the frame's angle is then NaN). */
  disagree: Uint8Array;
  /** How far apart the markers' phase-aligned angles may lie before they disagree, deg. */
  disagree_band_deg: number;
}

/**
 * Combines several markers' rotor-plane angles (deg, wrapped, NaN when lost; one array per marker) into one
 * hub angle per frame. Each marker is unwrapped on its own (unwrapAngles); its fixed phase offset — its angle
 * relative to the first marker, taken at the first frame where all are found and refined by the median
 * difference over every frame where all are found (a marker that took a particle for a while does not move it)
 * — is subtracted, so each marker reads the first marker's angle; the frame's angle is the mean over the markers
 * found in it (each first moved by whole turns to within 180° of the lowest-numbered marker found, so a marker's
 * own turn count cannot pull the mean). Markers on one rigid hub keep their difference: in a frame where their
 * aligned angles lie further apart than DISAGREE_SIGMAS robust SDs of the usual difference (MIN_DISAGREE_DEG to
 * MAX_DISAGREE_DEG), one of them has followed something else; with three or more the ones far from the median
 * are left out, with two the frame is lost (`disagree`): nothing says which one is right.
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
  for (let i = 0; i < n; i++) {
    let c = 0;
    for (let k = 0; k < m; k++) if (Number.isFinite(wrapped_deg[k][i])) c++;
    found[i] = c;
    if (c !== m) continue;
    if (first < 0) first = i;
    allCount++;
  }
  // offsets: at the first all-found frame, then the median wrapped departure from it over all such frames
  const offset = new Array<number>(m).fill(0);
  const deviations: number[] = [];
  if (first >= 0) {
    for (let k = 1; k < m; k++) {
      const at = wrapDeg(wrapped_deg[k][first] - wrapped_deg[0][first]);
      const departures: number[] = [];
      for (let i = first; i < n; i++) if (found[i] === m) departures.push(wrapDeg(wrapped_deg[k][i] - wrapped_deg[0][i] - at));
      offset[k] = wrapDeg(at + upperMedian(departures));
      for (let i = first; i < n; i++) if (found[i] === m) deviations.push(wrapDeg(wrapped_deg[k][i] - wrapped_deg[0][i] - offset[k]));
    }
  }
  const sigma = deviations.length > 0 ? robustSpread(deviations).sigma : 0;
  const band = Math.min(MAX_DISAGREE_DEG, Math.max(MIN_DISAGREE_DEG, DISAGREE_SIGMAS * sigma));
  const out = new Float64Array(n).fill(Number.NaN);
  const disagree = new Uint8Array(n);
  const aligned: number[] = [];
  for (let i = 0; i < n; i++) {
    if (found[i] === 0) continue;
    aligned.length = 0;
    let ref = Number.NaN;
    for (let k = 0; k < m; k++) {
      const u = unwrapped[k][i];
      if (!Number.isFinite(u)) continue;
      let v = u - offset[k];
      if (Number.isNaN(ref)) ref = v;
      else v -= 360 * Math.round((v - ref) / 360);
      aligned.push(v);
    }
    let kept = aligned;
    if (aligned.length >= 2 && Math.max(...aligned) - Math.min(...aligned) > band) {
      const mid = upperMedian(aligned);
      kept = aligned.length >= 3 ? aligned.filter((v) => Math.abs(v - mid) <= band / 2) : [];
      if (kept.length < 2 || Math.max(...kept) - Math.min(...kept) > band) {
        disagree[i] = 1;
        continue;
      }
    }
    out[i] = wrapDeg(kept.reduce((a, v) => a + v, 0) / kept.length);
  }
  return { wrapped_deg: out, found, phase_offset_deg: offset, first_all_index: first, all_found_frames: allCount, disagree, disagree_band_deg: band };
}
