import { describe, expect, it, beforeAll } from 'vitest';
import { execFileSync } from 'node:child_process';
import { join } from 'node:path';
import { readFrames } from '../../src/video/readFrames.js';
import { InputError } from '../../src/errors.js';
import { ffmpeg, ffprobePacketTimes, tempDir, testsrc2Clip } from './referenceTools.js';

/** ffmpeg processes that are children of this test process. */
function ffmpegChildren(): string[] {
  const out = execFileSync('ps', ['-o', 'pid=,comm=', '--ppid', String(process.pid)]).toString();
  return out.split('\n').map((l) => l.trim()).filter((l) => /\bffmpeg$/.test(l));
}

async function collect(path: string, options: Parameters<typeof readFrames>[1] = {}) {
  const frames = [];
  for await (const f of readFrames(path, options)) frames.push(f);
  return frames;
}

describe('readFrames', () => {
  const dir = tempDir('read');
  let cfr: string;
  let vfr: string;
  let rotated: string;
  beforeAll(() => {
    cfr = testsrc2Clip(join(dir, 'cfr.mp4'), { size: '320x240', rate: 25, seconds: 2 });
    // Variable timing: settb 1/1000 then setpts with a closed-form jitter; every 7th frame removed (a drop);
    // -r 1000 gives the encoder a 1 ms time base so the jitter survives.
    vfr = join(dir, 'vfr.mp4');
    ffmpeg(['-f', 'lavfi', '-i', 'testsrc2=size=320x240:rate=25:duration=2',
      '-vf', "settb=1/1000,setpts='N*40+if(eq(mod(N\\,3)\\,1)\\,9\\,0)',select='not(eq(mod(n\\,7)\\,3))'",
      '-vsync', 'vfr', '-r', '1000', '-c:v', 'libx264', '-preset', 'ultrafast', '-bf', '0', '-pix_fmt', 'yuv420p', vfr]);
    rotated = join(dir, 'rotated.mp4');
    ffmpeg(['-i', cfr, '-c', 'copy', '-metadata:s:v', 'rotate=90', rotated]);
  });

  it('returns one frame per packet, each at the time ffprobe gives for it (CFR)', async () => {
    // Reference: ffprobe packet pts_time of the same file.
    const ref = ffprobePacketTimes(cfr);
    const frames = await collect(cfr);
    expect(frames.length).toBe(ref.length);
    expect(frames.length).toBe(50); // testsrc2 at 25 fps for 2 s (lavfi source, ffmpeg docs)
    frames.forEach((f, i) => {
      expect(f.index).toBe(i);
      expect(Math.abs(f.t_s - ref[i]!)).toBeLessThan(2e-6);
    });
  });

  it('keeps variable timing and drops exactly as ffprobe reports them (VFR)', async () => {
    // Reference: ffprobe packet pts_time; also the closed form used to make the clip.
    const ref = ffprobePacketTimes(vfr);
    const expected: number[] = [];
    for (let n = 0; n < 50; n++) if (n % 7 !== 3) expected.push((n * 40 + (n % 3 === 1 ? 9 : 0)) / 1000);
    // The mp4 muxer gives the last frame (1.969 s) no duration, so the edit list ends before it:
    // ffprobe flags that packet D (discarded) and ffmpeg does not present it.
    expected.pop();
    expect(ref.length).toBe(expected.length);
    const frames = await collect(vfr);
    expect(frames.map((f) => f.t_s).length).toBe(ref.length);
    frames.forEach((f, i) => {
      expect(Math.abs(f.t_s - ref[i]!)).toBeLessThan(2e-6);
      expect(Math.abs(f.t_s - expected[i]!)).toBeLessThan(1e-6);
    });
  });

  it('gives two frames that share a time stamp that time each (ffmpeg must not fold repeated log lines)', async () => {
    // ffmpeg's own test source with every time stamp used twice (setpts floor(N/2)), kept as is in Matroska/FFV1.
    // Each frame's time is printed on its own line; ffmpeg folds identical consecutive lines by default, which
    // shifted every later frame's time (0, 0, 0.2, 0.4, 0.5, … and then an error). Reference: ffprobe's packet times.
    const dup = join(dir, 'dup.mkv');
    ffmpeg(['-f', 'lavfi', '-i', 'testsrc=size=64x48:rate=10:duration=2', '-vf', 'setpts=floor(N/2)/5/TB', '-vsync', 'passthrough', '-c:v', 'ffv1', dup]);
    const ref = ffprobePacketTimes(dup);
    expect(ref.length).toBe(20);
    const frames = await collect(dup);
    expect(frames.map((f) => f.t_s)).toEqual(ref);
    expect(frames[0]!.t_s).toBe(frames[1]!.t_s);
  });

  it('crops gray and RGB exactly like ffmpeg\'s own crop filter', async () => {
    // Reference: ffmpeg -vf crop=w:h:x:y,format=… -f rawvideo on the same file.
    const gray = ffmpeg(['-i', cfr, '-vf', 'crop=64:48:100:60,format=gray', '-f', 'rawvideo', '-pix_fmt', 'gray', '-']);
    const frames = await collect(cfr, { roi: { x: 100, y: 60, w: 64, h: 48 } });
    expect(frames[0]!.width).toBe(64);
    expect(frames[0]!.height).toBe(48);
    expect(frames[0]!.channels).toBe(1);
    expect(Buffer.concat(frames.map((f) => f.data)).equals(gray)).toBe(true);
    const rgb = ffmpeg(['-i', cfr, '-vf', 'crop=64:48:100:60,format=rgb24', '-f', 'rawvideo', '-pix_fmt', 'rgb24', '-']);
    const rgbFrames = await collect(cfr, { roi: { x: 100, y: 60, w: 64, h: 48 }, pixels: 'rgb' });
    expect(rgbFrames[0]!.channels).toBe(3);
    expect(Buffer.concat(rgbFrames.map((f) => f.data)).equals(rgb)).toBe(true);
  });

  it('applies the region of interest after the display rotation', async () => {
    // Reference: ffmpeg's own display rotation of the same file (its default autorotate, then crop=…).
    // The ROI (10,200,50,100) lies outside the stored 320×240 frame but inside the displayed 240×320.
    const frames = await collect(rotated, { roi: { x: 10, y: 200, w: 50, h: 100 } });
    expect(frames.length).toBe(50);
    const byFfmpeg = ffmpeg(['-i', rotated, '-vf', 'crop=50:100:10:200,format=gray', '-f', 'rawvideo', '-pix_fmt', 'gray', '-']);
    // the two explicit quarter turns of the stored picture, with ffmpeg's transpose filter
    const clockwise = ffmpeg(['-noautorotate', '-i', rotated, '-vf', 'transpose=clock,crop=50:100:10:200,format=gray', '-f', 'rawvideo', '-pix_fmt', 'gray', '-']);
    const counter = ffmpeg(['-noautorotate', '-i', rotated, '-vf', 'transpose=cclock,crop=50:100:10:200,format=gray', '-f', 'rawvideo', '-pix_fmt', 'gray', '-']);
    const ours = Buffer.concat(frames.map((f) => f.data));
    expect(ours.equals(byFfmpeg)).toBe(true);
    // and it is a real quarter turn: exactly one of the two transposes gives the same bytes
    expect([ours.equals(clockwise), ours.equals(counter)].filter(Boolean).length).toBe(1);
  });

  it('returns only frames inside [from_s, to_s) after a fast seek', async () => {
    // Reference: ffprobe packet times in the window.
    const ref = ffprobePacketTimes(cfr).filter((t) => t >= 0.8 && t < 1.2);
    const frames = await collect(cfr, { from_s: 0.8, to_s: 1.2 });
    expect(frames.map((f) => f.t_s)).toEqual(ref.map((t) => expect.closeTo(t, 5)));
    expect(frames[0]!.index).toBe(0);
  });

  it('rejects a region of interest outside the frame with an InputError', async () => {
    await expect(collect(cfr, { roi: { x: 300, y: 0, w: 64, h: 48 } })).rejects.toThrow(InputError);
    await expect(collect(cfr, { roi: { x: 300, y: 0, w: 64, h: 48 } })).rejects.toThrow(/does not lie inside the 320×240 frame/);
  });

  it('leaves no ffmpeg process behind after an early break or an abort', async () => {
    let n = 0;
    for await (const _ of readFrames(cfr)) { if (++n === 3) break; }
    expect(n).toBe(3);
    expect(ffmpegChildren()).toEqual([]);
    const controller = new AbortController();
    const run = (async () => { for await (const f of readFrames(cfr, { signal: controller.signal })) if (f.index === 2) controller.abort(new Error('stop here')); })();
    await expect(run).rejects.toThrow('stop here');
    expect(ffmpegChildren()).toEqual([]);
  });

  it('keeps memory flat over a long clip (a slow consumer pauses ffmpeg)', async () => {
    // 2000 RGB frames of 480×270 (780 MB in all); resident memory after the first 200 frames vs at the end.
    const long = join(dir, 'long.mp4');
    ffmpeg(['-f', 'lavfi', '-i', 'testsrc2=size=480x270:rate=50', '-t', '40', '-c:v', 'libx264', '-preset', 'ultrafast', '-pix_fmt', 'yuv420p', long]);
    let rssAt200 = 0;
    let count = 0;
    for await (const f of readFrames(long, { pixels: 'rgb' })) {
      count = f.index + 1;
      if (f.index === 200) { globalThis.gc?.(); rssAt200 = process.memoryUsage().rss; }
      if (f.index % 500 === 0) await new Promise((r) => setTimeout(r, 20)); // stall now and then
    }
    const growth_MB = (process.memoryUsage().rss - rssAt200) / 1e6;
    expect(count).toBe(2000);
    // Anything but streaming would grow by far more than this bound.
    expect(growth_MB).toBeLessThan(100);
  });
});
