// Benchmark: synthetic-footage rendering speed, as ratios against baselines measured in this same script.
//  1. renderFrame per effect at 1280×720, against the bare per-frame floor (copy a float frame and round it to bytes).
//  2. renderClip (render + encode, crf 23) against writeVideo alone on the same frames pre-rendered in memory.
// Run after `npm run build`:  node bench/synth.mjs
import { mkdir, rm } from 'node:fs/promises';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { renderFrame } from '../dist/synth/renderFrame.js';
import { renderClip } from '../dist/synth/renderClip.js';
import { frameTimes } from '../dist/synth/frameTimes.js';
import { resolveSynthSpec } from '../dist/synth/SynthSpec.js';
import { writeVideo } from '../dist/video/writeVideo.js';

const here = fileURLToPath(new URL('.', import.meta.url));
const dir = join(here, 'out', 'synth');
await mkdir(dir, { recursive: true });
const FRAMES = 60;

const base = {
  seed: 3, width_px: 1280, height_px: 720, fps: 30, duration_s: 2,
  hub: { cx_px: 640, cy_px: 360, radius_px: 250 },
  markers: [{ radius_px: 180, size_px: 14 }],
  profile: { kind: 'steady', rate_deg_s: 200 },
};

/** Median per-frame time of f over FRAMES frames, ms (five repeats after a warm-up of 10 frames). */
function perFrame(f) {
  for (let i = 0; i < 10; i++) f(i);
  const runs = [];
  for (let r = 0; r < 5; r++) {
    const t0 = performance.now();
    for (let i = 0; i < FRAMES; i++) f(i);
    runs.push((performance.now() - t0) / FRAMES);
  }
  return runs.sort((a, b) => a - b)[2];
}

const n = 1280 * 720;
const src = new Float32Array(n).fill(60.4);
/** The floor: copy a float frame and round it to bytes (what any renderer must do per frame). */
const floorFrame = () => {
  const layer = src.slice();
  const out = new Uint8Array(n);
  for (let i = 0; i < n; i++) { const v = layer[i]; out[i] = v <= 0 ? 0 : v >= 255 ? 255 : Math.round(v); }
  return out;
};
console.log('per-frame times at 1280×720; the baseline is re-measured right before each case (the machine is shared)');

const cases = [
  ['plain', {}],
  ['noise σ=2', { noise_sigma: 2 }],
  ['motion blur 1/60 s', { exposure_s: 1 / 60 }],
  ['shake 2 px, 0.2°', { shake: { translation_px: 2, rotation_deg: 0.2 } }],
  ['oblique 40°', { oblique: { tilt_deg: 40 } }],
  ['particles 20%', { particles: { share: 0.2 } }],
  ['hub texture', { hub_texture: true }],
  ['hub texture + blur', { hub_texture: true, exposure_s: 1 / 60 }],
  ['all of the above + flicker', { noise_sigma: 2, exposure_s: 1 / 60, shake: { translation_px: 2, rotation_deg: 0.2 }, oblique: { tilt_deg: 40 }, particles: { share: 0.2 }, hub_texture: true, flicker: { amplitude: 0.05 } }],
];
for (const [name, realism] of cases) {
  const spec = resolveSynthSpec({ ...base, realism });
  const t0 = performance.now();
  renderFrame(spec, 0, 0);
  const prep = performance.now() - t0;
  const floor = perFrame(floorFrame);
  const ms = perFrame((i) => renderFrame(spec, i / 30, i));
  console.log(`${name.padEnd(28)} ${ms.toFixed(2).padStart(7)} ms/frame, baseline ${floor.toFixed(2)} ms, ratio ${(ms / floor).toFixed(1)}  (first frame incl. set-up ${prep.toFixed(0)} ms)`);
}

// 2. render + encode against encode only
const spec = resolveSynthSpec({ ...base, realism: { noise_sigma: 2, crf: 23 } });
const times = frameTimes(spec);
const frames = Array.from(times, (t, i) => ({ t_s: t, data: renderFrame(spec, t, i).data }));
let t0 = performance.now();
await writeVideo(join(dir, 'encode-only.mp4'), frames, { width: 1280, height: 720, channels: 1, quality: { crf: 23 } });
const encode = performance.now() - t0;
t0 = performance.now();
await renderClip(spec, join(dir, 'render-and-encode.mp4'));
const whole = performance.now() - t0;
console.log(`renderClip ${times.length} frames 1280×720 crf 23: ${(whole / 1000).toFixed(2)} s; writeVideo alone ${(encode / 1000).toFixed(2)} s; ratio ${(whole / encode).toFixed(2)}`);
await rm(dir, { recursive: true, force: true });
