import { availableParallelism } from 'node:os';

/**
 * Runs processed at once when --jobs is not given: one per core. Measured with bench/batch.mjs
 * (bench/RESULTS.md, "Batch"): on 2 cores one run at a time left a core idle while a run's own
 * JavaScript tracking waited on ffmpeg (ratio 1.68 to bare decodes), while 2–4 at once reached
 * 0.76–1.01; the figures from a shared, loaded machine do not separate 2, 3 and 4.
 */
export function defaultJobs(cores: number = availableParallelism()): number {
  return Math.max(1, cores);
}
