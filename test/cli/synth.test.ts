// The synth command line: what it writes, and one sentence with exit 2 for bad options (run `npm run build` first).
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtemp, readdir, readFile, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

const bin = fileURLToPath(new URL('../../bin/revtrace', import.meta.url));
const revtrace = (args: string[], cwd: string) => spawnSync(process.execPath, [bin, ...args], { encoding: 'utf8', cwd });

describe('revtrace synth', () => {
  it('writes the clip, its truth table and its spec side by side', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-cli-synth-'));
    const r = revtrace(['synth', '--out', 'c.mp4', '--duration', '0.2', '--fps', '25', '--size', '160x120', '--marker', '40'], dir);
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    expect(r.stdout).toContain('(5 frames, 160×120)');
    expect((await readdir(dir)).sort()).toEqual(['c.mp4', 'c.synth.json', 'c.truth.csv']);
  });

  it('renders again over its own clip, but never over a video it did not make', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-cli-synth-own-'));
    const args = ['--duration', '0.12', '--fps', '25', '--size', '160x120', '--marker', '40', '--quiet'];
    expect(revtrace(['synth', '--out', 'c.mp4', ...args], dir).status).toBe(0);
    expect(revtrace(['synth', '--out', 'c.mp4', ...args, '--rate', '30'], dir).status).toBe(0); // its own: the sidecar is there
    await writeFile(join(dir, 'run07.mp4'), 'real footage stands in here');
    const r = revtrace(['synth', '--out', 'run07.mp4', ...args], dir);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe('revtrace: --out run07.mp4 already exists and was not made by revtrace synth (no run07.synth.json beside it); choose another name, so that footage is never written over\n');
    expect(await readFile(join(dir, 'run07.mp4'), 'utf8')).toBe('real footage stands in here');
    expect((await readdir(dir)).sort()).toEqual(['c.mp4', 'c.synth.json', 'c.truth.csv', 'run07.mp4']);
  });

  it('makes the folder of --out when it does not exist yet', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-cli-synth-sub-'));
    const r = revtrace(['synth', '--out', 'new/deeper/c.mp4', '--duration', '0.12', '--fps', '25', '--size', '160x120', '--marker', '40', '--quiet'], dir);
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    expect((await readdir(join(dir, 'new', 'deeper'))).sort()).toEqual(['c.mp4', 'c.synth.json', 'c.truth.csv']);
  });

  it('refuses bad options with one sentence naming the option, exit 2, and writes nothing', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-cli-synth-bad-'));
    const cases: [string[], RegExp][] = [
      [['--out', 'c.avi'], /^revtrace: --out "c\.avi" does not end in \.mp4; .+\n$/],
      [['--out', 'c.mp4', '--marker', '80,x'], /^revtrace: --marker "80,x" is not understood; give .+\n$/],
      [['--out', 'c.mp4', '--size', '10'], /^revtrace: --size "10" is not understood; give .+\n$/],
      [['--out', 'c.mp4', '--fps', '0'], /^revtrace: .*fps.* 0, outside 1–1000; .+\n$/],
    ];
    for (const [args, message] of cases) {
      const r = revtrace(['synth', ...args], dir);
      expect(r.status, args.join(' ')).toBe(2);
      expect(r.stderr, args.join(' ')).toMatch(message);
    }
    expect(await readdir(dir)).toEqual([]);
  });
});
