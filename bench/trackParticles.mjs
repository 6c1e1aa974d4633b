// Slow runs with drifting particles: how often the follower is dragged off the marker. Seeded synthetic clips
// (our renderer, truth known): 320×240, 30 fps, 4 s, one bright marker at radius 81 px, particles over the
// marker in about 8 % of frames (radius 5 px, 60 px/s), sensor noise 3, H.264 crf 20; tracked with --center and a
// region around the hub. A run is "bad" when a kept frame is off the truth by more than 1° (the offset of the
// angle zero removed). Run after `npm run build`: node bench/trackParticles.mjs [seeds=12] [rates=-0.5,-15] [markers=1]
// With markers=2 the hub carries a second marker (radius 60 px, opposite the first) and is tracked with --markers 2;
// a run that stops with an error counts as bad.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const { renderClip } = await import('../dist/synth/renderClip.js');
const { trackVideo } = await import('../dist/track/trackVideo.js');
const seeds = Number(process.argv[2] ?? 12);
const rates = (process.argv[3] ?? '-0.5,-15').split(',').map(Number);
const markerCount = Number(process.argv[4] ?? 1);
const markers = markerCount === 2 ? { markers: [{ radius_px: 81, phase_deg: 0, size_px: 4, kind: 'bright' }, { radius_px: 60, phase_deg: 180, size_px: 4, kind: 'bright' }] } : {};
const dir = mkdtempSync(join(tmpdir(), 'revtrace-bench-particles-'));
try {
  for (const rate of rates) {
    const worst = [];
    const lost = [];
    for (let seed = 1; seed <= seeds; seed++) {
      const clip = await renderClip(
        { seed, fps: 30, duration_s: 4, ...markers, profile: { kind: 'steady', rate_deg_s: rate }, realism: { noise_sigma: 3, crf: 20, particles: { share: 0.08 } } },
        join(dir, `p${seed}.mp4`),
      );
      let r;
      try {
        r = await trackVideo(clip.videoPath, { centre: { x: 160, y: 120 }, roi: [70, 30, 180, 180], ...(markerCount > 1 ? { markers: markerCount } : {}) });
      } catch {
        worst.push(Infinity);
        lost.push(null);
        continue;
      }
      const d = [];
      r.series.frame.forEach((f, i) => { if (Number.isFinite(r.series.angle_deg[i])) d.push(r.series.angle_deg[i] - clip.truth.angle_deg[f]); });
      const mean = d.reduce((s, v) => s + v, 0) / d.length;
      worst.push(Math.max(...d.map((v) => Math.abs(v - mean))));
      lost.push(r.summary.frames.lost);
    }
    const sorted = [...worst].sort((a, b) => a - b);
    console.log(JSON.stringify({
      rate_deg_s: rate,
      runs: seeds,
      bad_runs: worst.filter((w) => w > 1).length,
      median_worst_error_deg: +sorted[sorted.length >> 1].toFixed(3),
      worst_error_deg: worst.map((w) => +w.toFixed(2)),
      lost_frames: lost,
    }));
  }
} finally {
  rmSync(dir, { recursive: true, force: true });
}
