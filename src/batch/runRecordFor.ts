import { SOFTWARE } from '../version.js';
import type { FitReport } from '../fit/FitReport.js';
import type { RunJob } from './RunJob.js';
import type { RunRecord } from './RunRecord.js';

/** What a processor found; the rest of the record comes from the job. */
export interface RunOutcome {
  status: 'ok' | 'failed';
  error: string | null;
  fit: FitReport | null;
  lost_share: number | null;
  warnings: string[];
  started_at: string;
  finished_at: string;
  elapsed_s: number;
  outputs: string[];
}

/** Builds the run.json record of a job from what its processing found. */
export function runRecordFor(job: RunJob, outcome: RunOutcome): RunRecord {
  return {
    run: job.run,
    video: job.video,
    video_abs: job.video_abs,
    direction: job.direction,
    setting: job.setting,
    setting_unit: job.setting_unit,
    group: job.group,
    notes: job.notes,
    status: outcome.status,
    error: outcome.error,
    settings: job.settings as unknown as Record<string, unknown>,
    cache_key: job.cache_key,
    started_at: outcome.started_at,
    finished_at: outcome.finished_at,
    fit: outcome.fit,
    lost_share: outcome.lost_share,
    warnings: outcome.warnings,
    software: { ...SOFTWARE },
    row: job.row,
    input: job.input,
    manifest: job.manifest,
    elapsed_s: outcome.elapsed_s,
    outputs: outcome.outputs,
  };
}
