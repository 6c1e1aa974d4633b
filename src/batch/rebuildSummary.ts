import { readdir, readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { stringify } from 'csv-stringify/sync';
import { SOFTWARE } from '../version.js';
import { writeFileAtomic } from '../writeFileAtomic.js';
import type { RunRecord } from './RunRecord.js';
import { SUMMARY_COLUMNS, summaryRow } from './summaryRow.js';

/** The contents of batch.json: what ran, with which settings and versions, what failed and why. */
export interface BatchFile {
  software: { name: 'revtrace'; version: string };
  counts: { runs: number; ok: number; failed: number };
  manifests: { path: string; sha256: string }[];
  software_versions: string[];
  failed: { run: string; error: string }[];
  /** run folders whose run.json could not be read (left out of the summary). */
  unreadable: { run: string; reason: string }[];
  /** run folders under runs/ that are not in this batch's manifest (left out of the summary and the report; never deleted). */
  left_out: string[];
  runs: {
    run: string;
    status: 'ok' | 'failed';
    error: string | null;
    video: string;
    input: { size_bytes: number; sha256: string } | null;
    settings: Record<string, unknown>;
    software_version: string;
    cache_key: string;
    started_at: string;
    finished_at: string;
    elapsed_s: number | null;
  }[];
}

/** What readRunRecords found under runs/. */
export interface RunRecords {
  records: RunRecord[];
  /** Folders whose run.json could not be read. */
  unreadable: { run: string; reason: string }[];
  /** Folders not among the wanted runs (empty when every folder is wanted). */
  left_out: string[];
}

/**
 * Reads every committed runs/<run>/run.json under outDir, in summary order (manifest row, then run id).
 * @param only the run ids wanted (a batch's manifest); other folders are named in `left_out`, not read. Default: all.
 */
export async function readRunRecords(outDir: string, only?: ReadonlySet<string>): Promise<RunRecords> {
  const runsDir = join(outDir, 'runs');
  let names: string[] = [];
  try {
    names = (await readdir(runsDir, { withFileTypes: true })).filter((d) => d.isDirectory() && !d.name.startsWith('.')).map((d) => d.name);
  } catch {
    names = [];
  }
  const records: RunRecord[] = [];
  const unreadable: { run: string; reason: string }[] = [];
  const left_out = only ? names.filter((name) => !only.has(name)).sort() : [];
  for (const name of names.sort()) {
    if (only && !only.has(name)) continue;
    let text: string;
    try {
      text = await readFile(join(runsDir, name, 'run.json'), 'utf8');
    } catch {
      continue; // not committed: never started, or interrupted; a rerun does it
    }
    try {
      const r = JSON.parse(text) as RunRecord;
      if (typeof r.run !== 'string' || (r.status !== 'ok' && r.status !== 'failed')) throw new Error('not a run record');
      records.push(r);
    } catch (err) {
      unreadable.push({ run: name, reason: (err as Error).message });
    }
  }
  records.sort((a, b) => (a.row ?? Infinity) - (b.row ?? Infinity) || (a.run < b.run ? -1 : a.run > b.run ? 1 : 0));
  return { records, unreadable, left_out };
}

/**
 * Rebuilds summary.csv (one row per run) and batch.json from the runs/<run>/run.json under outDir,
 * each written atomically. Shards written into one folder are merged this way (no `only`: every folder).
 * @param only the run ids to summarise (a batch's manifest); default all
 */
export async function rebuildSummary(outDir: string, only?: ReadonlySet<string>): Promise<RunRecords> {
  const found = await readRunRecords(outDir, only);
  const { records, unreadable, left_out } = found;
  const csv = stringify(records.map(summaryRow), { header: true, columns: [...SUMMARY_COLUMNS] });
  const manifests = new Map<string, { path: string; sha256: string }>();
  for (const r of records) if (r.manifest) manifests.set(`${r.manifest.path}\n${r.manifest.sha256}`, r.manifest);
  const batch: BatchFile = {
    software: { ...SOFTWARE },
    counts: { runs: records.length, ok: records.filter((r) => r.status === 'ok').length, failed: records.filter((r) => r.status === 'failed').length },
    manifests: [...manifests.values()],
    software_versions: [...new Set(records.map((r) => r.software.version))].sort(),
    failed: records.filter((r) => r.status === 'failed').map((r) => ({ run: r.run, error: r.error ?? 'unknown' })),
    unreadable,
    left_out,
    runs: records.map((r) => ({
      run: r.run,
      status: r.status,
      error: r.error,
      video: r.video,
      input: r.input ?? null,
      settings: r.settings,
      software_version: r.software.version,
      cache_key: r.cache_key,
      started_at: r.started_at,
      finished_at: r.finished_at,
      elapsed_s: r.elapsed_s ?? null,
    })),
  };
  await writeFileAtomic(join(outDir, 'summary.csv'), csv);
  await writeFileAtomic(join(outDir, 'batch.json'), `${JSON.stringify(batch, null, 2)}\n`);
  return found;
}
