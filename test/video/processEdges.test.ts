import { describe, expect, it, beforeAll } from 'vitest';
import { chmodSync, writeFileSync, readFileSync, existsSync } from 'node:fs';
import { join } from 'node:path';
import { execFileSync } from 'node:child_process';
import { readFrames } from '../../src/video/readFrames.js';
import { locateTools, locateTool } from '../../src/video/locateTools.js';
import { FfmpegError } from '../../src/video/FfmpegError.js';
import { InputError } from '../../src/errors.js';
import { FFMPEG, tempDir, testsrc2Clip } from './referenceTools.js';

/** A stand-in executable: answers -version like ffmpeg, then runs `body` for real work. */
function standIn(dir: string, name: string, body: string): string {
  const path = join(dir, name);
  writeFileSync(path, `#!/bin/sh\nif [ "$1" = "-version" ]; then echo "ffmpeg version 0.0-standin"; exit 0; fi\nif [ "$2" = "-h" ]; then exit 0; fi\n${body}\n`);
  chmodSync(path, 0o755);
  return path;
}

function alive(pid: number): boolean {
  try { process.kill(pid, 0); return true; } catch { return false; }
}

describe('ffmpeg process edges (stand-in executables)', () => {
  const dir = tempDir('edges');
  let clip: string;
  beforeAll(() => { clip = testsrc2Clip(join(dir, 'clip.mp4'), { size: '160x120', rate: 10, seconds: 1 }); });

  it('turns a failing ffmpeg into an FfmpegError with its exit code and stderr tail', async () => {
    const failing = standIn(dir, 'ffmpeg-fails', 'echo "banner line" >&2\necho "Decoder crashed: invented failure for the test" >&2\nexit 3');
    let error: unknown;
    try { for await (const _ of readFrames(clip, { ffmpeg: failing })) { /* none */ } } catch (err) { error = err; }
    expect(error).toBeInstanceOf(FfmpegError);
    const e = error as FfmpegError;
    expect(e.message).toBe(`ffmpeg exited with code 3 on ${clip}: Decoder crashed: invented failure for the test.`);
    expect(e.file).toBe(clip);
    expect(e.toolExitCode).toBe(3);
    expect(e.exitCode).toBe(1); // a failed run, for the CLI
    expect(e.stderrTail).toBe('banner line\nDecoder crashed: invented failure for the test\n');
  });

  it('stops a hanging ffmpeg on abort and leaves no process behind', async () => {
    const pidFile = join(dir, 'hang.pid');
    const hanging = standIn(dir, 'ffmpeg-hangs', `echo $$ > ${pidFile}\nexec sleep 600`);
    let error: unknown;
    try {
      for await (const _ of readFrames(clip, { ffmpeg: hanging, signal: AbortSignal.timeout(1500) })) { /* none */ }
    } catch (err) { error = err; }
    expect(error).toBeInstanceOf(Error);
    expect((error as Error).name).toBe('TimeoutError');
    expect(existsSync(pidFile)).toBe(true);
    expect(alive(Number(readFileSync(pidFile, 'utf8')))).toBe(false);
  }, 30_000); // the stand-in sleeps 600 s: a reader that ignored the abort would fail this test by its timeout

  it('reads frame times printed with or without a "[name @ 0x…]" prefix, and fails on a frame without one', async () => {
    // 160×120 gray frames: two whole frames after their time lines, the second prefixed the way some builds log
    const twoFrames = standIn(dir, 'ffmpeg-two', 'echo "Input #0, a banner line" >&2\necho "100000.000000" >&2\nhead -c 19200 /dev/zero\necho "[Eval @ 0x55d1] 200000.000000" >&2\nhead -c 19200 /dev/zero\nexit 0');
    const times: number[] = [];
    for await (const f of readFrames(clip, { ffmpeg: twoFrames })) times.push(f.t_s);
    expect(times).toEqual([0.1, 0.2]);
    const noTime = standIn(dir, 'ffmpeg-nan', 'echo "nan" >&2\nhead -c 19200 /dev/zero\nexit 0');
    await expect((async () => { for await (const _ of readFrames(clip, { ffmpeg: noTime })) { /* none */ } })()).rejects.toThrow(
      `ffmpeg gave no presentation time for frame 0 of ${clip}; the file's timestamps may be damaged.`);
  });

  it('reports a stand-in that dies in the middle of a frame', async () => {
    const partial = standIn(dir, 'ffmpeg-partial', 'echo "0.000000" >&2\nhead -c 100 /dev/zero\nexit 0');
    await expect((async () => { for await (const _ of readFrames(clip, { ffmpeg: partial })) { /* none */ } })()).rejects.toThrow(
      `ffmpeg stopped in the middle of frame 0 of ${clip}.`);
  });
});

describe('locateTools', () => {
  const dir = tempDir('locate');

  it('uses an explicit path first and says so', async () => {
    const tools = await locateTools({ ffmpeg: FFMPEG });
    expect(tools.ffmpeg.path).toBe(FFMPEG);
    expect(tools.ffmpeg.source).toBe('option');
    // Reference: the version the binary itself prints (`ffmpeg -version`, third word of the first line)
    expect(tools.ffmpeg.version).toBe(execFileSync(FFMPEG, ['-version']).toString().split(' ')[2]);
    expect(tools.ffmpeg.passthroughArgs[1]).toBe('passthrough');
  });

  it('takes REVTRACE_FFMPEG from the environment before the packages', async () => {
    const fake = standIn(dir, 'ffmpeg-env', 'exit 0');
    const found = await locateTool('ffmpeg', { env: { REVTRACE_FFMPEG: fake, PATH: '' } });
    expect(found).toEqual({ path: fake, source: 'env', version: '0.0-standin', skipped: [] });
  });

  it('finds the installer package binaries when nothing is named', async () => {
    const tools = await locateTools({ env: { PATH: '' } });
    expect(tools.ffmpeg.source).toBe('@ffmpeg-installer/ffmpeg');
    expect(tools.ffprobe.source).toBe('@ffprobe-installer/ffprobe');
  });

  it('refuses a named tool that is not executable, in one sentence (exit 2)', async () => {
    const plain = join(dir, 'ffmpeg-plain');
    writeFileSync(plain, '#!/bin/sh\n');
    chmodSync(plain, 0o644);
    const err = await locateTool('ffmpeg', { ffmpeg: plain }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(InputError);
    expect((err as InputError).exitCode).toBe(2);
    expect((err as Error).message).toBe(`--ffmpeg ${plain} cannot be used: it is not executable for this user (mode 644; run chmod +x ${plain}); give the path of a working ffmpeg executable.`);
  });

  it('passes over a non-executable PATH candidate and, with nothing else, fails with the reason', async () => {
    const pathDir = tempDir('locate-path');
    const plain = join(pathDir, 'ffprobe');
    writeFileSync(plain, '#!/bin/sh\n');
    chmodSync(plain, 0o644);
    const err = await locateTool('ffprobe', { env: { PATH: pathDir }, packages: false }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(InputError);
    expect((err as Error).message).toBe(`No working ffprobe was found (passed over: ${plain}: it is not executable for this user (mode 644; run chmod +x ${plain})); install ffmpeg, or pass --ffprobe <path>, or set REVTRACE_FFPROBE.`);
  });
});
