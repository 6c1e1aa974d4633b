// The track command line: one sentence and exit 2 for each kind of bad option, and nothing written (run `npm run build` first).
import { beforeAll, describe, expect, it } from 'vitest';
import { execFileSync, spawn, spawnSync } from 'node:child_process';
import { mkdtemp, readdir, readFile, writeFile } from 'node:fs/promises';
import { ffmpeg, testsrc2Clip } from '../video/referenceTools.js';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

const bin = fileURLToPath(new URL('../../bin/revtrace', import.meta.url));
/** Copies a video's streams into a new file with ffmpeg (no re-encoding), adding `extra` options. */
const ffmpegCopy = (from: string, to: string, extra: string[]) => ffmpeg(['-i', from, '-c', 'copy', ...extra, to]);
const revtrace = (args: string[], cwd: string) => spawnSync(process.execPath, [bin, ...args], { encoding: 'utf8', cwd });

describe('revtrace track with bad options', () => {
  let dir = '';
  beforeAll(async () => {
    dir = await mkdtemp(join(tmpdir(), 'revtrace-cli-track-'));
    const r = revtrace(['synth', '--out', 'c.mp4', '--duration', '0.5', '--size', '320x240', '--marker', '60', '--quiet'], dir);
    expect(r.status).toBe(0);
  });

  const cases: [string, string[], RegExp][] = [
    ['a region outside the frame', ['--roi', '300,200,100,100'], /^revtrace: --roi 300,200,100,100 lies outside the 320×240 frame; /],
    ['a region that is not four numbers', ['--roi', '1,2,3'], /^revtrace: --roi 1,2,3 must be four numbers x,y,w,h in pixels/],
    ['an unknown marker kind', ['--marker', 'purple'], /^revtrace: --marker purple is not a marker kind; give bright, dark, color:#rrggbb or texture/],
    ['a colour that is not hex', ['--marker', 'color:zz'], /^revtrace: --marker color:zz is not a marker kind/],
    ['a start after the end of the clip', ['--from', '5'], /^revtrace: --from 5 s is at or after the end of c\.mp4 \(0\.50 s\); /],
    ['a start after the end time', ['--from', '0.4', '--to', '0.1'], /^revtrace: the time window from 0\.4 to 0\.1 s is empty; /],
    ['a tilt beyond the usable range', ['--tilt', '95'], /^revtrace: --tilt 95 must be an angle from 0 to 85 degrees/],
    ['a tilt that is not a number', ['--tilt', 'abc'], /^revtrace: --tilt "abc" is not a number; give it in degrees/],
    ['a centre that is one number', ['--center', '1'], /^revtrace: --center "1" must be two numbers x,y in pixels/],
  ];
  for (const [what, args, message] of cases) {
    it(`refuses ${what}`, async () => {
      const r = revtrace(['track', 'c.mp4', '--out', 'out', ...args], dir);
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(message);
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
      expect((await readdir(dir)).sort()).toEqual(['c.mp4', 'c.synth.json', 'c.truth.csv']);
    });
  }

  it('refuses a file that is not a video, and a missing file', async () => {
    for (const [file, message] of [['c.truth.csv', /^revtrace: c\.truth\.csv is not a video ffprobe can read /], ['gone.mp4', /^revtrace: No file at gone\.mp4; check the path\./]] as const) {
      const r = revtrace(['track', file, '--out', 'out'], dir);
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(message);
    }
    expect((await readdir(dir)).sort()).toEqual(['c.mp4', 'c.synth.json', 'c.truth.csv']);
  });

  it('refuses a clip cut short with its index at the front (all of it decodes, but only part of the frames are there)', async () => {
    const cut = await mkdtemp(join(tmpdir(), 'revtrace-cli-track-cut-'));
    expect(revtrace(['synth', '--out', 'whole.mp4', '--duration', '2', '--size', '320x240', '--marker', '60', '--crf', '20', '--quiet'], cut).status).toBe(0);
    ffmpegCopy(join(cut, 'whole.mp4'), join(cut, 'front.mp4'), ['-movflags', '+faststart']);
    const bytes = await readFile(join(cut, 'front.mp4'));
    await writeFile(join(cut, 'cut.mp4'), bytes.subarray(0, Math.floor(bytes.length * 0.4)));
    const r = revtrace(['track', 'cut.mp4', '--out', 'out', '--center', '160,120'], cut);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/^revtrace: cut\.mp4 is cut short: its index lists 60 frames but only \d+ can be read \(an interrupted copy or recording\); copy or export it again\.\n$/);
    expect(await readdir(cut)).not.toContain('out');
  });

  it('says a clip is too short, not that the marker is missing, when it has fewer than 5 frames', async () => {
    expect(revtrace(['synth', '--out', 'three.mp4', '--duration', '0.1', '--fps', '30', '--size', '320x240', '--marker', '60', '--quiet'], dir).status).toBe(0);
    const r = revtrace(['track', 'three.mp4', '--out', 'out3', '--center', '160,120'], dir);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe('revtrace: three.mp4 has only 3 frames; tracking needs at least 5, so give a longer clip or window\n');
    expect(await readdir(dir)).not.toContain('out3');
  });

  it('stops on Ctrl-C with one line and exit 130, writing nothing', async () => {
    const stop = await mkdtemp(join(tmpdir(), 'revtrace-cli-track-stop-'));
    testsrc2Clip(join(stop, 'long.mp4'), { size: '640x360', rate: 30, seconds: 60 }); // ffmpeg's own test pattern, long enough to be mid-decode
    const child = spawn(process.execPath, [bin, 'track', 'long.mp4', '--out', 'out', '--center', '320,180'], { cwd: stop, stdio: ['ignore', 'pipe', 'pipe'] });
    let stderr = '';
    child.stderr.on('data', (c: Buffer) => (stderr += c.toString()));
    const exited = new Promise<number | null>((resolve) => child.on('exit', (c) => resolve(c)));
    // wait until revtrace's decoding ffmpeg runs (its Ctrl-C handler is in place by then), then interrupt
    const decoding = () => { try { return execFileSync('ps', ['-o', 'comm=', '--ppid', String(child.pid)]).toString().includes('ffmpeg'); } catch { return false; } };
    while (!decoding() && child.exitCode === null) await new Promise((r) => setTimeout(r, 50));
    child.kill('SIGINT');
    expect(await exited).toBe(130);
    expect(stderr).toBe('revtrace: interrupted; nothing was written to out\n');
    expect((await readdir(stop)).sort()).toEqual(['long.mp4']);
  });
});
