import { describe, expect, it } from 'vitest';
import { mkdir, mkdtemp, readdir, readFile, rm, stat, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { runBatch } from '../../src/batch/runBatch.js';
import { rebuildSummary } from '../../src/batch/rebuildSummary.js';
import { runRecordFor } from '../../src/batch/runRecordFor.js';
import { parseShard, shardOf } from '../../src/batch/shard.js';
import type { BatchEvent } from '../../src/batch/BatchEvent.js';
import type { RunRecord } from '../../src/batch/RunRecord.js';
import { RevtraceError } from '../../src/errors.js';
import { writeFileAtomic } from '../../src/writeFileAtomic.js';
import { makeFakeProcessor, type FakeProcessorOptions } from './fakeProcessor.mjs';

const deps = { writeFileAtomic, runRecordFor, RevtraceError };
const fake = (o: FakeProcessorOptions = {}) => makeFakeProcessor(deps, o);

/** A manifest of fake runs: each "video" is a text file `rate=<deg/s>` or `fail=<reason>`. */
async function day(rows: [run: string, direction: string, setting: string, content: string][]): Promise<{ dir: string; manifest: string; out: string }> {
  const dir = await mkdtemp(join(tmpdir(), 'revtrace-batch-'));
  await mkdir(join(dir, 'clips'));
  const lines = ['video,run,direction,setting,group'];
  for (const [run, direction, setting, content] of rows) {
    await writeFile(join(dir, 'clips', `${run}.mp4`), content);
    lines.push(`clips/${run}.mp4,${run},${direction},${setting},g`);
  }
  await writeFile(join(dir, 'day.csv'), `${lines.join('\n')}\n`);
  return { dir, manifest: join(dir, 'day.csv'), out: join(dir, 'out') };
}

const SIX: [string, string, string, string][] = [
  ['f1a', 'forward', '1', 'rate=120'],
  ['f1b', 'forward', '1', 'rate=121'],
  ['f2a', 'forward', '2', 'rate=240'],
  ['r1a', 'reverse', '1', 'rate=-3'],
  ['r1b', 'reverse', '1', 'rate=-2.5'],
  ['r2a', 'reverse', '2', 'rate=0.2'],
];

const readSummary = async (out: string) => parse(await readFile(join(out, 'summary.csv')), { columns: true }) as Record<string, string>[];

describe('runBatch with a stand-in processor', () => {
  it('processes every run, writes run.json last, and summarises them in manifest order', async () => {
    const { manifest, out } = await day(SIX);
    const events: BatchEvent[] = [];
    const outcome = await runBatch(manifest, { out, jobs: 3, processor: fake({ delayMs: 20 }), onEvent: (e) => events.push(e) });
    expect(outcome.processed).toBe(6);
    expect(outcome.failed).toEqual([]);
    expect(outcome.summary_written).toBe(true);
    const rows = await readSummary(out);
    // by hand from the stand-in's rule (fakeProcessor.mjs: rate ± 1 deg/s, rpm = rate/6 since 1 rpm = 6 deg/s),
    // printed to 10 significant digits
    expect(rows.map((r) => [r.run, r.direction, r.setting, r.status, r.rate_deg_s, r.rate_lo_deg_s, r.rate_rpm])).toEqual([
      ['f1a', 'forward', '1', 'ok', '120', '119', '20'],
      ['f1b', 'forward', '1', 'ok', '121', '120', '20.16666667'],
      ['f2a', 'forward', '2', 'ok', '240', '239', '40'],
      ['r1a', 'reverse', '1', 'ok', '-3', '-4', '-0.5'],
      ['r1b', 'reverse', '1', 'ok', '-2.5', '-3.5', '-0.4166666667'],
      ['r2a', 'reverse', '2', 'ok', '0.2', '-0.8', '0.03333333333'],
    ]);
    expect((await readdir(join(out, 'runs', 'f1a'))).sort()).toEqual(['angle.csv', 'fit.json', 'preview.png', 'rate.csv', 'run.json', 'track.json']);
    // run.json is the commit marker: no other output is newer
    const dirF = join(out, 'runs', 'f1a');
    const runJsonTime = (await stat(join(dirF, 'run.json'))).mtimeMs;
    for (const name of ['angle.csv', 'fit.json', 'preview.png', 'rate.csv', 'track.json']) expect((await stat(join(dirF, name))).mtimeMs).toBeLessThanOrEqual(runJsonTime);
    const batch = JSON.parse(await readFile(join(out, 'batch.json'), 'utf8'));
    expect(batch.counts).toEqual({ runs: 6, ok: 6, failed: 0 });
    expect(events.filter((e) => e.type === 'progress').length).toBeGreaterThan(0);
    expect(events.at(-1)!.type).toBe('summary');
  });

  it('records a failed run with its reason and goes on with the others', async () => {
    const { manifest, out } = await day([['a', 'forward', '1', 'rate=10'], ['b', 'forward', '1', 'fail=the marker was never found in clips/b.mp4'], ['c', 'reverse', '1', 'rate=-1']]);
    const outcome = await runBatch(manifest, { out, jobs: 1, processor: fake() });
    expect(outcome.failed).toEqual([{ run: 'b', error: 'the marker was never found in clips/b.mp4' }]);
    const rows = await readSummary(out);
    expect(rows.map((r) => [r.run, r.status, r.error])).toEqual([['a', 'ok', ''], ['b', 'failed', 'the marker was never found in clips/b.mp4'], ['c', 'ok', '']]);
    const batch = JSON.parse(await readFile(join(out, 'batch.json'), 'utf8'));
    expect(batch.failed).toEqual([{ run: 'b', error: 'the marker was never found in clips/b.mp4' }]);
  });

  it('skips unchanged runs, redoes a run whose video or settings changed, and redoes all with force', async () => {
    const { dir, manifest, out } = await day(SIX.slice(0, 3));
    await runBatch(manifest, { out, processor: fake() });
    const calls: string[] = [];
    let o = await runBatch(manifest, { out, processor: fake({ calls }) });
    expect(calls).toEqual([]);
    expect(o.cached).toBe(3);

    await writeFile(join(dir, 'clips', 'f1b.mp4'), 'rate=125'); // new content
    await writeFile(join(dir, 'day.defaults.json'), '{}'); // same effective settings: no rerun
    o = await runBatch(manifest, { out, processor: fake({ calls }) });
    expect(calls).toEqual(['f1b']);
    expect((await readSummary(out))[1]!.rate_deg_s).toBe('125');

    await writeFile(join(dir, 'day.defaults.json'), JSON.stringify({ model: 'steady' })); // settings changed for all
    calls.length = 0;
    await runBatch(manifest, { out, jobs: 1, processor: fake({ calls }) });
    expect(calls).toEqual(['f1a', 'f1b', 'f2a']);

    calls.length = 0;
    await runBatch(manifest, { out, jobs: 1, force: true, processor: fake({ calls }) });
    expect(calls).toEqual(['f1a', 'f1b', 'f2a']);
  });

  it('summarises only the manifest\'s runs: folders of runs dropped from it (or renamed) are named and left out, never deleted', async () => {
    const { manifest, out } = await day(SIX);
    await runBatch(manifest, { out, processor: fake() });
    // the day's manifest loses r1b and renames f2a to f2a-redo (same clip): the old folders must not be pooled again
    const text = await readFile(manifest, 'utf8');
    await writeFile(manifest, text.split('\n').filter((l) => !l.includes('r1b')).join('\n').replace(',f2a,', ',f2a-redo,'));
    const events: BatchEvent[] = [];
    const o = await runBatch(manifest, { out, processor: fake(), onEvent: (e) => events.push(e) });
    expect(o.cached).toBe(4);
    expect((await readSummary(out)).map((r) => r.run)).toEqual(['f1a', 'f1b', 'f2a-redo', 'r1a', 'r2a']);
    const batch = JSON.parse(await readFile(join(out, 'batch.json'), 'utf8')) as { left_out: string[]; counts: { runs: number } };
    expect(batch.left_out).toEqual(['f2a', 'r1b']);
    expect(batch.counts.runs).toBe(5);
    expect(events.filter((e) => e.type === 'stray')).toEqual([{ type: 'stray', runs: ['f2a', 'r1b'] }]);
    expect((await readdir(join(out, 'runs'))).sort()).toEqual(['f1a', 'f1b', 'f2a', 'f2a-redo', 'r1a', 'r1b', 'r2a']);
    // without a manifest (merging shards), every folder counts
    expect((await rebuildSummary(out)).records.map((r) => r.run).sort()).toEqual(['f1a', 'f1b', 'f2a', 'f2a-redo', 'r1a', 'r1b', 'r2a']);
  });

  it('updates notes, group and setting of a cached run without redoing it', async () => {
    const { manifest, out } = await day(SIX.slice(0, 2));
    await runBatch(manifest, { out, processor: fake() });
    await writeFile(manifest, (await readFile(manifest, 'utf8')).replace('f1b,forward,1,g', 'f1b,forward,1.25,g2'));
    const calls: string[] = [];
    await runBatch(manifest, { out, processor: fake({ calls }) });
    expect(calls).toEqual([]);
    const rows = await readSummary(out);
    expect(rows[1]).toMatchObject({ run: 'f1b', setting: '1.25', group: 'g2' });
  });

  it('redoes a committed run whose output files were deleted, and retries failed runs', async () => {
    const { dir, manifest, out } = await day([['a', 'forward', '1', 'rate=10'], ['b', 'forward', '1', 'fail=broken']]);
    await runBatch(manifest, { out, processor: fake() });
    await rm(join(out, 'runs', 'a', 'rate.csv'));
    await writeFile(join(dir, 'clips', 'b.mp4'), 'rate=11'); // fixed
    const calls: string[] = [];
    const o = await runBatch(manifest, { out, jobs: 1, processor: fake({ calls }) });
    expect(calls).toEqual(['a', 'b']);
    expect(o.failed).toEqual([]);
  });

  it('removes temporary files left by a killed batch, and nothing else', async () => {
    const { manifest, out } = await day(SIX.slice(0, 2));
    await runBatch(manifest, { out, processor: fake() });
    await writeFile(join(out, '.summary.csv.999.abcd.tmp'), 'half');
    await writeFile(join(out, 'runs', 'f1a', '.fit.json.999.abcd.tmp'), 'half');
    await writeFile(join(out, 'runs', 'f1a', 'my-notes.txt'), 'keep me');
    const events: BatchEvent[] = [];
    await runBatch(manifest, { out, processor: fake(), onEvent: (e) => events.push(e) });
    const cleaned = events.find((e) => e.type === 'cleaned') as { files: string[] } | undefined;
    expect(cleaned?.files.sort()).toEqual([join(out, '.summary.csv.999.abcd.tmp'), join(out, 'runs', 'f1a', '.fit.json.999.abcd.tmp')].sort());
    expect((await readdir(out)).sort()).toEqual(['batch.json', 'runs', 'summary.csv']);
    expect((await readdir(join(out, 'runs', 'f1a'))).sort()).toContain('my-notes.txt');
  });

  it('writes nothing when the manifest is invalid', async () => {
    const { manifest, out } = await day([['a', 'forward', '1', 'rate=10'], ['b', 'up', '1', 'rate=1']]);
    await expect(runBatch(manifest, { out, processor: fake() })).rejects.toThrow(/line 3, column 3 "direction"/);
    await expect(stat(out)).rejects.toThrow();
  });

  it('stops on abort, leaves running runs uncommitted, and a rerun completes them', async () => {
    const { manifest, out } = await day(SIX);
    const controller = new AbortController();
    const o = await runBatch(manifest, {
      out, jobs: 2, processor: fake({ delayMs: 40 }), signal: controller.signal,
      onEvent: (e) => { if (e.type === 'done' && e.run === 'f1a') controller.abort(new Error('stop')); },
    });
    expect(o.interrupted).toBe(true);
    expect(o.summary_written).toBe(false);
    const committed = (await Promise.all(SIX.map(async ([run]) => stat(join(out, 'runs', run, 'run.json')).then(() => run, () => null)))).filter(Boolean);
    expect(committed.length).toBeLessThan(6);
    const calls: string[] = [];
    await runBatch(manifest, { out, processor: fake({ calls }) });
    expect(calls.sort()).toEqual(SIX.map(([r]) => r).filter((r) => !committed.includes(r)).sort());
    expect((await readSummary(out)).length).toBe(6);
  });

  it('an interrupted redo leaves no summary or report that lists as ok a run whose files it has removed; a cached rerun keeps them', async () => {
    const { manifest, out } = await day(SIX);
    await runBatch(manifest, { out, processor: fake() });
    await runBatch(manifest, { out, processor: fake() }); // everything cached: the summary is rewritten, not dropped
    expect((await readdir(out)).sort()).toEqual(['batch.json', 'runs', 'summary.csv']);
    await writeFile(join(out, 'report.html'), '<p>the last complete batch</p>'); // as the CLI writes it
    const controller = new AbortController();
    const o = await runBatch(manifest, {
      out, jobs: 1, force: true, processor: fake({ delayMs: 40 }), signal: controller.signal,
      onEvent: (e) => { if (e.type === 'start') controller.abort(new Error('stop')); },
    });
    expect(o.interrupted).toBe(true);
    expect(await readdir(out)).toEqual(['runs']);
    await runBatch(manifest, { out, processor: fake() });
    expect((await readSummary(out)).map((r) => r.status)).toEqual(Array(6).fill('ok'));
  });

  it('splits a manifest into shards by run id, and merged shards equal one unsharded batch', async () => {
    const { manifest, out } = await day(SIX);
    const whole = join(out, '..', 'whole');
    await runBatch(manifest, { out: whole, processor: fake() });
    const seen: string[] = [];
    for (const i of [1, 2, 3]) {
      const o = await runBatch(manifest, { out, shard: parseShard(`${i}/3`), processor: fake() });
      expect(o.summary_written).toBe(false);
      for (const r of o.records) {
        expect(shardOf(r.run, 3)).toBe(i);
        seen.push(r.run);
      }
    }
    expect(seen.sort()).toEqual(SIX.map(([r]) => r).sort());
    const { records } = await rebuildSummary(out);
    expect(records.map((r: RunRecord) => r.run)).toEqual(SIX.map(([r]) => r));
    expect(await readFile(join(out, 'summary.csv'), 'utf8')).toBe(await readFile(join(whole, 'summary.csv'), 'utf8'));
  });

  it('a shard removes temporary files only in its own runs\' folders, never another shard\'s', async () => {
    const { manifest, out } = await day(SIX);
    const other = SIX.map(([r]) => r).find((r) => shardOf(r, 3) !== 1)!;
    const own = SIX.map(([r]) => r).find((r) => shardOf(r, 3) === 1)!;
    await mkdir(join(out, 'runs', other), { recursive: true });
    await mkdir(join(out, 'runs', own), { recursive: true });
    await writeFile(join(out, 'runs', other, '.angle.csv.1.abcd.tmp'), 'being written by another shard');
    await writeFile(join(out, 'runs', own, '.angle.csv.1.abcd.tmp'), 'left by a killed run');
    await runBatch(manifest, { out, shard: parseShard('1/3'), processor: fake() });
    expect(await readdir(join(out, 'runs', other))).toEqual(['.angle.csv.1.abcd.tmp']);
    expect(await readdir(join(out, 'runs', own))).not.toContain('.angle.csv.1.abcd.tmp');
  });

  it('parses --shard and rejects parts outside 1..n', () => {
    expect(parseShard('2/8')).toEqual({ index: 2, count: 8 });
    for (const bad of ['0/3', '4/3', '1/0', 'a/b', '3']) expect(() => parseShard(bad)).toThrow(/--shard/);
  });
});
