// Every command that writes files refuses an output place it cannot write to at once, with one
// sentence and exit 2, instead of working first (or, as Node 20's recursive mkdir does under /proc,
// spinning forever). Run `npm run build` first.
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdir, mkdtemp, readdir, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

const bin = fileURLToPath(new URL('../../bin/revtrace', import.meta.url));
// the timeout only stops a hung child so the test fails instead of hanging; it is not a speed check
const revtrace = (args: string[], cwd: string) => spawnSync(process.execPath, [bin, ...args], { encoding: 'utf8', cwd, timeout: 60_000 });

async function workFolder(): Promise<string> {
  const dir = await mkdtemp(join(tmpdir(), 'revtrace-unwritable-'));
  await writeFile(join(dir, 'clip.mp4'), 'stands in for a video; the output check comes first');
  await writeFile(join(dir, 'angle.csv'), 'frame,t_s,x_px,y_px,angle_deg,quality,flag\n' + Array.from({ length: 20 }, (_, i) => `${i},${(i / 30).toFixed(4)},1,1,${(i * 0.5).toFixed(2)},1,`).join('\n') + '\n');
  await writeFile(join(dir, 'day.csv'), 'video,run,direction\nclip.mp4,a,forward\n');
  await writeFile(join(dir, 'a-file'), 'a file where a folder is expected');
  await mkdir(join(dir, 'batch', 'runs'), { recursive: true });
  return dir;
}

// /proc refuses new entries on Linux; "a-file/x" puts a folder under a plain file.
const places = [{ name: 'under /proc', out: '/proc/revtrace-no-such-place' }, { name: 'under a plain file', out: 'a-file/sub' }];

describe('an output place that cannot be written', () => {
  for (const place of places) {
    it(`is refused by every writing command (${place.name}) with one sentence and exit 2`, async () => {
      const dir = await workFolder();
      const before = (await readdir(dir)).sort();
      const cases: { args: string[]; names: string }[] = [
        { args: ['track', 'clip.mp4', '--out', place.out], names: '--out' },
        { args: ['fit', 'angle.csv', '--out', `${place.out}/fit.json`], names: 'the folder of --out' },
        { args: ['batch', 'day.csv', '--out', place.out], names: '--out' },
        { args: ['report', 'batch', '--out', `${place.out}/report.html`], names: 'the folder of --out' },
        { args: ['synth', '--duration', '0.2', '--out', `${place.out}/clip.mp4`], names: 'the folder of --out' },
        { args: ['demo', '--quick', '--out', place.out], names: '--out' },
      ];
      for (const c of cases) {
        const r = revtrace(c.args, dir);
        const label = c.args.join(' ');
        expect(r.error, label).toBeUndefined(); // undefined unless the child had to be killed
        expect(r.status, label).toBe(2);
        expect(r.stderr, label).toMatch(new RegExp(`^revtrace: cannot write to ${c.names.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')} [^\\n]+; choose a folder you can write to\\n$`));
        expect(r.stdout, label).toBe('');
      }
      expect((await readdir(dir)).sort()).toEqual(before);
    });
  }
});
