import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { renderClip } from '../../src/synth/renderClip.js';
import type { SynthSpecInput } from '../../src/synth/SynthSpec.js';
import { trackVideo } from '../../src/track/trackVideo.js';
import { offsetRemovedErrors, rms } from './angleErrors.js';

// Truth: the synthetic renderer (src/synth) draws the rotor from a closed-form angle profile and writes the
// true angle of every frame (clip.truth); the tracker never sees it. Angles are compared after removing the
// mean offset (the tracker's zero is the marker's angle at the first frame, the renderer's the rotor's angle 0).
// Layout: the renderer's default 320×240 scene, hub of radius 108 px at 160,120, marker at 81 px.

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'revtrace-acquire-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

/** 1.5 turns in 3 s with particles over the marker in ~10 % of frames; at the first frame a particle is in the region. */
const particleClip = (seed: number): SynthSpecInput => ({
  seed,
  duration_s: 3,
  profile: { kind: 'steady', rate_deg_s: 150 },
  realism: { noise_sigma: 2, particles: { share: 0.1 } },
});
const roi = { x: 70, y: 30, w: 180, h: 180 };

describe('marker acquisition with drifting particles in the first frames', () => {
  for (const seed of [1, 3]) {
    it(`seed ${seed}: the marker, not a particle, is followed (with and without --center): RMS ≤ 0.2°, no kept frame off by more than 1.5°, the whole 450° counted`, async () => {
      const clip = await renderClip(particleClip(seed), join(dir, `particles${seed}.mp4`));
      for (const centre of [{ x_px: 160, y_px: 120 }, undefined]) {
        const r = await trackVideo(clip.videoPath, { roi, centre });
        const err = offsetRemovedErrors(r.series.frame, r.series.angle_deg, clip.truth.angle_deg);
        const worst = Math.max(...err.map(Math.abs));
        console.log(`particles seed ${seed}, ${centre ? 'given' : 'fitted'} centre: kept ${err.length}/${clip.frame_count}, RMS ${rms(err).toFixed(3)}°, worst ${worst.toFixed(2)}°`);
        expect(err.length).toBeGreaterThan(0.7 * clip.frame_count);
        expect(rms(err)).toBeLessThan(0.2);
        expect(worst).toBeLessThan(1.5);
        // the turned angle between the first and last kept frames matches the truth's (150 deg/s for ~3 s)
        const kept = Array.from(r.series.angle_deg.keys()).filter((i) => Number.isFinite(r.series.angle_deg[i]));
        const a = kept[0];
        const b = kept[kept.length - 1];
        const turned = r.series.angle_deg[b] - r.series.angle_deg[a];
        expect(Math.abs(turned - (clip.truth.angle_deg[r.series.frame[b]] - clip.truth.angle_deg[r.series.frame[a]]))).toBeLessThan(1.5);
        expect(r.summary.warnings.join(' ')).not.toMatch(/off a circle/);
      }
    });
  }
});

describe('dark marker in a square region whose corners show the darker background', () => {
  it('follows the marker, not a corner, with and without --center: RMS ≤ 0.1°, every frame kept', async () => {
    const clip = await renderClip(
      { seed: 2, duration_s: 3, markers: [{ radius_px: 81, size_px: 4, kind: 'dark' }], profile: { kind: 'steady', rate_deg_s: 150 }, realism: { noise_sigma: 2 } },
      join(dir, 'dark.mp4'),
    );
    // the square around the marker's circle (81 + 4 px radius, 4 px margin): its corners lie beyond the hub's 108 px radius
    const square = { x: 71, y: 31, w: 178, h: 178 };
    for (const centre of [{ x_px: 160, y_px: 120 }, undefined]) {
      const r = await trackVideo(clip.videoPath, { roi: square, centre, marker: 'dark' });
      const err = offsetRemovedErrors(r.series.frame, r.series.angle_deg, clip.truth.angle_deg);
      console.log(`dark marker, square region, ${centre ? 'given' : 'fitted'} centre: kept ${err.length}/${clip.frame_count}, RMS ${rms(err).toFixed(4)}°`);
      expect(r.summary.frames.lost).toBe(0);
      expect(rms(err)).toBeLessThan(0.1);
      expect(Math.max(...err.map(Math.abs))).toBeLessThan(0.5);
      expect(Math.abs(r.summary.centre.x_px.value - 160)).toBeLessThan(0.5);
      expect(Math.abs(r.summary.centre.y_px.value - 120)).toBeLessThan(0.5);
    }
  });
});
