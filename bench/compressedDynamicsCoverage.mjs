// Coverage of the spin-up and coast-down intervals on compressed (H.264) clips with the rotor at rest for part of them.
// Seeded clips from our renderer (320×240, 30 fps, noise 2, crf 23 unless given): spin-ups `--spin-up 1,100,0.5` for
// 4 s (seeds 2–13) and coast-downs `--coast-down 150,10,0.3` for 8 s fitted from the cut, 0.2 s (seeds 2–11); tracked
// with --roi 70,30,180,180 --center 160,120. Prints how many 95 % intervals hold the renderer's true value.
// Run after `npm run build`: node bench/compressedDynamicsCoverage.mjs [crf=23]   (crf "lossless" for no compression)
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const { renderClip } = await import('../dist/synth/renderClip.js');
const { trackVideo } = await import('../dist/track/trackVideo.js');
const { fitAngleSeries } = await import('../dist/fit/fitAngleSeries.js');
const crfArg = process.argv[2] ?? '23';
const crf = crfArg === 'lossless' ? null : Number(crfArg);
const dir = mkdtempSync(join(tmpdir(), 'revtrace-bench-compressed-'));

/** Tracks one clip and fits `model` from `from_s`; returns the fitted block of fit.json. */
async function fitClip(spec, model, from_s) {
  const clip = await renderClip({ width_px: 320, height_px: 240, fps: 30, realism: { noise_sigma: 2, crf }, ...spec }, join(dir, `c${spec.seed}.mp4`));
  const r = await trackVideo(clip.videoPath, { roi: [70, 30, 180, 180], centre: { x: 160, y: 120 } });
  const keep = Array.from(r.series.angle_deg, (a) => Number.isFinite(a));
  const t_s = Float64Array.from(r.series.t_s.filter((_, i) => keep[i]));
  const angle_deg = Float64Array.from(r.series.angle_deg.filter((_, i) => keep[i]));
  return fitAngleSeries({ t_s, angle_deg }, { model, ...(from_s !== undefined ? { from_s } : {}) }).report[model];
}

/** Counts, per parameter, the intervals that hold the true value. */
function tally(fits, truth) {
  const hits = Object.fromEntries(Object.keys(truth).map((k) => [k, 0]));
  for (const f of fits) for (const k of Object.keys(truth)) if (f[k].ci[0] <= truth[k] && truth[k] <= f[k].ci[1]) hits[k]++;
  return hits;
}

try {
  const ups = [];
  for (let seed = 2; seed <= 13; seed++) ups.push(await fitClip({ seed, duration_s: 4, profile: { kind: 'spinup', t0_s: 1, terminal_rate_deg_s: 100, tau_s: 0.5 } }, 'spinup'));
  console.log(JSON.stringify({ crf: crfArg, spinups: ups.length, covered: tally(ups, { onset_s: 1, terminal_rate_deg_s: 100, tau_s: 0.5 }) }));
  const downs = [];
  for (let seed = 2; seed <= 11; seed++) downs.push(await fitClip({ seed, duration_s: 8, profile: { kind: 'coastdown', start_rate_deg_s: 150, coulomb_deg_s2: 10, viscous_per_s: 0.3, t0_s: 0.2 } }, 'spindown', 0.2));
  console.log(JSON.stringify({ crf: crfArg, coastdowns: downs.length, covered: tally(downs, { initial_rate_deg_s: 150, coulomb_deg_s2: 10, viscous_per_s: 0.3 }) }));
} finally {
  rmSync(dir, { recursive: true, force: true });
}
