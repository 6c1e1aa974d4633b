import type { Shard } from './shard.js';

/** What a batch reports as it goes; the CLI shows these as bars, lines or JSON lines. */
export type BatchEvent =
  | { type: 'plan'; out_dir: string; manifest: string; runs_in_manifest: number; runs: number; shard: Shard | null; jobs: number; worker: 'threads' | 'in-process' | 'custom' }
  | { type: 'cleaned'; files: string[] }
  | { type: 'stray'; runs: string[] }
  | { type: 'cached'; run: string }
  | { type: 'start'; run: string; row: number }
  | { type: 'progress'; run: string; frames: number; t_s: number; duration_s: number }
  | { type: 'done'; run: string; elapsed_s: number; model: string | null; rate_deg_s: number | null; se_deg_s: number | null; lo_deg_s: number | null; hi_deg_s: number | null }
  | { type: 'failed'; run: string; error: string }
  | { type: 'summary'; summary_csv: string; batch_json: string; runs: number }
  | { type: 'interrupted'; unfinished: string[] };
