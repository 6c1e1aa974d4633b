// Benchmark: batch wall time for 8 clips of 1280×720, 30 s each, against the sum of bare ffmpeg
// decodes of the same clips (to gray raw frames, thrown away), measured in this same script.
// Target: ratio ≤ 1.2 at the best --jobs. Run after `npm run build`:  node bench/batch.mjs [jobs...]
// Clips are rendered once with our synthetic renderer and cached in bench/out/batch/.
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { mkdir, rm, writeFile } from 'node:fs/promises';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { renderClip } from '../dist/synth/renderClip.js';
import { locateTools } from '../dist/video/locateTools.js';
import { runBatch } from '../dist/index.js';

const here = fileURLToPath(new URL('.', import.meta.url));
const dir = join(here, 'out', 'batch');
const N = 8;
const DURATION_S = Number(process.env.BENCH_DURATION_S ?? 30);
const jobsList = process.argv.slice(2).map(Number).filter((n) => n > 0);
if (jobsList.length === 0) jobsList.push(...new Set([1, 2, availableParallelism(), availableParallelism() + 1]));

const tools = await locateTools();
await mkdir(join(dir, 'clips'), { recursive: true });

// 1. Clips: a bright marker on a dark hub, steady rates (invented: forward 90–300 deg/s, reverse −2 to −8 deg/s), x264 crf 23.
const rows = ['video,run,direction,setting,setting_unit'];
for (let i = 0; i < N; i++) {
  const forward = i % 2 === 0;
  const rate = forward ? 90 + 30 * i : -(2 + i);
  const name = `clip-${i + 1}-${DURATION_S}s.mp4`;
  const path = join(dir, 'clips', name);
  if (!existsSync(path)) {
    const t0 = performance.now();
    await renderClip({
      seed: 100 + i, width_px: 1280, height_px: 720, fps: 30, duration_s: DURATION_S,
      hub: { cx_px: 640, cy_px: 360, radius_px: 250 },
      markers: [{ radius_px: 180, size_px: 14, kind: 'bright' }],
      profile: { kind: 'steady', angle0_deg: 10 * i, rate_deg_s: rate },
      realism: { noise_sigma: 2, crf: 23 },
    }, path);
    console.log(`rendered ${name} in ${((performance.now() - t0) / 1000).toFixed(1)} s`);
  }
  rows.push(`clips/${name},run-${i + 1},${forward ? 'forward' : 'reverse'},${1 + (i >> 1)},L/min`);
}
await writeFile(join(dir, 'bench.csv'), `${rows.join('\n')}\n`);
// the hub centre is known (slow reverse runs sweep too little arc to fit it)
await writeFile(join(dir, 'bench.defaults.json'), JSON.stringify({ marker: 'bright', model: 'steady', center: '640,360' }));

// 2. Baseline: each clip decoded by ffmpeg alone (all its threads), one after the other.
function decode(path) {
  return new Promise((resolve, reject) => {
    const p = spawn(tools.ffmpeg.path, ['-v', 'error', '-i', path, '-f', 'rawvideo', '-pix_fmt', 'gray', '-'], { stdio: ['ignore', 'pipe', 'inherit'] });
    p.stdout.on('data', () => {});
    p.on('error', reject);
    p.on('exit', (code) => (code === 0 ? resolve() : reject(new Error(`ffmpeg exit ${code}`))));
  });
}
async function decodeAll() {
  const t0 = performance.now();
  for (let i = 0; i < N; i++) await decode(join(dir, 'clips', `clip-${i + 1}-${DURATION_S}s.mp4`));
  return (performance.now() - t0) / 1000;
}

// 3. The batch at each --jobs, from scratch each time (force). The machine is shared, so the
// baseline is measured right before and right after each batch and their mean is used.
const results = [];
for (const jobs of jobsList) {
  const out = join(dir, `out-jobs${jobs}`);
  await rm(out, { recursive: true, force: true });
  const before_s = await decodeAll();
  const t0 = performance.now();
  const o = await runBatch(join(dir, 'bench.csv'), { out, jobs, force: true });
  const wall_s = (performance.now() - t0) / 1000;
  const after_s = await decodeAll();
  const decode_s = (before_s + after_s) / 2;
  const ratio = wall_s / decode_s;
  results.push({ jobs, wall_s, decode_before_s: before_s, decode_after_s: after_s, ratio, failed: o.failed.length });
  console.log(`--jobs ${jobs}: batch ${wall_s.toFixed(2)} s; bare decodes ${before_s.toFixed(2)} s before, ${after_s.toFixed(2)} s after; ratio ${ratio.toFixed(2)}; failed runs ${o.failed.length}${o.failed.length ? ` (${o.failed[0].error})` : ''}`);
}
const best = results.reduce((a, b) => (b.ratio < a.ratio ? b : a));
console.log(JSON.stringify({ cores: availableParallelism(), clips: N, duration_s: DURATION_S, results, best_jobs: best.jobs, best_ratio: best.ratio, target: 1.2 }));
