// Several markers with particles in view at the start: the markers are chosen by following every spot for a while.
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { renderClip } from '../../src/synth/renderClip.js';
import { trackVideo } from '../../src/track/trackVideo.js';
import { offsetRemovedErrors } from './angleErrors.js';
import { createMarkerFollowers } from '../../src/track/followMarkers.js';
import { DRAWN_SIZE, drawDiscs } from './drawDiscs.js';

const W = DRAWN_SIZE;

describe('createMarkerFollowers with a known centre and a still spot in the region', () => {
  it('takes the two spots that turn together, not the still one (a bolt head, a reflection)', () => {
    for (const [b, degPerFrame] of [[70, 3], [40, 8]] as const) {
      const f = createMarkerFollowers({ region: { x0: 0, y0: 0, x1: W, y1: W }, count: 2, centre: { x_px: 100, y_px: 100 } });
      let onStill = 0;
      let kept = 0;
      for (let k = 0; k < 60; k++) {
        const a = (degPerFrame * k * Math.PI) / 180;
        // two markers opposite each other on an ellipse of semi-axes 70 and b (b < 70: an oblique view), and a still spot
        const readings = f.update(drawDiscs([{ x: 100 + 70 * Math.cos(a), y: 100 - b * Math.sin(a), r: 4 }, { x: 100 - 70 * Math.cos(a), y: 100 + b * Math.sin(a), r: 4 }, { x: 25, y: 20, r: 4 }]), W, k / 30);
        for (const r of readings) {
          if (r.flag !== '') continue;
          kept++;
          if (Math.hypot(r.x_px - 25, r.y_px - 20) < 2) onStill++;
        }
      }
      expect(onStill).toBe(0);
      expect(kept).toBeGreaterThanOrEqual(70); // both markers in the 39 frames after the choice (20 frames choosing, one handing over)
    }
  });
});

describe('trackVideo --markers 2 --center with a particle in the first frame', () => {
  let dir: string;
  afterAll(async () => { if (dir) await rm(dir, { recursive: true, force: true }); });

  it('does not take the particle (bigger than a marker) for a marker: every kept frame within 1° of the truth', async () => {
    // seeded synthetic clip (our renderer, truth known): two markers 180° apart at radii 81 and 60 px, −0.5 deg/s,
    // particles over the markers in about 8 % of frames; in this seed a particle is in view at the first frame, and
    // taking the biggest spots there made one "marker" a particle (121° off before)
    dir = await mkdtemp(join(tmpdir(), 'revtrace-markers-particles-'));
    const clip = await renderClip({
      seed: 1, fps: 30, duration_s: 4, profile: { kind: 'steady', rate_deg_s: -0.5 },
      markers: [{ radius_px: 81, phase_deg: 0, size_px: 4, kind: 'bright' }, { radius_px: 60, phase_deg: 180, size_px: 4, kind: 'bright' }],
      realism: { noise_sigma: 3, crf: 20, particles: { share: 0.08 } },
    }, join(dir, 'two.mp4'));
    const r = await trackVideo(clip.videoPath, { centre: { x: 160, y: 120 }, roi: [70, 30, 180, 180], markers: 2 });
    const errors = offsetRemovedErrors(r.series.frame, r.series.angle_deg, clip.truth.angle_deg);
    expect(errors.length).toBeGreaterThan(80);
    expect(Math.max(...errors.map(Math.abs))).toBeLessThan(1);
    // the markers sit 180° apart on the hub (the renderer's phases)
    expect(Math.abs(Math.abs(r.summary.markers!.phase_offset_deg[1]!) - 180)).toBeLessThan(1);
  });
});
