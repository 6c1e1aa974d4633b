import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { writeTestBatch, writeTestRun } from '../report/writeTestBatch.js';

// Spawns bin/revtrace, which runs dist/: run `npm run build` first.
const bin = fileURLToPath(new URL('../../bin/revtrace', import.meta.url));
const revtrace = (...args: string[]) => spawnSync(process.execPath, [bin, ...args], { encoding: 'utf8' });

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'revtrace-cli-report-'));
  await writeTestBatch(dir);
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('revtrace report <dir>', () => {
  it('merges the run folders into summary.csv and batch.json, then writes the report', async () => {
    const r = revtrace('report', dir, '--title', 'Rotor K <b>day 3</b>');
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    expect(r.stdout).toContain(join(dir, 'report.html'));
    expect(existsSync(join(dir, 'summary.csv'))).toBe(true);
    const batch = JSON.parse(await readFile(join(dir, 'batch.json'), 'utf8')) as { counts: { runs: number; failed: number } };
    expect(batch.counts).toMatchObject({ runs: 9, failed: 1 });
    const html = await readFile(join(dir, 'report.html'), 'utf8');
    expect(html).toContain('<h1>Rotor K &lt;b&gt;day 3&lt;/b&gt;</h1>');
  });

  it('writes to --out and takes an equivalence margin', async () => {
    const out = join(dir, 'shared', 'day3.html');
    const r = revtrace('report', dir, '--out', out, '--margin', '0.5');
    expect(r.status).toBe(0);
    const html = await readFile(out, 'utf8');
    expect(html).toContain('Equivalence margin ±0.5 deg/s (given for this report)');
    expect(html).toContain('href="../runs/f-2.0-a/angle.csv"');
  });

  it('reports the runs its manifest still lists, whichever ran last, and names the others as left out', async () => {
    const mixed = await mkdtemp(join(tmpdir(), 'revtrace-cli-report-mixed-'));
    try {
      // the manifest now lists f1 and r1 (r1 rerun after an edit); f-old was a row since renamed
      const manifest = join(mixed, 'day.csv');
      await writeFile(manifest, 'video,run,direction\nclips/f1.mp4,f1,forward\nclips/r1.mp4,r1,reverse\n');
      for (const [run, rate] of [['f-old', 30], ['f1', 30], ['r1', -1]] as const) {
        await writeTestRun(mixed, { run, direction: rate > 0 ? 'forward' : 'reverse', setting: 1, rate_deg_s: rate });
        const recordPath = join(mixed, 'runs', run, 'run.json');
        const record = JSON.parse(await readFile(recordPath, 'utf8')) as { manifest: { path: string; sha256: string } };
        record.manifest = { path: manifest, sha256: run === 'r1' ? 'bb'.repeat(32) : 'aa'.repeat(32) }; // r1 from the edited version
        await writeFile(recordPath, JSON.stringify(record));
      }
      const r = revtrace('report', mixed);
      expect(r.status).toBe(0);
      expect(r.stdout).toContain('(2 runs)');
      expect(r.stderr).toBe('note: runs/ also holds 1 run folder (f-old) that the manifest no longer lists; they are left out of the summary and the report (delete them if they are stale)\n');
      const batch = JSON.parse(await readFile(join(mixed, 'batch.json'), 'utf8')) as { left_out: string[]; counts: { runs: number } };
      expect(batch).toMatchObject({ left_out: ['f-old'], counts: { runs: 2 } });
    } finally {
      await rm(mixed, { recursive: true, force: true });
    }
  });

  it('refuses a folder without runs/ with one sentence and exit code 2', () => {
    const r = revtrace('report', join(dir, 'no-such-folder'));
    expect(r.status).toBe(2);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/^revtrace: .*has no runs\/ folder; give the output folder of a batch/);
  });

  it('refuses a margin that is not a positive number', () => {
    const r = revtrace('report', dir, '--margin', 'abc');
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/--margin "abc" is not a positive rate/);
    expect(r.stderr).not.toMatch(/\n\s+at /);
  });
});
