// The batch through the real pipeline (track → fit → outputs) on six synthetic runs rendered here
// with known truth: both directions, two settings, replicates. Runs the built CLI (`npm run build` first).
import { beforeAll, describe, expect, it } from 'vitest';
import { spawn, spawnSync } from 'node:child_process';
import { mkdir, mkdtemp, readdir, readFile, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { parse } from 'csv-parse/sync';
import { renderClip } from '../../src/synth/renderClip.js';

const bin = fileURLToPath(new URL('../../bin/revtrace', import.meta.url));

// run id, direction, setting, true steady rate (deg/s, counterclockwise as seen), seed
const RUNS: [string, 'forward' | 'reverse', number, number, number][] = [
  ['fwd-1a', 'forward', 1, 90, 11],
  ['fwd-1b', 'forward', 1, 93, 12],
  ['fwd-2a', 'forward', 2, 180, 13],
  ['rev-1a', 'reverse', 1, -6, 14],
  ['rev-1b', 'reverse', 1, -5.5, 15],
  ['rev-2a', 'reverse', 2, -12, 16],
];

let dir = '';
const truth = new Map<string, number>();

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'revtrace-real-batch-'));
  await mkdir(join(dir, 'clips'));
  const lines = ['video,run,direction,setting,setting_unit'];
  for (const [run, direction, setting, rate, seed] of RUNS) {
    const clip = await renderClip({
      seed, width_px: 320, height_px: 240, fps: 30, duration_s: 2,
      markers: [{ kind: 'bright', size_px: 5 }],
      profile: { kind: 'steady', angle0_deg: seed * 17, rate_deg_s: rate },
      realism: { noise_sigma: 3, crf: 18 }, // sensor noise and H.264 compression, as in ordinary lab footage
    }, join(dir, 'clips', `${run}.mp4`));
    // Truth: the rate the clip was rendered with (our renderer, known by construction); its truth table agrees
    expect(clip.truth.rate_deg_s.every((v) => v === rate)).toBe(true);
    truth.set(run, rate);
    lines.push(`clips/${run}.mp4,${run},${direction},${setting},L/min`);
  }
  await writeFile(join(dir, 'day.csv'), `${lines.join('\n')}\n`);
  // centre: the renderer's default hub centre, the middle of the 320×240 frame (slow runs sweep too little arc to fit it)
  await writeFile(join(dir, 'day.defaults.json'), JSON.stringify({ marker: 'bright', model: 'steady', center: '160,120' }));
});

const summaryOf = async (out: string) => parse(await readFile(join(out, 'summary.csv')), { columns: true }) as Record<string, string>[];

describe('batch through the real pipeline', () => {
  it('tracks and fits six runs; each true rate lies inside its interval in summary.csv', async () => {
    const out = join(dir, 'out');
    const r = spawnSync(process.execPath, [bin, 'batch', 'day.csv', '--out', out, '--jobs', '2', '--json'], { cwd: dir, encoding: 'utf8' });
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    const rows = await summaryOf(out);
    expect(rows.map((x) => x.run)).toEqual(RUNS.map(([run]) => run));
    for (const row of rows) {
      const t = truth.get(row.run!)!;
      expect(row.status, row.run).toBe('ok');
      expect(Number(row.rate_lo_deg_s), row.run).toBeLessThanOrEqual(t);
      expect(Number(row.rate_hi_deg_s), row.run).toBeGreaterThanOrEqual(t);
      expect(Number(row.rate_rpm)).toBeCloseTo(Number(row.rate_deg_s) / 6, 6); // 1 rpm = 360 deg / 60 s
    }
    expect((await readdir(join(out, 'runs', 'rev-1a'))).sort()).toEqual(['angle.csv', 'fit.json', 'preview.png', 'rate.csv', 'run.json', 'track.json']);
    const events = r.stdout.trim().split('\n').map((l) => JSON.parse(l) as { event: string });
    expect(events.filter((e) => e.event === 'done').length).toBe(6);

    // a second batch finds nothing to do
    const again = spawnSync(process.execPath, [bin, 'batch', 'day.csv', '--out', out, '--json'], { cwd: dir, encoding: 'utf8' });
    expect(again.status, again.stderr).toBe(0);
    expect(again.stdout.split('\n').filter((l) => l.includes('"event":"cached"')).length).toBe(6);

    // killed with SIGKILL mid-run, then run again: the same summary as the uninterrupted batch
    const killed = join(dir, 'killed');
    await new Promise<void>((resolve, reject) => {
      const child = spawn(process.execPath, [bin, 'batch', 'day.csv', '--out', killed, '--jobs', '2', '--json'], { cwd: dir, stdio: ['ignore', 'pipe', 'inherit'] });
      let text = '';
      child.stdout.on('data', (c: Buffer) => {
        text += c.toString();
        if (text.includes('"event":"done"') && text.includes('"event":"progress"')) child.kill('SIGKILL');
      });
      child.on('exit', (_code, signal) => (signal === 'SIGKILL' ? resolve() : reject(new Error('the batch finished before it was killed'))));
    });
    expect(await readdir(killed)).not.toContain('summary.csv');
    const rerun = spawnSync(process.execPath, [bin, 'batch', 'day.csv', '--out', killed, '--jobs', '2', '--quiet'], { cwd: dir, encoding: 'utf8' });
    expect(rerun.status, rerun.stderr).toBe(0);
    expect(await readFile(join(killed, 'summary.csv'), 'utf8')).toBe(await readFile(join(out, 'summary.csv'), 'utf8'));
    const leftovers = (await readdir(killed, { recursive: true })).filter((f) => String(f).endsWith('.tmp'));
    expect(leftovers).toEqual([]);
  });

  it('three shards run at once into one folder, merged by revtrace report, equal the unsharded batch', async () => {
    const sharded = join(dir, 'sharded');
    const runShard = (i: number) =>
      new Promise<{ code: number | null; stdout: string }>((resolve) => {
        const child = spawn(process.execPath, [bin, 'batch', 'day.csv', '--out', sharded, '--shard', `${i}/3`, '--jobs', '1', '--json'], { cwd: dir, stdio: ['ignore', 'pipe', 'inherit'] });
        let stdout = '';
        child.stdout.on('data', (c: Buffer) => (stdout += c.toString()));
        child.on('exit', (code) => resolve({ code, stdout }));
      });
    const shards = await Promise.all([1, 2, 3].map(runShard));
    for (const s of shards) expect(s.code).toBe(0);
    expect(await readdir(sharded)).toEqual(['runs']); // shards write runs only
    const merge = spawnSync(process.execPath, [bin, 'report', sharded], { cwd: dir, encoding: 'utf8' });
    expect(merge.status, merge.stderr).toBe(0);
    expect(await readFile(join(sharded, 'summary.csv'), 'utf8')).toBe(await readFile(join(dir, 'out', 'summary.csv'), 'utf8'));
  });

  it('names the manifest column, not a command-line option, when a run fails on its settings', async () => {
    // the centre lies outside the region: the track stage's sentence names --center and --roi, the batch's must name the columns
    const lines = ['video,run,direction,roi,center', 'clips/fwd-1a.mp4,bad-centre,forward,"10,10,100,100","200,50"'];
    await writeFile(join(dir, 'bad.csv'), `${lines.join('\n')}\n`);
    const out = join(dir, 'bad-out');
    const r = spawnSync(process.execPath, [bin, 'batch', 'bad.csv', '--out', out, '--json'], { cwd: dir, encoding: 'utf8' });
    expect(r.status).not.toBe(0);
    const [row] = await summaryOf(out);
    expect(row!.status).toBe('failed');
    expect(row!.error).toMatch(/^column center 200,50 lies outside column roi 10,10,100,100; /);
    expect(row!.error).not.toContain('--');
  });
});
