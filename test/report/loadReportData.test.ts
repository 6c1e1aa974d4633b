import { describe, expect, it } from 'vitest';
import { mkdir, mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadReportData } from '../../src/report/loadReportData.js';
import { renderReport } from '../../src/report/renderReport.js';
import { InputError } from '../../src/errors.js';
import { writeTestRun } from './writeTestBatch.js';

describe('loadReportData', () => {
  it('reads every run folder and notes missing or unreadable files without failing', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-load-'));
    try {
      await writeTestRun(dir, { run: 'f1', direction: 'forward', setting: 1, rate_deg_s: 30 });
      await writeTestRun(dir, { run: 'f2', direction: 'forward', setting: 1, rate_deg_s: 31 });
      await rm(join(dir, 'runs', 'f2', 'rate.csv'));
      await writeFile(join(dir, 'runs', 'f2', 'angle.csv'), 'frame,time,angle\n1,2,3\n');
      await mkdir(join(dir, 'runs', 'broken'), { recursive: true });
      await writeFile(join(dir, 'runs', 'broken', 'run.json'), '{ not json');
      const data = await loadReportData(dir);
      expect(data.runs.map((r) => r.record.run)).toEqual(['f1', 'f2']);
      const f1 = data.runs[0]!;
      expect(f1.problems).toEqual([]);
      expect(f1.angle?.t_s.length).toBe(120);
      expect(f1.rate?.rate_deg_s.length).toBe(120);
      expect(f1.files).toEqual(['angle.csv', 'rate.csv', 'fit.json', 'track.json', 'run.json', 'preview.png']);
      const f2 = data.runs[1]!;
      expect(f2.rate).toBeNull();
      expect(f2.angle).toBeNull();
      expect(f2.problems).toContain('rate.csv is missing from the run folder.');
      expect(f2.problems.some((p) => /angle\.csv could not be read \(angle\.csv has no t_s column\)/.test(p))).toBe(true);
      expect(data.unreadable.map((u) => u.run)).toEqual(['broken']);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });

  it('reads quoted CSV through the full parser', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-load-q-'));
    try {
      await writeTestRun(dir, { run: 'q', direction: 'forward', setting: 1, rate_deg_s: 30 });
      await writeFile(join(dir, 'runs', 'q', 'angle.csv'), 'frame,t_s,x_px,y_px,angle_deg,quality,flag\n0,0,1,1,0.5,0.9,\n1,0.1,,,,0,"lost:no-blob, glare"\n');
      const data = await loadReportData(dir);
      expect(data.runs[0]!.angle?.flag_counts).toEqual({ 'lost:no-blob, glare': 1 });
      expect(Number.isNaN(data.runs[0]!.angle!.angle_deg[1]!)).toBe(true);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });

  it('with a batch\'s run ids, reads only those and names the other folders in the report\'s warnings', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-load-only-'));
    try {
      for (const [run, rate] of [['f1', 30], ['r1', -1], ['r-old', -4]] as const) {
        await writeTestRun(dir, { run, direction: run.startsWith('f') ? 'forward' : 'reverse', setting: 1, rate_deg_s: rate });
      }
      const data = await loadReportData(dir, new Set(['f1', 'r1']));
      expect(data.runs.map((r) => r.record.run)).toEqual(['f1', 'r1']);
      expect(data.left_out).toEqual(['r-old']);
      const page = await renderReport(data);
      expect(page).toContain('The output folder also holds 1 run folder (r-old), not in this batch\'s manifest; left out of this report');
      expect(page.split('r-old').length - 1).toBe(1); // named once, in the warning: no section, no table row
      expect((await loadReportData(dir)).left_out).toEqual([]);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });

  it('refuses a folder without runs/ with a sentence', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-load-empty-'));
    try {
      await expect(loadReportData(dir)).rejects.toThrow(InputError);
      await expect(loadReportData(dir)).rejects.toThrow(/has no runs\/ folder/);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
});
