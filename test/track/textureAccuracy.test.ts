import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { renderClip } from '../../src/synth/renderClip.js';
import { trackVideo } from '../../src/track/trackVideo.js';
import { renderFrame } from '../../src/synth/renderFrame.js';
import { resolveSynthSpec, type SynthSpec, type SynthSpecInput } from '../../src/synth/SynthSpec.js';
import { frameTimes } from '../../src/synth/frameTimes.js';
import { anchorRegion } from '../../src/synth/anchorRegion.js';
import { applyCameraMotion, createAnchorTracker } from '../../src/track/anchorTracker.js';
import { createTextureTracker } from '../../src/track/textureTracker.js';

// Truth: the synthetic renderer's rotor angle per frame (src/synth, hub_texture on, no marker), small seeded clips.
const textured: SynthSpecInput = {
  seed: 33,
  duration_s: 1.5,
  fps: 30,
  markers: [],
  profile: { kind: 'steady', rate_deg_s: 150 },
  realism: { hub_texture: true },
};

const rms = (a: number[]) => Math.sqrt(a.reduce((s, v) => s + v * v, 0) / a.length);

/** Hub centre as seen in a frame shaken by `shake`: X = C + R(ρ)(X_scene − C) + d about the frame centre C (the renderer's view model). */
function seenCentre(spec: SynthSpec, shake: { dx_px: number; dy_px: number; rotation_deg: number }) {
  const rho = (shake.rotation_deg * Math.PI) / 180;
  const C = { x: (spec.width_px - 1) / 2, y: (spec.height_px - 1) / 2 };
  const u = spec.hub.cx_px - C.x;
  const v = spec.hub.cy_px - C.y;
  return { x_px: C.x + Math.cos(rho) * u + Math.sin(rho) * v + shake.dx_px, y_px: C.y - Math.sin(rho) * u + Math.cos(rho) * v + shake.dy_px };
}

describe('texture tracking on synthetic frames (in memory)', () => {
  it('follows a hub with no marker with RMS error ≤ 0.1°, from a centre given 0.7 px off', () => {
    const spec = resolveSynthSpec(textured);
    const t = frameTimes(spec);
    const tracker = createTextureTracker({ centre: { x_px: spec.hub.cx_px + 0.5, y_px: spec.hub.cy_px - 0.5 }, r_inner_px: 10, r_outer_px: 0.9 * spec.hub.radius_px });
    const errors: number[] = [];
    let truth0 = 0;
    for (let f = 0; f < t.length; f++) {
      const frame = renderFrame(spec, t[f], f);
      if (f === 0) truth0 = frame.angle_deg;
      const got = tracker.update({ data: frame.data, width: spec.width_px, height: spec.height_px, origin_x_px: 0, origin_y_px: 0 });
      expect(got.quality).toBeGreaterThan(0.9);
      errors.push(got.angle_deg - (frame.angle_deg - truth0));
    }
    expect(tracker.centre_refinements).toBeGreaterThan(0);
    expect(rms(errors)).toBeLessThan(0.1);
    console.log(`texture (synth, in memory): RMS ${rms(errors).toFixed(4)}°, max ${Math.max(...errors.map(Math.abs)).toFixed(4)}°, turned ${(((t.length - 1) / 30) * 150).toFixed(0)}°`);
  });

  it('with ±3 px / ±0.3° camera shake, anchor plus texture keep the RMS error ≤ 0.1°', () => {
    const spec = resolveSynthSpec({ ...textured, seed: 34, realism: { ...textured.realism, shake: { translation_px: 1.5, rotation_deg: 0.15, bandwidth_hz: 2 } } });
    const t = frameTimes(spec);
    const first = renderFrame(spec, t[0], 0);
    const centre0 = seenCentre(spec, first.shake);
    const anchor = createAnchorTracker({ anchor: anchorRegion(spec)! });
    const texture = createTextureTracker({ centre: centre0, r_inner_px: 10, r_outer_px: 0.85 * spec.hub.radius_px });
    const errors: number[] = [];
    const uncorrected: number[] = [];
    // Baseline without the anchor (kept cheap: no outlier masking, no centre refinement).
    const plain = createTextureTracker({ centre: centre0, r_inner_px: 10, r_outer_px: 0.85 * spec.hub.radius_px, robust_below: 0, refine_centre: false });
    for (let f = 0; f < t.length; f++) {
      const frame = f === 0 ? first : renderFrame(spec, t[f], f);
      const crop = { data: frame.data, width: spec.width_px, height: spec.height_px, origin_x_px: 0, origin_y_px: 0 };
      const motion = anchor.update(crop);
      // How trackVideo combines them: move the annulus with the camera, then take the camera roll off the hub angle.
      const moved = applyCameraMotion(centre0, motion, anchor.pivot);
      const got = texture.update(crop, { dx_px: moved.x_px - centre0.x_px, dy_px: moved.y_px - centre0.y_px });
      const truth = frame.angle_deg - first.angle_deg;
      errors.push(got.angle_deg - motion.rotation_deg - truth);
      uncorrected.push(plain.update(crop).angle_deg - truth);
    }
    expect(rms(errors)).toBeLessThan(0.1);
    expect(rms(uncorrected.filter(Number.isFinite))).toBeGreaterThan(rms(errors));
    console.log(`texture + anchor (synth, shaken, in memory): RMS ${rms(errors).toFixed(4)}° (texture alone ${rms(uncorrected.filter(Number.isFinite)).toFixed(3)}°)`);
  });
});

describe('texture tracking end to end through trackVideo (x264-compressed clips)', () => {
  let dir: string;
  beforeAll(async () => {
    dir = await mkdtemp(join(tmpdir(), 'revtrace-textureacc-'));
  });
  afterAll(async () => {
    await rm(dir, { recursive: true, force: true });
  });
  const errorsOf = (r: Awaited<ReturnType<typeof trackVideo>>, truth: Float64Array) => {
    // Texture mode counts from 0 at the first frame.
    const e = Array.from(r.series.angle_deg, (a, i) => a - (truth[r.series.frame[i]] - truth[r.series.frame[0]])).filter(Number.isFinite);
    return { e, lost: r.series.angle_deg.length - e.length };
  };

  it('--marker texture on a hub with no marker: RMS error ≤ 0.1°', async () => {
    const clip = await renderClip({ ...textured, seed: 35, realism: { ...textured.realism, noise_sigma: 1, crf: 18 } }, join(dir, 'texture.mp4'));
    const r = await trackVideo(clip.videoPath, { marker: 'texture', centre: { x: clip.spec.hub.cx_px + 0.6, y: clip.spec.hub.cy_px - 0.4 } });
    const { e, lost } = errorsOf(r, clip.truth.angle_deg);
    expect(lost).toBe(0);
    expect(rms(e)).toBeLessThan(0.1);
    console.log(`texture via trackVideo (crf 18): RMS ${rms(e).toFixed(4)}°, centre found ${r.summary.centre.x_px.value.toFixed(2)},${r.summary.centre.y_px.value.toFixed(2)} (true ${clip.spec.hub.cx_px},${clip.spec.hub.cy_px})`);
  });

  it('--marker texture with --anchor on a clip shaken by ±3 px / ±0.3°: RMS error ≤ 0.1°', async () => {
    const clip = await renderClip(
      { ...textured, seed: 36, realism: { ...textured.realism, noise_sigma: 1, crf: 18, shake: { translation_px: 1.5, rotation_deg: 0.15, bandwidth_hz: 2 } } },
      join(dir, 'texture-shake.mp4'),
    );
    const r = await trackVideo(clip.videoPath, { marker: 'texture', centre: { x: clip.spec.hub.cx_px, y: clip.spec.hub.cy_px }, anchor: anchorRegion(clip.spec)! });
    const { e, lost } = errorsOf(r, clip.truth.angle_deg);
    expect(lost).toBeLessThanOrEqual(1);
    expect(rms(e)).toBeLessThan(0.1);
    console.log(`texture + anchor via trackVideo (crf 18, shaken): RMS ${rms(e).toFixed(4)}°`);
  });
});
