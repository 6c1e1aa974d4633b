// Registration benchmark: per-frame cost of the texture tracker and the anchor tracker on 640×360 synthetic
// frames (rendered once before timing, not timed), as ratios to a baseline measured in the same script:
// one bilinear polar unwrap of the same annulus (the least a texture reading does per frame).
// Run after `npm run build`: node bench/registration.mjs
import os from 'node:os';
import { renderFrame } from '../dist/synth/renderFrame.js';
import { resolveSynthSpec } from '../dist/synth/SynthSpec.js';
import { frameTimes } from '../dist/synth/frameTimes.js';
import { anchorRegion } from '../dist/synth/anchorRegion.js';
import { createTextureTracker } from '../dist/track/textureTracker.js';
import { createAnchorTracker } from '../dist/track/anchorTracker.js';
import { createPolarGrid, polarUnwrap } from '../dist/track/polarUnwrap.js';

const W = 640;
const H = 360;
const FRAMES = 150;
const base = { width_px: W, height_px: H, fps: 30, duration_s: FRAMES / 30, markers: [], profile: { kind: 'steady', rate_deg_s: 120 } };

function render(input) {
  const spec = resolveSynthSpec(input);
  const t = frameTimes(spec);
  const frames = [];
  for (let f = 0; f < t.length; f++) frames.push({ data: renderFrame(spec, t[f], f).data, width: W, height: H, origin_x_px: 0, origin_y_px: 0 });
  return { spec, frames };
}

/** Over `repeats` runs of `make()` through all frames: the median of the mean ms per frame, and of the median frame. */
function time(frames, make, repeats = 3) {
  const means = [];
  const medians = [];
  for (let k = 0; k < repeats; k++) {
    const step = make();
    const each = [];
    for (const f of frames) {
      const t0 = performance.now();
      step(f);
      each.push(performance.now() - t0);
    }
    means.push(each.reduce((a, b) => a + b, 0) / each.length);
    each.sort((a, b) => a - b);
    medians.push(each[each.length >> 1]);
  }
  const mid = (a) => a.sort((x, y) => x - y)[a.length >> 1];
  return { mean: mid(means), median: mid(medians) };
}

const clean = render({ ...base, seed: 1, realism: { hub_texture: true } });
const noisy = render({ ...base, seed: 2, realism: { hub_texture: true, noise_sigma: 2 } });
const shaky = render({ ...base, seed: 3, realism: { hub_texture: true, shake: { translation_px: 1.5, rotation_deg: 0.15, bandwidth_hz: 2 } } });
const hub = clean.spec.hub;
const annulus = { centre: { x_px: hub.cx_px, y_px: hub.cy_px }, r_inner_px: 10, r_outer_px: 0.9 * hub.radius_px };
const grid = createPolarGrid({ ...annulus, angular_bins: 1024 });

const rows = [];
const baseline = time(clean.frames, () => (f) => polarUnwrap(f, grid, annulus.centre));
rows.push(['baseline: one polar unwrap (1024 angles × ' + grid.radii_px.length + ' radii)', baseline]);
rows.push(['texture tracker, clean frames', time(clean.frames, () => { const t = createTextureTracker(annulus); return (f) => t.update(f); })]);
rows.push(['texture tracker, noise σ = 2', time(noisy.frames, () => { const t = createTextureTracker(annulus); return (f) => t.update(f); })]);
const region = anchorRegion(shaky.spec);
rows.push([`anchor tracker, ${region.w}×${region.h} px fiducial region`, time(shaky.frames, () => { const a = createAnchorTracker({ anchor: region }); return (f) => a.update(f); })]);
rows.push(['anchor tracker, 96×96 px region', time(shaky.frames, () => { const a = createAnchorTracker({ anchor: { x: 0, y: 0, w: 96, h: 96 } }); return (f) => a.update(f); })]);

console.log(`| measured ${new Date().toISOString().slice(0, 10)}, ${os.cpus().length}-core machine, load average ${os.loadavg()[0].toFixed(1)} | mean ms/frame | median ms/frame | ratio of medians to baseline |`);
console.log('|---|---|---|---|');
for (const [name, t] of rows) console.log(`| ${name} | ${t.mean.toFixed(2)} | ${t.median.toFixed(2)} | ${(t.median / baseline.median).toFixed(1)} |`);
