// The batch command line: exit codes and messages for bad input (run `npm run build` first).
import { describe, expect, it } from 'vitest';
import { spawn, spawnSync } from 'node:child_process';
import { mkdir, mkdtemp, readdir, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

const bin = fileURLToPath(new URL('../../bin/revtrace', import.meta.url));
const revtrace = (args: string[], cwd: string) => spawnSync(process.execPath, [bin, ...args], { encoding: 'utf8', cwd });

async function folder(csv: string): Promise<string> {
  const dir = await mkdtemp(join(tmpdir(), 'revtrace-cli-batch-'));
  await mkdir(join(dir, 'clips'));
  await writeFile(join(dir, 'clips', 'a.mp4'), 'not really a video');
  await writeFile(join(dir, 'day.csv'), csv);
  return dir;
}

describe('revtrace batch', () => {
  it('lists every manifest problem with line and column, exits 2 and writes nothing', async () => {
    const dir = await folder('video,run,direction,roi\nclips/a.mp4,a,forward,\nclips/gone.mp4,b,backward,"1,2"\nclips/a.mp4,a,reverse,\n');
    const r = revtrace(['batch', 'day.csv'], dir);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/^revtrace: the manifest day\.csv has 4 problems; fix them and run again \(nothing was run\):\n/);
    expect(r.stderr).toContain('day.csv, line 3, column 1 "video": the video file clips/gone.mp4 does not exist');
    expect(r.stderr).toContain('day.csv, line 3, column 3 "direction": the direction "backward" is unknown; write forward or reverse');
    expect(r.stderr).toContain('day.csv, line 3, column 4 "roi": roi "1,2" is not a region');
    expect(r.stderr).toContain('day.csv, line 4, column 2 "run": the run id "a" repeats line 2');
    expect(r.stderr).not.toMatch(/\n\s+at /);
    expect((await readdir(dir)).sort()).toEqual(['clips', 'day.csv']);
  });

  it('rejects a bad --shard or --jobs with exit 2 before any work', async () => {
    const dir = await folder('video,run,direction\nclips/a.mp4,a,forward\n');
    for (const args of [['--shard', '4/3'], ['--jobs', '0'], ['--jobs', 'many']]) {
      const r = revtrace(['batch', 'day.csv', ...args], dir);
      expect(r.status, args.join(' ')).toBe(2);
      expect(r.stderr).toMatch(/^revtrace: --(shard|jobs) "[^"]+" is not/);
    }
    expect((await readdir(dir)).sort()).toEqual(['clips', 'day.csv']);
  });

  it('says so when the manifest file does not exist', async () => {
    const dir = await folder('');
    const r = revtrace(['batch', 'nope.csv'], dir);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe('revtrace: cannot read the manifest nope.csv; check the path\n');
  });

  it('stops like Ctrl-C, with one line and exit 130, when the reader of its --json output goes away', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-cli-batch-pipe-'));
    for (const run of ['a', 'b']) {
      expect(revtrace(['synth', '--out', `clips/${run}.mp4`, '--duration', '3', '--size', '320x240', '--marker', '60', '--quiet'], dir).status).toBe(0);
    }
    await writeFile(join(dir, 'day.csv'), 'video,run,direction,center\nclips/a.mp4,a,forward,"160,120"\nclips/b.mp4,b,reverse,"160,120"\n');
    const child = spawn(process.execPath, [bin, 'batch', 'day.csv', '--json', '--jobs', '1'], { cwd: dir, stdio: ['ignore', 'pipe', 'pipe'] });
    let stderr = '';
    child.stderr.on('data', (c: Buffer) => (stderr += c.toString()));
    child.stdout.once('data', () => child.stdout.destroy()); // as `| head -1` does after the first line
    const code = await new Promise<number | null>((resolve) => child.on('exit', (c) => resolve(c)));
    expect(code).toBe(130);
    expect(stderr).toBe('revtrace: the output pipe was closed, so the batch stopped; runs finished so far are kept, run the same command again to finish the rest\n');
    const again = revtrace(['batch', 'day.csv', '--quiet'], dir);
    expect(again.status, again.stderr).toBe(0);
  });
});
