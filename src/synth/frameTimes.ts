import type { SynthSpec } from './SynthSpec.js';
import { nominalFrameCount } from './SynthSpec.js';
import { seededRandom } from './seededRandom.js';
import { WRITE_TIMESCALE } from '../video/writeVideo.js';

/** Random stream number reserved for frame timing. */
const TIMING_STREAM = 101;

/**
 * Presentation time of every frame actually written, seconds, strictly increasing, first frame at 0.
 * Nominal slot k sits at k/fps; with timing jitter each slot after the first moves by a seeded uniform
 * amount in ±jitter_s (jitter ≤ 0.4/fps keeps the order), and slots listed in dropped_frames are left out.
 * Times are rounded to whole ticks of the MP4 time scale writeVideo uses (1/90000 s), so the times
 * read back from the file are exactly the truth times.
 */
export function frameTimes(spec: Pick<SynthSpec, 'seed' | 'fps' | 'duration_s' | 'realism'>): Float64Array {
  const slots = nominalFrameCount(spec);
  const { jitter_s, dropped_frames } = spec.realism.timing;
  const dropped = new Set(dropped_frames);
  const random = seededRandom(spec.seed, TIMING_STREAM);
  const out = new Float64Array(slots - dropped.size);
  let n = 0;
  for (let k = 0; k < slots; k++) {
    const shift = k === 0 ? 0 : (2 * random.uniform() - 1) * jitter_s;
    if (dropped.has(k)) continue;
    out[n++] = Math.round((k / spec.fps + shift) * WRITE_TIMESCALE) / WRITE_TIMESCALE;
  }
  return out;
}
