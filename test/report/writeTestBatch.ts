// Test inputs only: writes small, seeded run folders in the layout the batch stage produces
// (runs/<run>/{angle.csv,rate.csv,fit.json,track.json,preview.png,run.json}) so the report can be tested
// before and independently of the real pipeline. All numbers here are invented for the tests.
import { mkdir, mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { PNG } from 'pngjs';
import type { Direction, RunRecord } from '../../src/batch/RunRecord.js';
import type { FitReport } from '../../src/fit/FitReport.js';
import type { TrackSummary } from '../../src/track/TrackSummary.js';
import { seededRandom } from '../../src/synth/seededRandom.js';
import { loadReportData } from '../../src/report/loadReportData.js';
import type { RunData } from '../../src/report/ReportData.js';

export interface TestRun {
  run: string;
  direction: Direction;
  setting: number | null;
  /** True steady rate, deg/s. */
  rate_deg_s: number;
  /** Standard error written into fit.json, deg/s. */
  se_deg_s?: number;
  notes?: string;
  group?: string;
  failed?: string;
  duration_s?: number;
  fps?: number;
  /** Share of frames lost to 'lost:no-blob'. */
  lost_share?: number;
  margin_deg_s?: number;
}

const estimate = (value: number, se: number, df = 30) => {
  // two-sided 95 % Student t quantiles for 30 and 10 degrees of freedom, 2.042 and 2.228 (published t tables, from memory)
  const t = df >= 30 ? 2.042 : 2.228;
  return { value, se, ci: [value - t * se, value + t * se] as [number, number], level: 0.95 };
};

/** Writes one test run folder under outDir/runs/<run>. */
export async function writeTestRun(outDir: string, spec: TestRun, seed = 1): Promise<void> {
  const dir = join(outDir, 'runs', spec.run);
  await mkdir(dir, { recursive: true });
  const rng = seededRandom(seed, 11);
  const fps = spec.fps ?? 30;
  const duration = spec.duration_s ?? 4;
  const n = Math.round(duration * fps);
  const se = spec.se_deg_s ?? Math.max(0.02, Math.abs(spec.rate_deg_s) * 0.01);
  const software = { name: 'revtrace' as const, version: '0.1.0' };
  const base: RunRecord = {
    run: spec.run,
    video: `videos/${spec.run}.mp4`,
    video_abs: `/lab/videos/${spec.run}.mp4`,
    direction: spec.direction,
    setting: spec.setting,
    setting_unit: 'L/min',
    group: spec.group ?? 'rotor-K',
    notes: spec.notes ?? '',
    status: spec.failed ? 'failed' : 'ok',
    error: spec.failed ?? null,
    settings: { marker: 'bright', model: 'steady', roi: [10, 10, 200, 200] },
    cache_key: `key-${spec.run}`,
    started_at: '2026-11-30T09:00:00.000Z',
    finished_at: '2026-11-30T09:00:05.000Z',
    fit: null,
    lost_share: null,
    warnings: [],
    software,
    manifest: { path: '/lab/day3/manifest.csv', sha256: 'ab'.repeat(32) },
  };
  if (spec.failed) {
    await writeFile(join(dir, 'run.json'), JSON.stringify(base));
    return;
  }
  const lostShare = spec.lost_share ?? 0.02;
  const lines = ['frame,t_s,x_px,y_px,angle_deg,quality,flag'];
  const rateLines = ['t_s,rate_deg_s,lo_deg_s,hi_deg_s'];
  let lost = 0;
  for (let i = 0; i < n; i++) {
    const t = i / fps;
    const a = spec.rate_deg_s * t + 0.3 * rng.normal();
    const isLost = rng.uniform() < lostShare;
    if (isLost) lost++;
    const rad = (a * Math.PI) / 180;
    const x = 120 + 60 * Math.cos(rad);
    const y = 110 - 45 * Math.sin(rad);
    lines.push(isLost ? `${i},${t.toFixed(5)},,,,0,lost:no-blob` : `${i},${t.toFixed(5)},${x.toFixed(3)},${y.toFixed(3)},${a.toFixed(4)},${(0.8 + 0.1 * rng.uniform()).toFixed(3)},`);
    const r = spec.rate_deg_s + 0.05 * rng.normal();
    rateLines.push(`${t.toFixed(5)},${r.toFixed(5)},${(r - 0.3).toFixed(5)},${(r + 0.3).toFixed(5)}`);
  }
  const margin = spec.margin_deg_s;
  const fit: FitReport = {
    model: 'steady',
    window_s: [0, (n - 1) / fps],
    n: n - lost,
    method: 'Least-squares slope per segment, interval from the spread of segment slopes (test input).',
    diagnostics: { residual_autocorrelation: [0.2, 0.1], lost_share: lost / n, residual_rms_deg: 0.3, warnings: [] },
    steady: {
      rate_deg_s: estimate(spec.rate_deg_s, se),
      rate_rpm: estimate(spec.rate_deg_s / 6, se / 6),
      rate_rev_s: estimate(spec.rate_deg_s / 360, se / 360),
      segments: [0, 1, 2, 3].map((k) => ({ t0_s: (k * duration) / 4, t1_s: ((k + 1) * duration) / 4, rate_deg_s: estimate(spec.rate_deg_s + se * rng.normal(), 2 * se) })),
      zero_test: { p_value: Math.abs(spec.rate_deg_s / se) > 3 ? 1e-6 : 0.4, p_sign: 0.01, statistic: spec.rate_deg_s / se, df: 30, ...(margin ? { margin_deg_s: margin, equivalence_p_value: 0.2, equivalent_to_zero: false } : {}) },
      min_detectable_deg_s: 2.9 * se,
      wander_allowance: { hidden_walk_bound_deg_per_sqrt_s: 0.021, rate_deg_s: estimate(spec.rate_deg_s, 3 * se), zero_test: { p_value: 0.047, p_sign: 0.02, statistic: spec.rate_deg_s / (3 * se), df: 60 } },
    },
    software,
  };
  const track: TrackSummary = {
    software,
    input: { path: base.video_abs, size_bytes: 1000, sha256: 'cd'.repeat(32), width: 240, height: 220, frame_count: n, nominal_fps: fps, variable_frame_rate: false },
    settings: base.settings,
    centre: { x_px: estimate(120, 0.1), y_px: estimate(110, 0.1), source: 'ellipse-fit' },
    view: { semi_major_px: 60, semi_minor_px: 45, major_axis_deg: 0, axis_ratio: 0.75, tilt_deg: estimate(41.4, 0.2), max_correction_deg: 8.1, corrected: true },
    camera_motion: null,
    frames: { decoded: n, lost, lost_by_reason: { 'lost:no-blob': lost } },
    splits: [],
    path_sample: Array.from({ length: 60 }, (_, k) => ({ x_px: 120 + 60 * Math.cos((k * Math.PI) / 30), y_px: 110 - 45 * Math.sin((k * Math.PI) / 30) })),
    warnings: [],
  };
  const png = new PNG({ width: 48, height: 44 });
  for (let i = 0; i < png.data.length; i += 4) {
    png.data[i] = 30;
    png.data[i + 1] = 60 + ((i / 4) % 48);
    png.data[i + 2] = 90;
    png.data[i + 3] = 255;
  }
  await writeFile(join(dir, 'angle.csv'), lines.join('\n') + '\n');
  await writeFile(join(dir, 'rate.csv'), rateLines.join('\n') + '\n');
  await writeFile(join(dir, 'fit.json'), JSON.stringify(fit));
  await writeFile(join(dir, 'track.json'), JSON.stringify(track));
  await writeFile(join(dir, 'preview.png'), PNG.sync.write(png));
  await writeFile(join(dir, 'run.json'), JSON.stringify({ ...base, fit, lost_share: lost / n, outputs: ['angle.csv', 'track.json', 'fit.json', 'rate.csv', 'preview.png'] }));
}

/** A small day: two settings, replicates in both directions, reverse ~25× slower and opposite, one failed run. */
export const SMALL_DAY: TestRun[] = [
  { run: 'f-2.0-a', direction: 'forward', setting: 2.0, rate_deg_s: 60.2 },
  { run: 'f-2.0-b', direction: 'forward', setting: 2.0, rate_deg_s: 58.9 },
  { run: 'r-2.0-a', direction: 'reverse', setting: 2.0, rate_deg_s: -2.41, se_deg_s: 0.05 },
  { run: 'r-2.0-b', direction: 'reverse', setting: 2.0, rate_deg_s: -2.55, se_deg_s: 0.05 },
  { run: 'f-3.5-a', direction: 'forward', setting: 3.5, rate_deg_s: 131.0 },
  { run: 'f-3.5-b', direction: 'forward', setting: 3.5, rate_deg_s: 127.5 },
  { run: 'r-3.5-a', direction: 'reverse', setting: 3.5, rate_deg_s: -5.3, se_deg_s: 0.06 },
  { run: 'r-3.5-b', direction: 'reverse', setting: 3.5, rate_deg_s: -5.1, se_deg_s: 0.06 },
  { run: 'r-3.5-c', direction: 'reverse', setting: 3.5, rate_deg_s: 0, failed: 'The video ends after 0.4 s; record at least 2 s per run.' },
];

/** Writes a whole test batch folder. */
export async function writeTestBatch(outDir: string, runs: TestRun[] = SMALL_DAY): Promise<void> {
  let seed = 1;
  for (const r of runs) await writeTestRun(outDir, r, seed++);
}

/** The first run of SMALL_DAY written into a fresh temporary batch folder and loaded as the report reads it; `remove` deletes the folder. */
export async function loadFirstTestRun(prefix: string): Promise<{ run: RunData; remove: () => Promise<void> }> {
  const dir = await mkdtemp(join(tmpdir(), `revtrace-${prefix}-`));
  await writeTestBatch(dir, SMALL_DAY.slice(0, 1));
  return { run: (await loadReportData(dir)).runs[0]!, remove: () => rm(dir, { recursive: true, force: true }) };
}
