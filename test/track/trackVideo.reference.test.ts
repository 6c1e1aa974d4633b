import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { PNG } from 'pngjs';
import { locateTools } from '../../src/video/locateTools.js';
import { renderClip } from '../../src/synth/renderClip.js';
import { trackVideo } from '../../src/track/trackVideo.js';
import { writeTrackOutputs } from '../../src/track/writeTrackOutputs.js';

let dir: string;
let ffmpeg: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'revtrace-trackref-'));
  ffmpeg = (await locateTools()).ffmpeg.path;
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

const rms = (a: number[]) => Math.sqrt(a.reduce((s, v) => s + v * v, 0) / a.length);
function demean(a: number[]): number[] {
  const m = a.reduce((s, v) => s + v, 0) / a.length;
  return a.map((v) => v - m);
}

describe('trackVideo against a hub drawn and turned by ffmpeg’s own filters', () => {
  // Reference: ffmpeg's lavfi `geq` draws a gray disc with a bright spot, `rotate` turns it by the angle
  // expression a(t) = 3·t rad. ffmpeg's documentation for `rotate` (quoted from memory): the angle is in radians
  // and a negative value rotates counterclockwise, i.e. positive = clockwise as displayed. Our angles are counterclockwise
  // positive, so the tracked angle must equal −a(t) (in degrees) up to a constant; a sign error would
  // show up as a 2·172°/s drift.
  it('measures −a(t) with RMS error ≤ 0.1° at each frame’s own time', async () => {
    const video = join(dir, 'ffmpeg-hub.mp4');
    const lum = "if(lt(hypot(X-160,Y-160),130),if(lt(hypot(X-270,Y-160),7),235,110),40)";
    const r = spawnSync(ffmpeg, [
      '-v', 'error', '-f', 'lavfi', '-i', 'color=c=black:s=320x320:r=30:d=2.5',
      '-vf', `format=gray,geq=lum='${lum}',rotate=a=3*t:c=black,format=yuv420p`,
      '-c:v', 'libx264', '-crf', '18', '-y', video,
    ], { encoding: 'utf8' });
    expect(r.status, r.stderr).toBe(0);
    const result = await trackVideo(video, { roi: { x: 10, y: 10, w: 300, h: 300 } });
    expect(result.summary.frames.lost).toBe(0);
    const err: number[] = [];
    for (let i = 0; i < result.series.t_s.length; i++) {
      const truth = (-3 * result.series.t_s[i] * 180) / Math.PI;
      err.push(result.series.angle_deg[i] - truth);
    }
    const e = demean(err);
    console.log(`ffmpeg geq+rotate reference: RMS ${rms(e).toFixed(4)}° over ${e.length} frames; centre ${result.summary.centre.x_px.value.toFixed(2)},${result.summary.centre.y_px.value.toFixed(2)}`);
    expect(rms(e)).toBeLessThan(0.1);
    // ffmpeg rotates about the frame centre ((w−1)/2 in pixel-centre coordinates to within half a pixel)
    expect(Math.abs(result.summary.centre.x_px.value - 159.5)).toBeLessThan(0.6);
    expect(Math.abs(result.summary.centre.y_px.value - 159.5)).toBeLessThan(0.6);
  });
});

describe('marker kinds and outputs', () => {
  // Truth: the synthetic renderer (src/synth) with known per-frame angles.
  it('tracks a dark marker and a coloured marker, and writes angle.csv, track.json and preview.png', async () => {
    for (const [kind, marker, option] of [
      ['dark', { kind: 'dark' as const, level: 20, size_px: 5 }, 'dark'],
      // colour lives in chroma, which H.264 keeps at half resolution and quantises hard: a bigger marker
      ['color', { kind: 'color' as const, rgb: [220, 40, 40] as [number, number, number], size_px: 9 }, 'color:#dc2828'],
    ] as const) {
      const clip = await renderClip(
        {
          seed: 9,
          width_px: 320,
          height_px: 240,
          fps: 30,
          duration_s: 1.2,
          hub: { cx_px: 160, cy_px: 120, radius_px: 100, level: 150 },
          markers: [{ radius_px: 70, ...marker }],
          profile: { kind: 'steady', rate_deg_s: -360 },
          realism: { noise_sigma: 2, crf: 23, flicker: { amplitude: 0.15, frequency_hz: 3 } },
        },
        join(dir, `${kind}.mp4`),
      );
      const result = await trackVideo(clip.videoPath, { roi: { x: 50, y: 10, w: 220, h: 220 }, marker: option });
      const err = demean(Array.from(result.series.angle_deg, (a, i) => a - clip.truth.angle_deg[result.series.frame[i]]).filter(Number.isFinite));
      console.log(`${kind} marker with 15 % flicker: RMS ${rms(err).toFixed(4)}°, lost ${JSON.stringify(result.summary.frames.lost_by_reason)}`);
      expect(result.summary.frames.lost).toBe(0);
      // chroma-limited under crf 23 (lossless clips give 0.02°): a looser bound for the colour marker
      expect(rms(err)).toBeLessThan(kind === 'dark' ? 0.1 : 0.3);
      const out = join(dir, `out-${kind}`);
      await writeTrackOutputs(out, result);
      const csv = (await readFile(join(out, 'angle.csv'), 'utf8')).trim().split('\n');
      expect(csv[0]).toBe('frame,t_s,x_px,y_px,angle_deg,quality,flag');
      expect(csv.length).toBe(result.series.t_s.length + 1);
      const json = JSON.parse(await readFile(join(out, 'track.json'), 'utf8'));
      expect(json.input.sha256).toMatch(/^[0-9a-f]{64}$/);
      expect(json.settings.marker).toBe(kind === 'dark' ? 'dark' : 'color:#dc2828');
      const png = PNG.sync.read(await readFile(join(out, 'preview.png')));
      expect([png.width, png.height]).toEqual([320, 240]);
      // the file holds exactly the drawn pixels: decoded by ffmpeg's own PNG decoder (a second, independent reader)
      const decoded = execFileSync(ffmpeg, ['-hide_banner', '-loglevel', 'error', '-i', join(out, 'preview.png'), '-f', 'rawvideo', '-pix_fmt', 'rgb24', '-'], { maxBuffer: 1 << 24 });
      expect(Buffer.compare(decoded, Buffer.from(result.preview.rgb))).toBe(0);
    }
  });

  it('says which option is wrong for a region outside the frame, a centre outside the region and an absent colour', async () => {
    const clip = await renderClip({ seed: 2, duration_s: 0.5, profile: { kind: 'steady', rate_deg_s: 90 } }, join(dir, 'small.mp4'));
    await expect(trackVideo(clip.videoPath, { roi: { x: 200, y: 10, w: 200, h: 100 } })).rejects.toThrow(/--roi 200,10,200,100 lies outside the 320×240 frame/);
    await expect(trackVideo(clip.videoPath, { roi: { x: 10, y: 10, w: 100, h: 100 }, centre: { x: 200, y: 50 } })).rejects.toThrow(/--center 200,50 lies outside --roi/);
    await expect(trackVideo(clip.videoPath, { marker: 'color:#00ff00' })).rejects.toThrow(/no pixel in the whole 320×240 frame \(no --roi given\) comes within .* color:00ff00/);
    await expect(trackVideo(clip.videoPath, { marker: 'glowing' })).rejects.toThrow(/--marker glowing is not a marker kind/);
    // from plain JavaScript a misspelt option would be ignored without a word: it is named instead
    await expect(trackVideo(clip.videoPath, { center: { x: 160, y: 120 } } as never)).rejects.toThrow(/trackVideo has no option 'center'; did you mean 'centre'\?/);
    await expect(trackVideo(clip.videoPath, { region: [0, 0, 100, 100] } as never)).rejects.toThrow(/trackVideo has no option 'region'; the options are roi, centre, /);
    // a region of plain background holds no marker
    await expect(trackVideo(clip.videoPath, { roi: { x: 0, y: 200, w: 60, h: 40 } })).rejects.toThrow(/no bright marker was found in --roi 0,200,60,40/);
  });

  it('asks for --center when the run is too short to fit the path', async () => {
    const clip = await renderClip({ seed: 3, duration_s: 0.5, profile: { kind: 'steady', rate_deg_s: 60 } }, join(dir, 'short.mp4'));
    await expect(trackVideo(clip.videoPath, {})).rejects.toThrow(/swept only \d+° .* give --center x,y \(and the tilt in degrees with --tilt/);
    const r = await trackVideo(clip.videoPath, { centre: { x: 160, y: 120 } });
    expect(r.summary.frames.lost).toBe(0);
    expect(r.summary.warnings.join(' ')).toMatch(/too little to measure the view/);
  });
});
