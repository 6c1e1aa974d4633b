import { availableParallelism } from 'node:os';

/**
 * Runs processed at once when --jobs is not given: one per core. Measured with bench/batch.mjs
 * (see bench/RESULTS.md, "Batch"): ffmpeg's own decoding threads already use spare cores, so more
 * runs than cores only add contention.
 */
export function defaultJobs(cores: number = availableParallelism()): number {
  return Math.max(1, cores);
}
