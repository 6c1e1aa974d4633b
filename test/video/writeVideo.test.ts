import { describe, expect, it } from 'vitest';
import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import { writeVideo } from '../../src/video/writeVideo.js';
import type { VideoFrameIn } from '../../src/video/writeVideo.js';
import { InputError } from '../../src/errors.js';
import { ffmpeg, ffprobePacketTimes, tempDir } from './referenceTools.js';

/** Frames with a deterministic pattern and irregular times: jitter of up to ±3 ms, a 2-frame drop and a late start. */
function makeFrames(n: number, width: number, height: number, channels: 1 | 3): VideoFrameIn[] {
  const frames: VideoFrameIn[] = [];
  let t = 0.137;
  for (let i = 0; i < n; i++) {
    const data = new Uint8Array(width * height * channels);
    for (let k = 0; k < data.length; k++) data[k] = (k * 31 + i * 17 + ((k * k) % 97)) & 255;
    frames.push({ t_s: t, data });
    t += i === 12 ? 3 / 30 : 1 / 30 + 0.003 * Math.sin(i * 1.7);
  }
  return frames;
}

describe('writeVideo', () => {
  const dir = tempDir('write');

  it('keeps every frame time to within 1e-4 s (variable rate, drop, late start)', async () => {
    // Reference: ffprobe packet pts_time of the written file.
    const frames = makeFrames(40, 64, 48, 1);
    const file = join(dir, 'vfr.mp4');
    await writeVideo(file, frames, { width: 64, height: 48, channels: 1, quality: { crf: 18 } });
    const times = ffprobePacketTimes(file);
    expect(times.length).toBe(40);
    times.forEach((t, i) => expect(Math.abs(t - frames[i]!.t_s)).toBeLessThan(1e-4));
  });

  it('keeps the full 0–255 gray range at crf quality (no squeeze to 16–235)', async () => {
    // Reference: ffmpeg's own decoder (rawvideo gray output); half-black, half-white frames.
    const frames = Array.from({ length: 5 }, (_, i) => ({ t_s: i / 30, data: Uint8Array.from({ length: 64 * 48 }, (_, k) => (k % 64 < 32 ? 0 : 255)) }));
    const file = join(dir, 'range.mp4');
    await writeVideo(file, frames, { width: 64, height: 48, channels: 1, quality: { crf: 18 } });
    const decoded = ffmpeg(['-i', file, '-f', 'rawvideo', '-pix_fmt', 'gray', '-']);
    expect(decoded.length).toBe(5 * 64 * 48);
    // pixels away from the black/white edge (x = 4 and x = 60 in every row)
    for (let k = 0; k < decoded.length; k += 64) {
      expect(decoded[k + 4]).toBeLessThanOrEqual(3);
      expect(decoded[k + 60]).toBeGreaterThanOrEqual(252);
    }
  });

  it('gives back the exact gray bytes in lossless mode', async () => {
    // Reference: ffmpeg's own decoder (rawvideo gray output).
    const frames = makeFrames(20, 64, 48, 1);
    const file = join(dir, 'gray.mp4');
    await writeVideo(file, frames, { width: 64, height: 48, channels: 1, quality: 'lossless' });
    const decoded = ffmpeg(['-i', file, '-vsync', 'passthrough', '-f', 'rawvideo', '-pix_fmt', 'gray', '-']);
    expect(decoded.equals(Buffer.concat(frames.map((f) => f.data)))).toBe(true);
  });

  it('gives back the exact RGB bytes in lossless mode, from an async source', async () => {
    // Reference: ffmpeg's own decoder (rawvideo rgb24 output).
    const frames = makeFrames(20, 66, 50, 3);
    async function* source() { for (const f of frames) yield f; }
    const file = join(dir, 'rgb.mp4');
    await writeVideo(file, source(), { width: 66, height: 50, channels: 3, quality: 'lossless' });
    const decoded = ffmpeg(['-i', file, '-vsync', 'passthrough', '-f', 'rawvideo', '-pix_fmt', 'rgb24', '-']);
    expect(decoded.equals(Buffer.concat(frames.map((f) => f.data)))).toBe(true);
    const times = ffprobePacketTimes(file);
    times.forEach((t, i) => expect(Math.abs(t - frames[i]!.t_s)).toBeLessThan(1e-4));
  });

  it('refuses times that go backwards and leaves no file behind', async () => {
    const frames = makeFrames(5, 16, 16, 1);
    frames[3]!.t_s = frames[1]!.t_s;
    const file = join(dir, 'bad.mp4');
    await expect(writeVideo(file, frames, { width: 16, height: 16, channels: 1, quality: 'lossless' })).rejects.toThrow(InputError);
    await expect(writeVideo(file, frames, { width: 16, height: 16, channels: 1, quality: 'lossless' })).rejects.toThrow(/Frame 3 has time .* strictly increasing/);
    expect(readdirSync(dir).filter((f) => f.startsWith('bad') || f.startsWith('.bad'))).toEqual([]);
  });

  it('refuses a frame of the wrong size', async () => {
    const frames = [{ t_s: 0, data: new Uint8Array(10) }];
    await expect(writeVideo(join(dir, 'small.mp4'), frames, { width: 16, height: 16, channels: 1, quality: 'lossless' })).rejects.toThrow(/Frame 0 has 10 bytes; a 16×16×1 frame needs 256/);
  });
});
