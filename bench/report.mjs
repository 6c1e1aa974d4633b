// Benchmark: the report for a day of 24 runs, each 10 minutes at 60 fps (36 000 frames), as run folders
// written here with synthetic series (invented numbers). Run after `npm run build`:  node bench/report.mjs
// Target: report made in ≤ 5 s and HTML ≤ 10 MB. Baseline in the same process: reading the same run
// files and JSON-serialising their series (the least any report must do with the data).
import { mkdir, readFile, readdir, rm, stat, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { PNG } from 'pngjs';
import { writeReport } from '../dist/index.js';

const OUT = fileURLToPath(new URL('./out/report/', import.meta.url));
const RUNS = 24;
const FPS = 60;
const DURATION_S = 600;
const N = FPS * DURATION_S;

/** Small seeded generator (mulberry32) so every run of the benchmark writes the same folders. */
function rng(seed) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
const gauss = (u) => Math.sqrt(-2 * Math.log(u() || 1e-12)) * Math.cos(2 * Math.PI * u());
const est = (value, se) => ({ value, se, ci: [value - 1.98 * se, value + 1.98 * se], level: 0.95 });

async function writeRun(i) {
  const u = rng(1000 + i);
  const direction = i % 2 === 0 ? 'forward' : 'reverse';
  const setting = [1.5, 2.0, 2.5, 3.0][Math.floor(i / 2) % 4];
  const rate = direction === 'forward' ? 30 * setting ** 1.4 : -1.1 * setting ** 1.3;
  const run = `${direction}-${setting.toFixed(1)}-${Math.floor(i / 8) + 1}`;
  const dir = join(OUT, 'runs', run);
  await mkdir(dir, { recursive: true });
  const angle = ['frame,t_s,x_px,y_px,angle_deg,quality,flag'];
  const rateRows = ['t_s,rate_deg_s,lo_deg_s,hi_deg_s'];
  let lost = 0;
  for (let k = 0; k < N; k++) {
    const t = k / FPS + 0.002 * (u() - 0.5);
    const a = rate * t + 0.4 * gauss(u) + 2 * Math.sin(t / 9);
    const isLost = u() < 0.015 || (k > 20_000 && k < 20_090);
    if (isLost) lost++;
    const rad = (a * Math.PI) / 180;
    angle.push(isLost ? `${k},${t.toFixed(5)},,,,0,lost:no-blob` : `${k},${t.toFixed(5)},${(320 + 120 * Math.cos(rad)).toFixed(3)},${(180 - 95 * Math.sin(rad)).toFixed(3)},${a.toFixed(4)},${(0.75 + 0.2 * u()).toFixed(3)},`);
    const r = rate + 0.3 * gauss(u);
    rateRows.push(`${t.toFixed(5)},${r.toFixed(4)},${(r - 0.5).toFixed(4)},${(r + 0.5).toFixed(4)}`);
  }
  const se = Math.max(0.01, Math.abs(rate) * 0.004);
  const software = { name: 'revtrace', version: 'bench' };
  const fit = {
    model: 'steady', window_s: [0, DURATION_S], n: N - lost, method: 'Synthetic fit for the benchmark.',
    diagnostics: { residual_autocorrelation: [0.3], lost_share: lost / N, residual_rms_deg: 1.5, warnings: [] },
    steady: {
      rate_deg_s: est(rate, se), rate_rpm: est(rate / 6, se / 6), rate_rev_s: est(rate / 360, se / 360),
      segments: Array.from({ length: 10 }, (_, s) => ({ t0_s: s * 60, t1_s: (s + 1) * 60, rate_deg_s: est(rate + se * gauss(u), 3 * se) })),
      zero_test: { p_value: 1e-9, p_sign: 1e-9, statistic: rate / se, df: 9 }, min_detectable_deg_s: 3 * se,
    },
    software,
  };
  const track = {
    software, input: { path: `/lab/${run}.mp4`, size_bytes: 1, sha256: '0'.repeat(64), width: 640, height: 360, frame_count: N, nominal_fps: FPS, variable_frame_rate: true },
    settings: { marker: 'bright' }, centre: { x_px: est(320, 0.1), y_px: est(180, 0.1), source: 'ellipse-fit' },
    view: { semi_major_px: 120, semi_minor_px: 95, major_axis_deg: 0, axis_ratio: 0.79, tilt_deg: est(37.8, 0.3), max_correction_deg: 6, corrected: true },
    camera_motion: null, frames: { decoded: N, lost, lost_by_reason: { 'lost:no-blob': lost } }, splits: [],
    path_sample: Array.from({ length: 400 }, (_, k) => ({ x_px: 320 + 120 * Math.cos(k / 20) + gauss(u), y_px: 180 - 95 * Math.sin(k / 20) + gauss(u) })), warnings: [],
  };
  const png = new PNG({ width: 640, height: 360 });
  for (let p = 0; p < 640 * 360; p++) {
    const x = p % 640;
    const y = Math.floor(p / 640);
    const v = 60 + ((x + y) >> 3) + Math.round(6 * gauss(u)); // a gradient with camera-like noise
    png.data[4 * p] = v; png.data[4 * p + 1] = v + 10; png.data[4 * p + 2] = v + 20; png.data[4 * p + 3] = 255;
  }
  await writeFile(join(dir, 'angle.csv'), angle.join('\n') + '\n');
  await writeFile(join(dir, 'rate.csv'), rateRows.join('\n') + '\n');
  await writeFile(join(dir, 'fit.json'), JSON.stringify(fit));
  await writeFile(join(dir, 'track.json'), JSON.stringify(track));
  await writeFile(join(dir, 'preview.png'), PNG.sync.write(png));
  await writeFile(join(dir, 'run.json'), JSON.stringify({
    run, video: `${run}.mp4`, video_abs: `/lab/${run}.mp4`, direction, setting, setting_unit: 'L/min', group: 'rotor-K', notes: '', status: 'ok', error: null,
    settings: { marker: 'bright' }, cache_key: run, started_at: '', finished_at: '', fit, lost_share: lost / N, warnings: [], software, row: i + 1,
  }));
}

/** Baseline: read the same files and JSON-serialise every series (no statistics, no charts). */
async function baseline() {
  let bytes = 0;
  for (const run of await readdir(join(OUT, 'runs'))) {
    const series = {};
    for (const f of ['angle.csv', 'rate.csv']) series[f] = (await readFile(join(OUT, 'runs', run, f), 'utf8')).split('\n').map((l) => l.split(','));
    bytes += JSON.stringify(series).length;
  }
  return bytes;
}

await rm(OUT, { recursive: true, force: true });
console.log(`writing ${RUNS} run folders of ${N} frames each…`);
for (let i = 0; i < RUNS; i++) await writeRun(i);

const time = async (f) => {
  const t0 = process.hrtime.bigint();
  const v = await f();
  return { v, s: Number(process.hrtime.bigint() - t0) / 1e9 };
};
await baseline(); // warm the file cache so both timings read from memory
const results = [];
for (let rep = 0; rep < 3; rep++) {
  const b = await time(baseline);
  const r = await time(() => writeReport(OUT, { title: 'Benchmark day' }));
  results.push({ baseline_s: b.s, report_s: r.s });
}
const size = (await stat(join(OUT, 'report.html'))).size;
const best = (k) => Math.min(...results.map((x) => x[k]));
console.log(JSON.stringify({ runs: RUNS, frames_per_run: N, timings: results, report_s_best: best('report_s'), baseline_s_best: best('baseline_s'), ratio: best('report_s') / best('baseline_s'), html_mb: size / 1e6 }, null, 2));
const ok = best('report_s') <= 5 && size <= 10e6;
console.log(ok ? 'PASS: report ≤ 5 s and HTML ≤ 10 MB' : 'FAIL: report slower than 5 s or HTML larger than 10 MB');
process.exitCode = ok ? 0 : 1;
