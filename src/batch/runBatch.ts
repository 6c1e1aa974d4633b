import { existsSync } from 'node:fs';
import { readdir, rm } from 'node:fs/promises';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { ensureWritableFolder } from '../ensureWritableFolder.js';
import { InputError, RevtraceError } from '../errors.js';
import { VERSION } from '../version.js';
import { hashFile } from '../video/hashFile.js';
import type { BatchEvent } from './BatchEvent.js';
import { cacheKey } from './cacheKey.js';
import { cleanStaleTemps } from './cleanStaleTemps.js';
import { createWorkerPool } from './createWorkerPool.js';
import { defaultJobs } from './defaultJobs.js';
import type { Manifest, ManifestRun } from './Manifest.js';
import { parseManifest } from './parseManifest.js';
import { processRun } from './processRun.js';
import { rebuildSummary } from './rebuildSummary.js';
import type { RunJob, RunProcessor, RunProgress } from './RunJob.js';
import type { RunRecord } from './RunRecord.js';
import { runRecordFor } from './runRecordFor.js';
import { inManifestTerms } from './inManifestTerms.js';
import { commitRecord, outputsPresent, readCommittedRecord, resetRunFolder } from './runFolder.js';
import { shardOf, type Shard } from './shard.js';
import { headlineRate } from './summaryRow.js';

export interface BatchOptions {
  /** Output folder; default `reports/<manifest name>/` under the current directory. */
  out?: string;
  /** Runs processed at once; default defaultJobs() (one per core). */
  jobs?: number;
  /** Process only this part of the manifest (runs whose shardOf(run, count) is index). */
  shard?: Shard | null;
  /** Redo runs even when their cached outputs are still valid. */
  force?: boolean;
  /** Defaults file; default `<manifest name>.defaults.json` beside the manifest, if present. */
  defaultsPath?: string;
  /** Rebuild summary.csv and batch.json at the end; default true without a shard, false with one. */
  summary?: boolean;
  /** Per-run processor; default the real pipeline, each run in a worker thread. */
  processor?: RunProcessor;
  tools?: { ffmpeg?: string; ffprobe?: string };
  /** Aborting stops the batch: running runs are cancelled and left uncommitted (a rerun does them). */
  signal?: AbortSignal;
  onEvent?: (event: BatchEvent) => void;
}

export interface BatchOutcome {
  out_dir: string;
  manifest: Manifest;
  /** Records of the runs of this batch (this shard), committed now or earlier, in manifest order. */
  records: RunRecord[];
  processed: number;
  cached: number;
  failed: { run: string; error: string }[];
  interrupted: boolean;
  summary_written: boolean;
}

/** The folder a manifest's outputs go to when --out is not given. */
export function defaultOutDir(manifest: Manifest): string {
  return resolve('reports', manifest.name);
}

/** Metadata a cached record is refreshed with, so editing notes or a setting value needs no rerun. */
function refreshed(record: RunRecord, job: RunJob): RunRecord | null {
  const fresh = { video: job.video, video_abs: job.video_abs, direction: job.direction, setting: job.setting, setting_unit: job.setting_unit, group: job.group, notes: job.notes, row: job.row, manifest: job.manifest };
  const same = (Object.keys(fresh) as (keyof typeof fresh)[]).every((k) => JSON.stringify(record[k]) === JSON.stringify(fresh[k]));
  return same ? null : { ...record, ...fresh };
}

/** A failed run's reason in one sentence, naming manifest columns where the stage named an option. */
function messageOf(err: unknown): string {
  if (err instanceof RevtraceError) return inManifestTerms(err.message);
  const m = err instanceof Error ? err.message : String(err);
  return `internal error: ${m}`;
}

/**
 * Runs every row of a manifest (or one shard of it): validates the whole manifest first (a
 * ManifestError lists every problem; nothing is written), skips runs whose input and settings are
 * unchanged, processes the rest `jobs` at a time, commits each run with run.json written last, and
 * rebuilds summary.csv and batch.json. A failed run is recorded with its reason; the others go on.
 */
export async function runBatch(manifestPath: string, options: BatchOptions = {}): Promise<BatchOutcome> {
  const manifest = await parseManifest(manifestPath, { defaultsPath: options.defaultsPath });
  const jobs = options.jobs ?? defaultJobs();
  if (!Number.isInteger(jobs) || jobs < 1) throw new InputError(`--jobs ${jobs} is not a number of parallel runs; give a whole number of 1 or more`);
  const outDir = options.out !== undefined ? resolve(options.out) : defaultOutDir(manifest);
  const shard = options.shard ?? null;
  const emit = options.onEvent ?? (() => {});
  const signal = options.signal ?? new AbortController().signal;
  const runsDir = join(outDir, 'runs');

  for (const r of manifest.runs) {
    if (resolve(r.video_abs).startsWith(`${runsDir}/`)) {
      throw new InputError(`the video of run ${r.run} (${r.video}) lies inside the output folder's runs/; keep inputs outside ${outDir}`);
    }
  }
  await ensureWritableFolder(outDir, options.out !== undefined ? '--out' : 'the output folder');
  const mine: ManifestRun[] = shard ? manifest.runs.filter((r) => shardOf(r.run, shard.count) === shard.index) : manifest.runs;

  let processor = options.processor;
  let close = async () => {};
  let worker: 'threads' | 'in-process' | 'custom' = 'custom';
  if (!processor) {
    const script = new URL('./runWorker.js', import.meta.url);
    if (existsSync(fileURLToPath(script))) {
      const pool = createWorkerPool(script, jobs);
      processor = pool.processor;
      close = pool.close;
      worker = 'threads';
    } else {
      processor = processRun; // running from TypeScript sources: no compiled worker script
      worker = 'in-process';
    }
  }
  emit({ type: 'plan', out_dir: outDir, manifest: manifest.path, runs_in_manifest: manifest.runs.length, runs: mine.length, shard, jobs, worker });

  // Stale temporary files: in our own runs' folders; when not sharded, in every run folder and the top level.
  let existing: string[] = [];
  try {
    existing = (await readdir(runsDir, { withFileTypes: true })).filter((d) => d.isDirectory()).map((d) => d.name);
  } catch {
    // no runs/ yet
  }
  const folders = shard ? mine.map((r) => join(runsDir, r.run)) : [outDir, ...existing.map((name) => join(runsDir, name))];
  const cleaned = await cleanStaleTemps(folders);
  if (cleaned.length > 0) emit({ type: 'cleaned', files: cleaned });
  if (!shard) {
    const known = new Set(manifest.runs.map((r) => r.run));
    const stray = existing.filter((name) => !name.startsWith('.') && !known.has(name)).sort();
    if (stray.length > 0) emit({ type: 'stray', runs: stray });
  }

  /** Set when the first run is redone: from then on the old summary.csv and batch.json no longer match runs/. */
  let staleSummaryDropped: Promise<void> | undefined;
  const records = new Map<string, RunRecord>();
  const failed: { run: string; error: string }[] = [];
  const unfinished: string[] = [];
  let processed = 0;
  let cached = 0;

  const failedRecord = (job: RunJob, error: string, started: Date): RunRecord => {
    const finished = new Date();
    return runRecordFor(job, {
      status: 'failed', error, fit: null, lost_share: null, warnings: [],
      started_at: started.toISOString(), finished_at: finished.toISOString(), elapsed_s: (finished.getTime() - started.getTime()) / 1000, outputs: [],
    });
  };

  /** Hashes, checks the cache, processes and commits one run; an interrupted run is left uncommitted. */
  const doRun = async (r: ManifestRun): Promise<void> => {
    const runDir = join(runsDir, r.run);
    const started = new Date();
    const job: RunJob = { ...r, run_dir: runDir, input: { size_bytes: -1, sha256: '' }, cache_key: '', manifest: { path: manifest.path, sha256: manifest.sha256 }, tools: options.tools ?? {} };
    let record: RunRecord | null = null;
    try {
      job.input = await hashFile(r.video_abs);
      job.cache_key = cacheKey({ input: job.input, settings: r.settings, software_version: VERSION });
    } catch (err) {
      record = failedRecord(job, `cannot read the video ${r.video} (${(err as Error).message}); check the file`, started);
    }
    if (!record && !options.force) {
      const previous = await readCommittedRecord(runDir);
      if (previous && previous.status === 'ok' && previous.cache_key === job.cache_key && (await outputsPresent(runDir, previous))) {
        const update = refreshed(previous, job);
        if (update) await commitRecord(runDir, update);
        records.set(r.run, update ?? previous);
        cached++;
        emit({ type: 'cached', run: r.run });
        return;
      }
    }
    if (signal.aborted) return;
    await (staleSummaryDropped ??= dropStaleSummary(outDir));
    await resetRunFolder(runDir);
    if (!record) {
      emit({ type: 'start', run: r.run, row: r.row });
      let lastProgress = 0;
      const onProgress = (p: RunProgress) => {
        const now = Date.now();
        if (now - lastProgress < 250) return;
        lastProgress = now;
        emit({ type: 'progress', run: r.run, frames: p.frames, t_s: p.t_s, duration_s: p.duration_s });
      };
      try {
        const result = await processor(job, signal, onProgress);
        record = { ...result, run: job.run, cache_key: job.cache_key, row: job.row, input: job.input, manifest: job.manifest };
      } catch (err) {
        record = failedRecord(job, messageOf(err), started);
      }
    }
    if (signal.aborted) {
      unfinished.push(r.run);
      return; // left uncommitted: a rerun does it again
    }
    await commitRecord(runDir, record);
    records.set(r.run, record);
    processed++;
    if (record.status === 'failed') {
      const error = record.error ?? 'unknown';
      failed.push({ run: r.run, error });
      emit({ type: 'failed', run: r.run, error });
    } else {
      const rate = headlineRate(record);
      emit({ type: 'done', run: r.run, elapsed_s: record.elapsed_s ?? 0, model: record.fit?.model ?? null, rate_deg_s: rate?.deg_s.value ?? null, se_deg_s: rate?.deg_s.se ?? null, lo_deg_s: rate?.deg_s.ci[0] ?? null, hi_deg_s: rate?.deg_s.ci[1] ?? null });
    }
  };

  try {
    const queue = [...mine];
    const lane = async () => {
      for (let r = queue.shift(); r && !signal.aborted; r = queue.shift()) await doRun(r);
    };
    await Promise.all(Array.from({ length: Math.min(jobs, Math.max(1, queue.length)) }, lane));
  } finally {
    await close();
  }

  const interrupted = signal.aborted;
  if (interrupted) {
    for (const r of mine) if (!records.has(r.run) && !unfinished.includes(r.run)) unfinished.push(r.run);
    emit({ type: 'interrupted', unfinished });
  }
  const wantSummary = options.summary ?? !shard;
  let summaryWritten = false;
  if (wantSummary && !interrupted) {
    const { records: all } = await rebuildSummary(outDir, new Set(manifest.runs.map((r) => r.run)));
    summaryWritten = true;
    emit({ type: 'summary', summary_csv: join(outDir, 'summary.csv'), batch_json: join(outDir, 'batch.json'), runs: all.length });
  }
  failed.sort((a, b) => mine.findIndex((r) => r.run === a.run) - mine.findIndex((r) => r.run === b.run));
  return {
    out_dir: outDir,
    manifest,
    records: mine.map((r) => records.get(r.run)).filter((x): x is RunRecord => x !== undefined),
    processed,
    cached,
    failed,
    interrupted,
    summary_written: summaryWritten,
  };
}

/**
 * Removes summary.csv, batch.json and the report before the first run folder is reset, so that an interrupted batch
 * never leaves a summary or report listing as ok a run whose files are gone (the next complete batch writes them again).
 */
async function dropStaleSummary(outDir: string): Promise<void> {
  for (const name of ['summary.csv', 'batch.json', 'report.html']) {
    try {
      await rm(join(outDir, name), { force: true });
    } catch (err) {
      throw new InputError(`cannot remove the old ${name} in ${outDir} before redoing runs (${(err as NodeJS.ErrnoException).code ?? (err as Error).message}); move it away and run again`, { cause: err });
    }
  }
}
