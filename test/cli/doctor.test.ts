import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { join } from 'node:path';
import { FFMPEG, FFPROBE, tempDir } from '../video/referenceTools.js';

const bin = fileURLToPath(new URL('../../bin/revtrace', import.meta.url));

function revtrace(args: string[], env: NodeJS.ProcessEnv = process.env) {
  return spawnSync(process.execPath, [bin, ...args], { encoding: 'utf8', env });
}

describe('revtrace doctor', () => {
  it('names the ffmpeg and ffprobe it uses, where they came from and their versions, and times OpenCV', () => {
    // Reference: the versions the binaries themselves print (`ffmpeg -version`).
    const version = spawnSync(FFMPEG, ['-version'], { encoding: 'utf8' }).stdout.split(' ')[2];
    const r = revtrace(['--ffmpeg', FFMPEG, 'doctor', '--json']);
    expect(r.status).toBe(0);
    const d = JSON.parse(r.stdout) as Record<string, any>;
    expect(d.ok).toBe(true);
    expect(d.ffmpeg).toMatchObject({ ok: true, path: FFMPEG, source: 'option', version });
    expect(d.ffprobe).toMatchObject({ ok: true, path: FFPROBE });
    expect(d.opencv.ok).toBe(true);
    // the load time is reported, not judged: a number of seconds (no speed bound in a unit test)
    expect(typeof d.opencv.load_s).toBe('number');
    expect(Number.isFinite(d.opencv.load_s)).toBe(true);
  });

  it('reads REVTRACE_FFPROBE and prints a text report', () => {
    const r = revtrace(['doctor'], { ...process.env, REVTRACE_FFPROBE: FFPROBE });
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(new RegExp(`^ffprobe +ok +\\S+ from env: ${FFPROBE.replace(/[/.]/g, '\\$&')}$`, 'm'));
    expect(r.stdout).toMatch(/^opencv +ok .* loaded and initialised in \d+\.\d\d s$/m);
  });

  it('fails with exit 2 and says what is wrong when --ffmpeg names nothing', () => {
    const missing = join(tempDir('doctor'), 'ffmpeg');
    const r = revtrace(['--ffmpeg', missing, 'doctor']);
    expect(r.status).toBe(2);
    expect(r.stdout).toContain(`ffmpeg   FAIL --ffmpeg ${missing} cannot be used: no such file; give the path of a working ffmpeg executable.`);
    expect(r.stderr).not.toMatch(/\n\s+at /);
  });
});
