import { describe, expect, it } from 'vitest';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { readFrames } from '../../src/video/readFrames.js';
import { renderClip } from '../../src/synth/renderClip.js';
import { renderFrame } from '../../src/synth/renderFrame.js';
import { resolveSynthSpec } from '../../src/synth/SynthSpec.js';

describe('renderClip', () => {
  it('writes a lossless video whose decoded frames and times are exactly the rendered ones, with truth.csv and the spec beside it', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-synth-'));
    try {
      const spec = resolveSynthSpec({
        seed: 21, fps: 30, duration_s: 1,
        markers: [{ radius_px: 80 }, { radius_px: 90, phase_deg: 180, kind: 'dark' }],
        profile: { kind: 'spinup', t0_s: 0.1, terminal_rate_deg_s: 300, tau_s: 0.3 },
        realism: { noise_sigma: 2, particles: { share: 0.2 }, timing: { jitter_s: 0.006, dropped_frames: [4, 17] } },
      });
      const video = join(dir, 'clip.mp4');
      const clip = await renderClip(spec, video);
      expect(clip.frame_count).toBe(28); // 1 s × 30 fps, frames 4 and 17 dropped
      expect(clip.truthPath).toBe(join(dir, 'clip.truth.csv'));

      // Truth: the renderer's own frames and truth table (our renderer; known by construction). Decoded by ffmpeg
      // through the video stage (itself checked against ffmpeg/ffprobe in test/video): the bytes come back
      // exactly (lossless) at the truth times.
      let n = 0;
      for await (const frame of readFrames(video)) {
        expect(Math.abs(frame.t_s - clip.truth.t_s[n])).toBeLessThan(1e-5);
        if (n % 9 === 0) expect(Buffer.compare(Buffer.from(frame.data), Buffer.from(renderFrame(spec, clip.truth.t_s[n], n).data))).toBe(0);
        n++;
      }
      expect(n).toBe(28);

      const rows = parse(await readFile(clip.truthPath, 'utf8'), { columns: true }) as Array<Record<string, string>>;
      expect(Object.keys(rows[0])).toEqual(['frame', 't_s', 'angle_deg', 'x1_px', 'y1_px', 'x2_px', 'y2_px', 'occluded', 'occluded1', 'occluded2', 'rate_deg_s']);
      expect(rows).toHaveLength(28);
      expect(Number(rows[10].t_s)).toBeCloseTo(clip.truth.t_s[10], 8);
      expect(Number(rows[10].angle_deg)).toBeCloseTo(clip.truth.angle_deg[10], 8);
      expect(Number(rows[10].x2_px)).toBeCloseTo(clip.truth.markers[1].x_px[10], 5);
      expect(rows.some((r) => r.occluded === '1')).toBe(true);

      const sidecar = JSON.parse(await readFile(clip.specPath, 'utf8')) as { spec: unknown; anchor_region: unknown };
      expect(resolveSynthSpec(sidecar.spec as never)).toEqual(spec);
      // the fixed fiducial grown by 4 px (no shake)
      const fid = spec.background.fiducial!;
      expect(sidecar.anchor_region).toEqual({ x: fid.x_px - 4, y: fid.y_px - 4, w: fid.size_px + 8, h: fid.size_px + 8 });
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });

  it('writes an RGB clip and a compressed clip when asked', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-synth-'));
    try {
      const rgb = await renderClip({ duration_s: 0.3, markers: [{ kind: 'color', rgb: [30, 200, 60] }] }, join(dir, 'rgb.mp4'));
      let rgbFrames = 0;
      for await (const frame of readFrames(rgb.videoPath, { pixels: 'rgb' })) {
        expect(frame.channels).toBe(3);
        expect(Math.abs(frame.t_s - rgb.truth.t_s[rgbFrames])).toBeLessThan(1e-5);
        expect(Buffer.compare(Buffer.from(frame.data), Buffer.from(renderFrame(rgb.spec, rgb.truth.t_s[rgbFrames], rgbFrames).data))).toBe(0);
        rgbFrames++;
      }
      expect(rgbFrames).toBe(9); // 0.3 s at the default 30 fps
      const lossy = await renderClip({ duration_s: 0.3, markers: [{ radius_px: 80, size_px: 4 }], realism: { crf: 28 } }, join(dir, 'lossy.mp4'));
      let n = 0;
      for await (const frame of readFrames(lossy.videoPath)) {
        const clean = renderFrame(lossy.spec, frame.t_s, n).data;
        expect(Buffer.compare(Buffer.from(frame.data), Buffer.from(clean))).not.toBe(0);
        // the marker survives compression where the truth says: centroid over a window, weights above the
        // window's own border level (so a change of gray scale in the codec does not matter)
        const m = lossy.truth.markers[0];
        const cx = Math.round(m.x_px[n]), cy = Math.round(m.y_px[n]), half = 8;
        let border = 0, count = 0;
        for (let k = -half; k <= half; k++) {
          for (const [x, y] of [[cx + k, cy - half], [cx + k, cy + half], [cx - half, cy + k], [cx + half, cy + k]]) { border += frame.data[y * 320 + x]; count++; }
        }
        border /= count;
        let m00 = 0, m10 = 0, m01 = 0;
        for (let y = cy - half; y <= cy + half; y++) {
          for (let x = cx - half; x <= cx + half; x++) {
            const w = Math.max(0, frame.data[y * 320 + x] - border);
            m00 += w; m10 += w * x; m01 += w * y;
          }
        }
        expect(Math.hypot(m10 / m00 - m.x_px[n], m01 / m00 - m.y_px[n])).toBeLessThan(0.25);
        n++;
      }
      expect(n).toBe(9);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
});
