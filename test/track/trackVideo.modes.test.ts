import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { renderClip } from '../../src/synth/renderClip.js';
import { anchorRegion } from '../../src/synth/anchorRegion.js';
import { trackVideo } from '../../src/track/trackVideo.js';

// Truth: the synthetic renderer (src/synth) with known per-frame angles. These check that trackVideo hands
// frames to the registration trackers (anchor, texture) and combines their readings; the trackers' own
// accuracy is tested in anchor*/texture* tests.
let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'revtrace-trackmodes-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});
const rms = (a: number[]) => Math.sqrt(a.reduce((s, v) => s + v * v, 0) / a.length);
const demean = (a: number[]) => {
  const m = a.reduce((s, v) => s + v, 0) / a.length;
  return a.map((v) => v - m);
};

describe('trackVideo with the registration trackers', () => {
  it('--anchor takes camera shake off the marker angle', async () => {
    const clip = await renderClip(
      { seed: 21, duration_s: 1.5, fps: 30, profile: { kind: 'steady', rate_deg_s: 300 }, realism: { noise_sigma: 2, shake: { translation_px: 1.5, rotation_deg: 0.15, bandwidth_hz: 2 } } },
      join(dir, 'shake.mp4'),
    );
    const a = anchorRegion(clip.spec)!;
    const roi = { x: 40, y: 10, w: 240, h: 220 };
    const withAnchor = await trackVideo(clip.videoPath, { roi, anchor: a });
    const without = await trackVideo(clip.videoPath, { roi });
    const err = (r: typeof without) => demean(Array.from(r.series.angle_deg, (v, i) => v - clip.truth.angle_deg[r.series.frame[i]]).filter(Number.isFinite));
    console.log(`anchor via trackVideo: RMS ${rms(err(withAnchor)).toFixed(4)}° (without anchor ${rms(err(without)).toFixed(3)}°), max shift ${withAnchor.summary.camera_motion!.max_shift_px.toFixed(2)} px`);
    expect(withAnchor.summary.camera_motion!.max_shift_px).toBeGreaterThan(1);
    expect(rms(err(withAnchor))).toBeLessThan(rms(err(without)));
    expect(rms(err(withAnchor))).toBeLessThan(0.1);
  });

  it('--marker texture follows a hub without a marker', async () => {
    const clip = await renderClip(
      { seed: 8, duration_s: 1.5, fps: 30, markers: [], profile: { kind: 'steady', rate_deg_s: -200 }, realism: { hub_texture: true, noise_sigma: 2 } },
      join(dir, 'texture.mp4'),
    );
    const r = await trackVideo(clip.videoPath, { marker: 'texture', centre: { x: clip.spec.hub.cx_px, y: clip.spec.hub.cy_px } });
    const err = demean(Array.from(r.series.angle_deg, (v, i) => v - clip.truth.angle_deg[r.series.frame[i]]).filter(Number.isFinite));
    console.log(`texture via trackVideo: RMS ${rms(err).toFixed(4)}° over ${err.length} frames`);
    expect(err.length).toBe(clip.frame_count);
    expect(rms(err)).toBeLessThan(0.1);
  });
});
