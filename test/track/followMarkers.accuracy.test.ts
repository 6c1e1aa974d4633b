import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { InputError } from '../../src/errors.js';
import { renderClip } from '../../src/synth/renderClip.js';
import type { SynthSpecInput } from '../../src/synth/SynthSpec.js';
import { trackVideo } from '../../src/track/trackVideo.js';
import { offsetRemovedErrors, rms } from './angleErrors.js';

// Truth: the synthetic renderer (src/synth) draws every marker from a closed-form rotation profile and writes
// the rotor's true angle, rate, each marker's position and whether a particle covers it (truth.csv); the
// tracker never sees it. Angles are compared after removing the mean offset (the tracker's zero is the first
// marker's angle at the first frame, the renderer's is the rotor's angle 0).

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'revtrace-markers-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

/** Least-squares slope of angle on time over the finite entries, deg/s. */
function slope(t: Float64Array, a: Float64Array): number {
  const idx = Array.from(a.keys()).filter((i) => Number.isFinite(a[i]));
  const mt = idx.reduce((s, i) => s + t[i], 0) / idx.length;
  const ma = idx.reduce((s, i) => s + a[i], 0) / idx.length;
  let stt = 0;
  let sta = 0;
  for (const i of idx) {
    stt += (t[i] - mt) ** 2;
    sta += (t[i] - mt) * (a[i] - ma);
  }
  return sta / stt;
}

const base: SynthSpecInput = {
  seed: 11,
  width_px: 640,
  height_px: 480,
  fps: 30,
  duration_s: 3,
  hub: { cx_px: 320.3, cy_px: 239.6, radius_px: 190, level: 110 },
  markers: [
    { radius_px: 150, phase_deg: 0, size_px: 6, kind: 'bright' },
    { radius_px: 150, phase_deg: 180, size_px: 6, kind: 'bright' },
  ],
  profile: { kind: 'steady', rate_deg_s: 250 },
  realism: { noise_sigma: 6 },
};
const roi = { x: 140, y: 60, w: 360, h: 360 };

describe('trackVideo --markers 2 on synthetic footage with known truth', () => {
  it('two markers 180° apart, steady run with sensor noise: angle RMS error below the single-marker run of the same clip', async () => {
    const clip = await renderClip(base, join(dir, 'steady2.mp4'));
    const one = await trackVideo(clip.videoPath, { roi });
    const two = await trackVideo(clip.videoPath, { roi, markers: 2 });
    expect(two.summary.frames.lost).toBe(0);
    expect(two.summary.markers?.count).toBe(2);
    expect(two.summary.markers?.found_frames).toEqual([clip.frame_count, clip.frame_count]);
    const e1 = rms(offsetRemovedErrors(one.series.frame, one.series.angle_deg, clip.truth.angle_deg));
    const e2 = rms(offsetRemovedErrors(two.series.frame, two.series.angle_deg, clip.truth.angle_deg));
    console.log(`two markers at 180°, noise σ 6: RMS --markers 1 ${e1.toFixed(4)}°, --markers 2 ${e2.toFixed(4)}° (ratio ${(e2 / e1).toFixed(3)}; 1/√2 = 0.707 for independent errors, common practice, no source)`);
    expect(e2).toBeLessThanOrEqual(e1);
    // independent errors on two markers average to 1/√2 of one (common practice, no source); 0.85 leaves room for the scatter of 90 frames
    expect(e2).toBeLessThan(0.85 * e1);
    // the offset of the second marker from the first is the renderer's 180°
    expect(Math.abs(Math.abs(two.summary.markers!.phase_offset_deg[1]) - 180)).toBeLessThan(0.2);
    expect(Math.abs(two.summary.centre.x_px.value - 320.3)).toBeLessThan(0.3);
    expect(Math.abs(two.summary.centre.y_px.value - 239.6)).toBeLessThan(0.3);
  });

  it('slow reverse run sweeping ~120°, two markers 180° apart at different radii, no --center: the centre is fitted and the rate matches', async () => {
    const spec: SynthSpecInput = {
      ...base,
      seed: 12,
      markers: [
        { radius_px: 150, phase_deg: 30, size_px: 6, kind: 'bright' },
        { radius_px: 110, phase_deg: 210, size_px: 6, kind: 'bright' },
      ],
      profile: { kind: 'steady', rate_deg_s: -40 },
      realism: { noise_sigma: 3, crf: 23 },
    };
    const clip = await renderClip(spec, join(dir, 'slow2.mp4'));
    // truth: the renderer sweeps 40 deg/s × 3 s = 120° per marker; one marker alone cannot place the centre
    const sweep = Math.abs(clip.truth.angle_deg[clip.frame_count - 1] - clip.truth.angle_deg[0]);
    expect(sweep).toBeGreaterThan(110);
    expect(sweep).toBeLessThan(130);
    await expect(trackVideo(clip.videoPath, { roi })).rejects.toThrow(InputError);
    await expect(trackVideo(clip.videoPath, { roi })).rejects.toThrow(/give --center x,y/);
    const two = await trackVideo(clip.videoPath, { roi, markers: 2 });
    expect(two.summary.centre.source).toBe('ellipse-fit');
    const dx = two.summary.centre.x_px.value - 320.3;
    const dy = two.summary.centre.y_px.value - 239.6;
    const rate = slope(two.series.t_s, two.series.angle_deg);
    const truthRate = clip.truth.rate_deg_s[0];
    console.log(`slow reverse, two markers: centre error ${dx.toFixed(3)}, ${dy.toFixed(3)} px (se ${two.summary.centre.x_px.se.toFixed(3)}), rate ${rate.toFixed(4)} deg/s against the renderer's ${truthRate}`);
    // centre within 1 px of the renderer's hub centre
    expect(Math.hypot(dx, dy)).toBeLessThan(1);
    expect(Math.abs(rate - truthRate)).toBeLessThan(0.02 * Math.abs(truthRate));
    expect(two.summary.frames.lost).toBe(0);
    // each path's size is the renderer's marker radius (square-on view)
    const radii = [...two.summary.markers!.semi_major_px].sort((a, b) => a - b);
    expect(radii[0]).toBeCloseTo(110, 0);
    expect(radii[1]).toBeCloseTo(150, 0);
  });

  it('a particle passing over one marker: that frame keeps the angle from the other marker', async () => {
    const spec: SynthSpecInput = {
      ...base,
      seed: 1,
      fps: 60,
      duration_s: 2,
      hub: { cx_px: 320, cy_px: 240, radius_px: 190, level: 110 },
      profile: { kind: 'steady', rate_deg_s: 300 },
      realism: { noise_sigma: 2, crf: 23, particles: { share: 0.08, size_px: 6, speed_px_s: 300, level: 230 } },
    };
    const clip = await renderClip(spec, join(dir, 'particles2.mp4'));
    const one = await trackVideo(clip.videoPath, { roi });
    const two = await trackVideo(clip.videoPath, { roi, markers: 2 });
    const err = offsetRemovedErrors(two.series.frame, two.series.angle_deg, clip.truth.angle_deg);
    const errAt = new Map<number, number>();
    let k = 0;
    for (let i = 0; i < two.series.frame.length; i++) if (Number.isFinite(two.series.angle_deg[i])) errAt.set(i, err[k++]);
    // truth: the renderer's per-marker occlusion flags (a particle overlaps that marker in that frame)
    const [o1, o2] = clip.truth.markers.map((m) => m.occluded);
    let onlyOne = 0;
    let lostByOne = 0;
    let firstRefused = 0;
    for (let i = 0; i < two.series.frame.length; i++) {
      const f = two.series.frame[i];
      if (o1[f] !== o2[f]) {
        onlyOne++;
        expect(Number.isFinite(two.series.angle_deg[i]), `frame ${f}`).toBe(true);
        if (one.series.flag[i] !== '') {
          lostByOne++;
          expect(Math.abs(errAt.get(i)!), `frame ${f}`).toBeLessThan(0.5);
        }
      }
      // the first marker refused, the frame still measured (from the second)
      if (two.series.flag[i] === '' && !Number.isFinite(two.series.x_px[i])) {
        firstRefused++;
        expect(Math.abs(errAt.get(i)!), `frame ${f}`).toBeLessThan(0.2);
        expect(two.series.quality[i]).toBeLessThan(0.5);
      }
    }
    console.log(`particles over one marker: ${onlyOne} frames, ${lostByOne} of them lost with --markers 1 and kept with 2; first marker refused in ${firstRefused} kept frames; lost ${one.summary.frames.lost} (1 marker) vs ${two.summary.frames.lost} (2); worst kept error ${Math.max(...err.map(Math.abs)).toFixed(3)}°`);
    expect(onlyOne).toBeGreaterThan(0);
    expect(lostByOne).toBeGreaterThan(0);
    expect(firstRefused).toBeGreaterThan(0);
    expect(two.summary.frames.lost).toBe(0);
    expect(Math.max(...err.map(Math.abs))).toBeLessThan(1);
  });

  it('three dark markers with camera shake taken off by an anchor: every frame measured, RMS error below one marker', async () => {
    const spec: SynthSpecInput = {
      ...base,
      seed: 9,
      hub: { cx_px: 320, cy_px: 240, radius_px: 190, level: 110 },
      background: { fiducial: { x_px: 10, y_px: 10, size_px: 60 } },
      markers: [
        { radius_px: 150, phase_deg: 0, size_px: 6, kind: 'dark' },
        { radius_px: 130, phase_deg: 120, size_px: 6, kind: 'dark' },
        { radius_px: 100, phase_deg: 240, size_px: 6, kind: 'dark' },
      ],
      profile: { kind: 'steady', rate_deg_s: 200 },
      realism: { noise_sigma: 3, crf: 23, shake: { translation_px: 2, rotation_deg: 0.3 } },
    };
    const clip = await renderClip(spec, join(dir, 'dark3.mp4'));
    const options = { roi, marker: 'dark', anchor: { x: 10, y: 10, w: 60, h: 60 } };
    const one = await trackVideo(clip.videoPath, options);
    const three = await trackVideo(clip.videoPath, { ...options, markers: 3 });
    const e1 = rms(offsetRemovedErrors(one.series.frame, one.series.angle_deg, clip.truth.angle_deg));
    const e3 = rms(offsetRemovedErrors(three.series.frame, three.series.angle_deg, clip.truth.angle_deg));
    console.log(`three dark markers, shake 2 px / 0.3°, anchor: RMS --markers 1 ${e1.toFixed(4)}°, --markers 3 ${e3.toFixed(4)}°; lost ${JSON.stringify(three.summary.frames.lost_by_reason)}`);
    expect(three.series.t_s.length).toBe(clip.frame_count);
    // a frame is lost only for a reason that holds for every marker (here: the anchor not found)
    for (const reason of Object.keys(three.summary.frames.lost_by_reason)) expect(reason).toBe('lost:camera');
    expect(e3).toBeLessThanOrEqual(e1);
    expect(e3).toBeLessThan(0.1);
    // the renderer's phases: 120° steps; markers are numbered counterclockwise from +x at the first frame
    const offsets = three.summary.markers!.phase_offset_deg.map((d) => ((d % 360) + 360) % 360).sort((a, b) => a - b);
    expect(offsets[0]).toBe(0);
    expect(Math.abs(offsets[1] - 120)).toBeLessThan(0.3);
    expect(Math.abs(offsets[2] - 240)).toBeLessThan(0.3);
  });

  it('warns when the hub turns more than half the angle between two markers per frame, and not when it turns less', async () => {
    // two markers 40° apart (renderer's phases 0° and 40°): 1050°/s at 30 fps is 35° per frame, 300°/s is 10°
    const close = { ...base, markers: [{ radius_px: 150, phase_deg: 0, size_px: 6, kind: 'bright' as const }, { radius_px: 150, phase_deg: 40, size_px: 6, kind: 'bright' as const }], duration_s: 2 };
    for (const [rate, warned] of [[1050, true], [300, false]] as const) {
      const clip = await renderClip({ ...close, profile: { kind: 'steady', rate_deg_s: rate } }, join(dir, `close-${rate}.mp4`));
      const r = await trackVideo(clip.videoPath, { roi, markers: 2 });
      expect(r.summary.warnings.some((w) => /more than half the smallest angle between two markers \((39|40|41)° as measured\)/.test(w)), `${rate}°/s`).toBe(warned);
    }
  });

  it('refuses --markers with texture mode and a count outside 1–8, naming the option', async () => {
    const clip = await renderClip({ ...base, duration_s: 0.3 }, join(dir, 'short.mp4'));
    await expect(trackVideo(clip.videoPath, { roi, markers: 2, marker: 'texture', centre: { x: 320, y: 240 } })).rejects.toThrow(/^--markers 2 needs marker spots/);
    await expect(trackVideo(clip.videoPath, { roi, markers: 0 })).rejects.toThrow(/^--markers 0 must be a whole number/);
    await expect(trackVideo(clip.videoPath, { roi, markers: 3 })).rejects.toThrow(/^no frame showed 3 bright marker spots together in --roi 140,60,360,360; check --markers/);
  });
});
