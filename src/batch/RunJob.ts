import type { ManifestRun } from './Manifest.js';
import type { RunRecord } from './RunRecord.js';

/** Everything a processor needs to do one run; plain data, so it can be posted to a worker thread. */
export interface RunJob extends ManifestRun {
  /** Absolute path of runs/<run>/, which exists and is empty of outputs when the processor starts. */
  run_dir: string;
  input: { size_bytes: number; sha256: string };
  cache_key: string;
  manifest: { path: string; sha256: string };
  /** ffmpeg/ffprobe executables chosen on the command line, if any. */
  tools: { ffmpeg?: string; ffprobe?: string };
}

/** Progress of one run's decoding: frames done, video time reached and clip length, seconds. */
export interface RunProgress {
  frames: number;
  t_s: number;
  duration_s: number;
}

/**
 * Does one run: writes its outputs (each atomically) into job.run_dir, except run.json, and returns
 * the record. Throws (or returns status 'failed') when the run fails; rejects promptly when `signal` aborts.
 */
export type RunProcessor = (job: RunJob, signal: AbortSignal, onProgress: (p: RunProgress) => void) => Promise<RunRecord>;
