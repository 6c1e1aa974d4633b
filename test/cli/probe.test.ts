import { describe, expect, it, beforeAll } from 'vitest';
import { spawnSync } from 'node:child_process';
import { copyFileSync, readFileSync, writeFileSync, mkdirSync, statSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { join } from 'node:path';
import { execFileSync } from 'node:child_process';
import { FFPROBE, ffmpeg, tempDir, testsrc2Clip } from '../video/referenceTools.js';

const bin = fileURLToPath(new URL('../../bin/revtrace', import.meta.url));

function revtrace(...args: string[]) {
  return spawnSync(process.execPath, [bin, ...args], { encoding: 'utf8' });
}

function probeJson(file: string): Record<string, any> {
  const r = revtrace('probe', file, '--json');
  expect(r.stderr).toBe('');
  expect(r.status).toBe(0);
  return JSON.parse(r.stdout) as Record<string, any>;
}

/** Packets of the first video stream as ffprobe lists them (the reference count of frames a cut file still holds). */
function ffprobePacketCount(file: string): number {
  return execFileSync(FFPROBE, ['-v', 'quiet', '-select_streams', 'v:0', '-show_entries', 'packet=pts', '-of', 'csv=p=0', file]).toString().split('\n').filter((l) => l.trim() !== '').length;
}

describe('revtrace probe', () => {
  const dir = tempDir('probe');
  let cfr: string;
  beforeAll(() => { cfr = testsrc2Clip(join(dir, 'cfr.mp4'), { size: '320x240', rate: 25, seconds: 2 }); });

  it('describes a constant-rate clip made by ffmpeg testsrc2 at 25 fps for 2 s', () => {
    // Reference: the lavfi source parameters (ffmpeg-filters documentation, testsrc2 rate/duration).
    const p = probeJson(cfr);
    expect(p).toMatchObject({ container: expect.stringContaining('mp4'), codec: 'h264', width: 320, height: 240, frame_count: 50, duration_s: 2, nominal_fps: 25, variable_frame_rate: false, dropped: { count: 0, at_s: [] }, duplicated: { count: 0, at_s: [] } });
    expect(p.interval_s).toMatchObject({ min: 0.04, median: 0.04, max: 0.04 });
  });

  it('finds the jitter and drops of a variable-timing clip made with settb + setpts + select', () => {
    // Reference: the closed-form times given to setpts (ms): n*40 + 9 when n mod 3 = 1; frames with n mod 7 = 3 removed.
    const vfr = join(dir, 'vfr.mp4');
    ffmpeg(['-f', 'lavfi', '-i', 'testsrc2=size=320x240:rate=25:duration=2',
      '-vf', "settb=1/1000,setpts='N*40+if(eq(mod(N\\,3)\\,1)\\,9\\,0)',select='not(eq(mod(n\\,7)\\,3))'",
      '-vsync', 'vfr', '-r', '1000', '-c:v', 'libx264', '-preset', 'ultrafast', '-bf', '0', '-pix_fmt', 'yuv420p', vfr]);
    const r = revtrace('probe', vfr, '--json', '--frame-times');
    const p = JSON.parse(r.stdout) as Record<string, any>;
    const expected: number[] = [];
    for (let n = 0; n < 49; n++) if (n % 7 !== 3) expected.push((n * 40 + (n % 3 === 1 ? 9 : 0)) / 1000);
    // n = 49 is cut by the muxer's edit list (its packet is flagged discarded), leaving 42 frames.
    expect(p.frame_count).toBe(42);
    expect(p.frame_times_s).toEqual(expected);
    expect(p.variable_frame_rate).toBe(true);
    // from the same closed form by hand: shortest step 40 − 9 = 31 ms (frame n ≡ 1 mod 3 to the next);
    // longest 80 + 9 = 89 ms (a removed frame n = 3, 24 or 45, whose next kept frame n + 1 ≡ 1 mod 3)
    expect(p.interval_s).toMatchObject({ min: 0.031, median: 0.04, max: 0.089 });
    // each removed frame n leaves a gap after frame n − 1
    const before = [2, 9, 16, 23, 30, 37, 44].map((n) => (n * 40 + (n % 3 === 1 ? 9 : 0)) / 1000);
    expect(p.dropped).toEqual({ count: 7, at_s: before });
    expect(p.duplicated.count).toBe(0);
  });

  it('lists the frame times as a frame,t_s table after the text report with --frame-times', () => {
    // Reference: testsrc2 at 25 fps gives frame n at n/25 s (ffmpeg-filters documentation, lavfi sources).
    const r = revtrace('probe', cfr, '--frame-times');
    expect(r.status).toBe(0);
    const table = r.stdout.split('\n\n')[1]!.trim().split('\n');
    expect(table[0]).toBe('frame,t_s');
    expect(table.slice(1)).toEqual(Array.from({ length: 50 }, (_, n) => `${n},${(n / 25).toFixed(6)}`));
  });

  it('reports the displayed size of a rotation-tagged clip', () => {
    // Reference: a stream copy with -metadata:s:v rotate=90 (a quarter turn for display), and the display
    // matrix rotation ffprobe itself prints for the file, folded into 0..359.
    const rotated = join(dir, 'rotated.mp4');
    ffmpeg(['-i', cfr, '-c', 'copy', '-metadata:s:v', 'rotate=90', rotated]);
    const p = probeJson(rotated);
    expect(p).toMatchObject({ width: 240, height: 320, coded_width: 320, coded_height: 240 });
    const shown = execFileSync(FFPROBE, ['-v', 'error', '-select_streams', 'v:0', '-show_streams', rotated]).toString();
    const ffprobeRotation = Number(/^rotation=(-?\d+)$/m.exec(shown)![1]);
    expect(p.rotation_deg).toBe(((ffprobeRotation % 360) + 360) % 360);
  });

  it('prints a readable report without --json', () => {
    const r = revtrace('probe', cfr);
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/^size +320×240 px as displayed$/m);
    expect(r.stdout).toMatch(/^frames +50$/m);
    expect(r.stdout).toMatch(/^variable rate +no$/m);
  });

  describe('bad input: one sentence, exit 2, no stack trace', () => {
    const cases: Array<[string, () => string, (f: string) => string]> = [
      ['a missing path', () => join(dir, 'nowhere.mp4'), (f) => `No file at ${f}; check the path.`],
      ['a directory', () => { const d = join(dir, 'folder.mp4'); mkdirSync(d, { recursive: true }); return d; }, (f) => `${f} is a folder, not a video file; give the path of one video.`],
      ['an empty file', () => { const f = join(dir, 'empty.mp4'); writeFileSync(f, ''); return f; }, (f) => `${f} is empty (0 bytes); it is not a video.`],
      ['a text file', () => { const f = join(dir, 'notes.mp4'); writeFileSync(f, 'run 3: forward, 12 mm gap\n'.repeat(50)); return f; }, (f) => `${f} is not a video ffprobe can read (Invalid data found when processing input); check that it is a complete video file.`],
      ['a truncated mp4', () => { const f = join(dir, 'cut.mp4'); const bytes = readFileSync(cfr); writeFileSync(f, bytes.subarray(0, Math.floor(statSync(cfr).size / 2))); return f; }, (f) => `${f} has no MP4 index (moov box), so it was probably cut short while being written or copied; copy or export the video again.`],
      // the index (moov) moved to the front, then the file cut at half: ffprobe still reads the header, and the sample table lists all 50 frames
      ['a truncated mp4 with its index at the front', () => { const whole = testsrc2Clip(join(dir, 'front.mp4'), { size: '320x240', rate: 25, seconds: 2, extra: ['-movflags', '+faststart'] }); const f = join(dir, 'front-cut.mp4'); writeFileSync(f, readFileSync(whole).subarray(0, Math.floor(statSync(whole).size / 2))); return f; }, (f) => `${f} is cut short: its index lists 50 frames but only ${ffprobePacketCount(f)} can be read (an interrupted copy or recording); copy or export it again.`],
      ['a PNG image named .mp4', () => { const png = join(dir, 'frame.png'); ffmpeg(['-f', 'lavfi', '-i', 'testsrc2=size=64x48', '-frames:v', '1', png]); const f = join(dir, 'frame.mp4'); copyFileSync(png, f); return f; }, (f) => `${f} is a single PNG image, not a video; give the video file of the run.`],
      ['an audio-only file', () => { const f = join(dir, 'tone.m4a'); ffmpeg(['-f', 'lavfi', '-i', 'sine=frequency=440:duration=1', f]); return f; }, (f) => `${f} has no video stream (only audio); give a video file.`],
    ];
    for (const [what, make, message] of cases) {
      it(`rejects ${what}`, () => {
        const file = make();
        const r = revtrace('probe', file);
        expect(r.status).toBe(2);
        expect(r.stdout).toBe('');
        expect(r.stderr).toBe(`revtrace: ${message(file)}\n`);
      });
    }
  });
});
