import { join, resolve } from 'node:path';
import { stringify } from 'csv-stringify/sync';
import { runBatch, type BatchOptions, type BatchOutcome } from '../batch/runBatch.js';
import { writeReport } from '../report/writeReport.js';
import { ensureWritableFolder } from '../ensureWritableFolder.js';
import { writeFileAtomic } from '../writeFileAtomic.js';
import { demoDay, type DemoRun } from './demoDay.js';
import { prepareDemoClips } from './prepareDemoClips.js';

/** Options of runDemo. */
export interface DemoOptions {
  /** Output folder (default reports/demo under the current directory). */
  out?: string;
  /** A reduced day (fewer, shorter, smaller clips), for tests. */
  quick?: boolean;
  /** Runs processed at once (default: the batch's own choice). */
  jobs?: number;
  tools?: { ffmpeg?: string; ffprobe?: string };
  signal?: AbortSignal;
  onLog?: (line: string) => void;
  onEvent?: BatchOptions['onEvent'];
}

/** What the demo made. */
export interface DemoOutcome {
  out_dir: string;
  manifest_path: string;
  report_path: string;
  truth_path: string;
  runs: DemoRun[];
  rendered: number;
  reused: number;
  batch: BatchOutcome;
}

/** Settings shared by every demo row (the manifest's defaults file). */
const DEMO_DEFAULTS = { marker: 'bright', setting_unit: 'cm', group: 'Kestrel rotor', margin: 0.25, level: 0.95 };

/** The demo's manifest: one row per run, clip paths relative to the manifest. */
export function demoManifestCsv(runs: DemoRun[]): string {
  const settingColumns = ['roi', 'center', 'tilt', 'anchor', 'model'];
  const columns = ['video', 'run', 'direction', 'setting', 'notes', ...settingColumns];
  const rows = runs.map((r) => [`clips/${r.clip}`, r.run, r.direction, String(r.setting), r.notes, ...settingColumns.map((c) => r.cells[c] ?? '')]);
  return stringify([columns, ...rows]);
}

/** The renderer's truth per run, for comparing the results by hand. */
function demoTruthCsv(runs: DemoRun[]): string {
  return stringify([['run', 'direction', 'setting', 'true_rate_deg_s'], ...runs.map((r) => [r.run, r.direction, String(r.setting), r.truth_rate_deg_s === null ? '' : r.truth_rate_deg_s.toFixed(6)])]);
}

/**
 * The whole job on an invented day of footage: renders the demo clips (reused when already there),
 * writes the manifest and its defaults file, runs the batch (cached runs are skipped) and the report.
 */
export async function runDemo(options: DemoOptions = {}): Promise<DemoOutcome> {
  const outDir = resolve(options.out ?? join('reports', 'demo'));
  await ensureWritableFolder(outDir, '--out');
  const runs = demoDay({ quick: options.quick });
  const clipsDir = join(outDir, 'clips');
  const { rendered, reused } = await prepareDemoClips(runs, clipsDir, { ffmpeg: options.tools?.ffmpeg, onLog: options.onLog });
  const manifestPath = join(outDir, 'kestrel-day.csv');
  await writeFileAtomic(manifestPath, demoManifestCsv(runs));
  await writeFileAtomic(join(outDir, 'kestrel-day.defaults.json'), `${JSON.stringify(DEMO_DEFAULTS, null, 2)}\n`);
  const truthPath = join(outDir, 'kestrel-day.truth.csv');
  await writeFileAtomic(truthPath, demoTruthCsv(runs));
  const batch = await runBatch(manifestPath, { out: join(outDir, 'results'), jobs: options.jobs, tools: options.tools, signal: options.signal, onEvent: options.onEvent });
  const reportPath = await writeReport(batch.out_dir, { title: 'Kestrel rotor — forward and reverse flow (revtrace demo)' });
  return { out_dir: outDir, manifest_path: manifestPath, report_path: reportPath, truth_path: truthPath, runs, rendered, reused, batch };
}
