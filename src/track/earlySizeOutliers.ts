import { upperMedian } from './robustSpread.js';
import { AREA_HISTORY, steadySizeBand } from './steadySizeBand.js';

/**
 * Frames a spot follower accepted before it knew the marker's size, whose spot was not the marker's size after
 * all. At a start (and after a fresh search) the follower takes what it finds and learns the size from it, so a
 * particle merged with the marker in the very first frames passes unchecked, and its centroid, still on the
 * marker's circle, drags the angle by degrees. Afterwards the size is known: each run of kept frames that were not
 * held to the steady-size band is compared with the band (steadySizeBand) of the next AREA_HISTORY kept frames that
 * were — the nearest stretch in time — but only the frames before the follower last lost the marker in that run (a
 * particle leaving the marker breaks the track; motion blur in a spin-up or coast-down changes the size smoothly
 * without a break, and those first frames are the most informative ones). Runs without such a stretch are left alone.
 * @param area_px spot area per frame, px (NaN when lost); held: 1 when that frame was held to the band; kept: the frame was accepted
 * @returns the indices of kept frames to mark lost:shape
 */
export function earlySizeOutliers(area_px: ArrayLike<number>, held: ArrayLike<number>, kept: (i: number) => boolean): number[] {
  const n = area_px.length;
  const out: number[] = [];
  let i = 0;
  while (i < n) {
    if (!kept(i) || held[i] === 1 || !Number.isFinite(area_px[i])) { i++; continue; }
    const run: number[] = [];
    let j = i;
    for (; j < n && !(kept(j) && held[j] === 1); j++) if (kept(j) && Number.isFinite(area_px[j])) run.push(j);
    const reference: number[] = [];
    for (let k = j; k < n && reference.length < AREA_HISTORY; k++) if (kept(k) && held[k] === 1 && Number.isFinite(area_px[k])) reference.push(area_px[k]);
    // only the frames before the follower last lost the marker are in doubt (something left the marker then); a size
    // that changed smoothly from frame to frame up to the held stretch (motion blur in a spin-up or coast-down) is not
    let lastLost = -1;
    for (let k = i; k < j; k++) if (!kept(k)) lastLost = k;
    if (lastLost >= 0 && reference.length === AREA_HISTORY) {
      const typical = upperMedian(reference);
      const band = steadySizeBand(reference);
      for (const r of run) if (r < lastLost && Math.abs(area_px[r] - typical) > band) out.push(r);
    }
    i = j;
  }
  return out;
}
