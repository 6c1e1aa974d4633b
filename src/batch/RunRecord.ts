import type { FitReport } from '../fit/FitReport.js';

export type Direction = 'forward' | 'reverse';

/**
 * runs/<run>/run.json: the source of truth for one run of a batch. summary.csv and batch.json are
 * rebuilt from the set of run.json files, which is how shards written into one folder are merged.
 */
/** What the manifest says about a run: its id, its video and how it was set up. */
export interface RunIdentity {
  run: string;
  /** Video path as given in the manifest, and resolved absolute path. */
  video: string;
  video_abs: string;
  direction: Direction;
  setting: number | null;
  setting_unit: string;
  group: string;
  notes: string;
}

export interface RunRecord extends RunIdentity {
  status: 'ok' | 'failed';
  /** One sentence, when failed. */
  error: string | null;
  /** Effective track and fit settings used (after defaults and per-row overrides). */
  settings: Record<string, unknown>;
  /** Hash of input (size + content) and effective settings: the cache key. */
  cache_key: string;
  started_at: string;
  finished_at: string;
  /** The fit, copied here so the summary needs no other file; null when failed. */
  fit: FitReport | null;
  lost_share: number | null;
  warnings: string[];
  software: { name: 'revtrace'; version: string };
  /** Added by the batch developer (optional, so older records still read): */
  /** Manifest data row (1 = first row under the header); orders summary.csv. */
  row?: number;
  /** Size and SHA-256 of the input video, as hashed for the cache key. */
  input?: { size_bytes: number; sha256: string };
  /** The manifest the run came from. */
  manifest?: { path: string; sha256: string };
  /** Wall time spent processing the run, seconds. */
  elapsed_s?: number;
  /** Files written in the run folder besides run.json. */
  outputs?: string[];
}
