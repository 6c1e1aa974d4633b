import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { renderClip } from '../../src/synth/renderClip.js';
import { trackVideo } from '../../src/track/trackVideo.js';
import { renderFrame } from '../../src/synth/renderFrame.js';
import { resolveSynthSpec, type SynthSpecInput } from '../../src/synth/SynthSpec.js';
import { frameTimes } from '../../src/synth/frameTimes.js';
import { anchorRegion } from '../../src/synth/anchorRegion.js';
import { createAnchorTracker, removeCameraMotion } from '../../src/track/anchorTracker.js';

// Truth: the synthetic renderer's own shake state and marker positions per frame (src/synth), small seeded clips.
const shaky: SynthSpecInput = {
  seed: 21,
  duration_s: 1.5,
  fps: 30,
  profile: { kind: 'steady', rate_deg_s: 300 },
  realism: { shake: { translation_px: 1.5, rotation_deg: 0.15, bandwidth_hz: 2 } },
};

const rms = (a: number[]) => Math.sqrt(a.reduce((s, v) => s + v * v, 0) / a.length);

describe('anchor tracking on synthetic shaken frames (in memory)', () => {
  it.each([
    ['clean', 0],
    ['with sensor noise σ = 3 gray levels', 3],
  ])('undoes ±3 px / ±0.3° shake so the marker angle has RMS error ≤ 0.1° (%s)', (_name, noise) => {
    const spec = resolveSynthSpec({ ...shaky, realism: { ...shaky.realism, noise_sigma: noise } });
    const region = anchorRegion(spec)!;
    const tracker = createAnchorTracker({ anchor: region });
    const t = frameTimes(spec);
    // The hub centre as seen in the first frame (already shaken): the renderer rolls the image by ρ about
    // the frame centre C and then shifts it by d, X = C + R(ρ)(X_scene − C) + d, R as in removeCameraMotion's doc.
    const shake0 = renderFrame(spec, t[0], 0).shake;
    const rho = (shake0.rotation_deg * Math.PI) / 180;
    const C = { x: (spec.width_px - 1) / 2, y: (spec.height_px - 1) / 2 };
    const u = spec.hub.cx_px - C.x;
    const v = spec.hub.cy_px - C.y;
    const cx_px = C.x + Math.cos(rho) * u + Math.sin(rho) * v + shake0.dx_px;
    const cy_px = C.y - Math.sin(rho) * u + Math.cos(rho) * v + shake0.dy_px;
    const errors: number[] = [];
    const rotationErrors: number[] = [];
    const uncorrected: number[] = [];
    let maxShift = 0;
    let maxRoll = 0;
    let angle0 = 0;
    let truth0 = 0;
    for (let f = 0; f < t.length; f++) {
      const frame = renderFrame(spec, t[f], f);
      maxShift = Math.max(maxShift, Math.abs(frame.shake.dx_px), Math.abs(frame.shake.dy_px));
      maxRoll = Math.max(maxRoll, Math.abs(frame.shake.rotation_deg));
      const motion = tracker.update({ data: frame.data, width: spec.width_px, height: spec.height_px, origin_x_px: 0, origin_y_px: 0 });
      expect(motion.quality).toBeGreaterThan(0.9);
      const seen = frame.markers[0];
      const back = removeCameraMotion(seen, motion, tracker.pivot);
      const angle = (Math.atan2(-(back.y_px - cy_px), back.x_px - cx_px) * 180) / Math.PI;
      const raw = (Math.atan2(-(seen.y_px - cy_px), seen.x_px - cx_px) * 180) / Math.PI;
      if (f === 0) {
        angle0 = angle;
        truth0 = frame.angle_deg;
      }
      const wrap = (a: number) => a - 360 * Math.round(a / 360);
      errors.push(wrap(angle - angle0 - (frame.angle_deg - truth0)));
      uncorrected.push(wrap(raw - angle0 - (frame.angle_deg - truth0)));
      // The roll angle between two frames does not depend on the pivot.
      rotationErrors.push(motion.rotation_deg - (frame.shake.rotation_deg - shake0.rotation_deg));
    }
    // The clip really shakes by about ±3 px and ±0.3°.
    expect(maxShift).toBeGreaterThan(2);
    expect(maxRoll).toBeGreaterThan(0.2);
    expect(rms(uncorrected)).toBeGreaterThan(0.5);
    expect(rms(errors)).toBeLessThan(0.1);
    expect(rms(rotationErrors)).toBeLessThan(0.05);
    console.log(`anchor (synth, in memory): angle RMS ${rms(errors).toFixed(4)}° (uncorrected ${rms(uncorrected).toFixed(3)}°), roll RMS ${rms(rotationErrors).toFixed(4)}°`);
  });
});

describe('anchor tracking end to end through trackVideo (x264-compressed clip)', () => {
  let dir: string;
  beforeAll(async () => {
    dir = await mkdtemp(join(tmpdir(), 'revtrace-anchoracc-'));
  });
  afterAll(async () => {
    await rm(dir, { recursive: true, force: true });
  });

  it('--anchor on a clip shaken by ±3 px / ±0.3°: marker angle RMS error ≤ 0.1°', async () => {
    const clip = await renderClip({ ...shaky, seed: 22, realism: { ...shaky.realism, noise_sigma: 1, crf: 18 } }, join(dir, 'shake.mp4'));
    const anchor = anchorRegion(clip.spec)!;
    const roi = { x: 40, y: 10, w: 240, h: 220 };
    const result = await trackVideo(clip.videoPath, { roi, anchor });
    const plain = await trackVideo(clip.videoPath, { roi });
    // Angle zero is a convention (first frame's marker angle), so compare after removing the mean offset.
    const errorsOf = (r: typeof result) => {
      const e = Array.from(r.series.angle_deg, (a, i) => a - clip.truth.angle_deg[r.series.frame[i]]).filter(Number.isFinite);
      const mean = e.reduce((s, v) => s + v, 0) / e.length;
      return e.map((v) => v - mean);
    };
    const errors = errorsOf(result);
    expect(errors.length).toBeGreaterThan(0.95 * clip.frame_count);
    expect(result.summary.camera_motion!.max_shift_px).toBeGreaterThan(2);
    expect(rms(errors)).toBeLessThan(0.1);
    expect(rms(errorsOf(plain))).toBeGreaterThan(0.3);
    console.log(`anchor via trackVideo (crf 18): angle RMS ${rms(errors).toFixed(4)}° (no anchor ${rms(errorsOf(plain)).toFixed(3)}°)`);
  });
});
