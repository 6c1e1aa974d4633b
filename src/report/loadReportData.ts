import { readdir, readFile } from 'node:fs/promises';
import { join, resolve } from 'node:path';
import { readRunRecords } from '../batch/rebuildSummary.js';
import type { FitReport } from '../fit/FitReport.js';
import type { TrackSummary } from '../track/TrackSummary.js';
import { InputError } from '../errors.js';
import { SOFTWARE } from '../version.js';
import type { ReportData, RunData } from './ReportData.js';
import { parseAngleCsv, parseRateCsv } from './readRunTables.js';

/** The run files the report links to, in the order shown. */
export const LINKED_RUN_FILES = ['angle.csv', 'rate.csv', 'fit.json', 'track.json', 'run.json', 'preview.png'] as const;

/**
 * Reads a batch output folder: every runs/<run>/run.json (the source of truth) and, for each run, the files
 * beside it. A missing or unreadable file becomes a problem sentence for that run, never a failure.
 * @param outDir the folder holding runs/
 * @param only the run ids to report (a batch's manifest); other run folders are named in `left_out`. Default: all.
 */
export async function loadReportData(outDir: string, only?: ReadonlySet<string>): Promise<ReportData> {
  const dir = resolve(outDir);
  try {
    await readdir(join(dir, 'runs'));
  } catch {
    throw new InputError(`${outDir} has no runs/ folder; give the output folder of a batch (the one holding runs/).`);
  }
  const { records, unreadable, left_out } = await readRunRecords(dir, only);
  const runs: RunData[] = [];
  for (const record of records) runs.push(await loadRun(join(dir, 'runs', record.run), record));
  const manifests = new Map<string, { path: string; sha256: string }>();
  for (const r of records) if (r.manifest) manifests.set(`${r.manifest.path}\n${r.manifest.sha256}`, r.manifest);
  return { out_dir: dir, generated_at: new Date().toISOString(), software: { ...SOFTWARE }, manifests: [...manifests.values()], runs, unreadable, left_out };
}

async function loadRun(runDir: string, record: RunData['record']): Promise<RunData> {
  const problems: string[] = [];
  let present: string[] = [];
  try {
    present = await readdir(runDir);
  } catch {
    present = [];
  }
  const files = LINKED_RUN_FILES.filter((f) => present.includes(f));
  const ok = record.status === 'ok';
  const expected = (name: string): boolean => {
    if (present.includes(name)) return true;
    if (ok) problems.push(`${name} is missing from the run folder.`);
    return false;
  };
  const readText = async (name: string): Promise<string | null> => (expected(name) ? readFile(join(runDir, name), 'utf8') : null);
  const attempt = async <T>(name: string, read: () => Promise<T | null>): Promise<T | null> => {
    try {
      return await read();
    } catch (err) {
      problems.push(`${name} could not be read (${(err as Error).message}).`);
      return null;
    }
  };
  const track = await attempt('track.json', async () => {
    const text = await readText('track.json');
    return text === null ? null : (JSON.parse(text) as TrackSummary);
  });
  const fitFile = await attempt('fit.json', async () => {
    const text = await readText('fit.json');
    return text === null ? null : (JSON.parse(text) as FitReport);
  });
  const angle = await attempt('angle.csv', async () => {
    const text = await readText('angle.csv');
    return text === null ? null : parseAngleCsv(text);
  });
  const rate = await attempt('rate.csv', async () => {
    const text = await readText('rate.csv');
    return text === null ? null : parseRateCsv(text);
  });
  const preview_png = await attempt('preview.png', async () => (expected('preview.png') ? new Uint8Array(await readFile(join(runDir, 'preview.png'))) : null));
  return { record, dir: runDir, files, track, fit: fitFile ?? record.fit, angle, rate, preview_png, problems };
}
