import { describe, expect, it } from 'vitest';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { buildComparison, runRate } from '../../src/report/buildComparison.js';
import type { FitReport } from '../../src/fit/FitReport.js';
import type { RunRecord } from '../../src/batch/RunRecord.js';
import { loadReportData } from '../../src/report/loadReportData.js';
import { writeTestBatch } from './writeTestBatch.js';

describe('buildComparison', () => {
  it('groups runs by setting, pools each direction, and refuses a power law across a sign change', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-compare-'));
    try {
      await writeTestBatch(dir, [
        { run: 'f1a', direction: 'forward', setting: 1, rate_deg_s: 40, se_deg_s: 0.4 },
        { run: 'f1b', direction: 'forward', setting: 1, rate_deg_s: 42, se_deg_s: 0.4 },
        { run: 'r1a', direction: 'reverse', setting: 1, rate_deg_s: -0.3, se_deg_s: 0.05 },
        { run: 'f2a', direction: 'forward', setting: 2, rate_deg_s: 95, se_deg_s: 0.5 },
        { run: 'r2a', direction: 'reverse', setting: 2, rate_deg_s: 0.2, se_deg_s: 0.05 },
        { run: 'f4a', direction: 'forward', setting: 4, rate_deg_s: 210, se_deg_s: 1 },
        { run: 'bad', direction: 'reverse', setting: 4, rate_deg_s: 0, failed: 'No marker found in any frame.' },
      ]);
      const data = await loadReportData(dir);
      const s = buildComparison(data.runs, { margin_deg_s: 0.5 });
      expect(s.settings.map((x) => x.setting)).toEqual([1, 2, 4]);
      const one = s.settings[0]!;
      expect(one.forward.runs.map((r) => r.run)).toEqual(['f1a', 'f1b']);
      // the pooled forward rate of two runs with equal standard errors (0.4 deg/s each) weighs them equally, whatever
      // the between-run variance: the plain mean (40 + 42)/2 = 41 deg/s (inverse-variance weighting, common practice, no source)
      expect(one.forward.pooled!.value_deg_s).toBeCloseTo(41, 12);
      expect(one.comparison!.equivalence!.margin_deg_s).toBe(0.5);
      expect(one.notes.join(' ')).toMatch(/single run/i);
      expect(s.settings[2]!.comparison).toBeNull();
      expect(s.settings[2]!.notes).toContain('No reverse run at this setting.');
      const fwd = s.trends.find((t) => t.direction === 'forward')!;
      expect(fwd.fit!.n).toBe(4);
      // by hand: 41, 95 and 210 deg/s at settings 1, 2 and 4 rise faster than in proportion (log(210/41)/log 4 ≈ 1.18)
      expect(fwd.fit!.b.value).toBeGreaterThan(1);
      const rev = s.trends.find((t) => t.direction === 'reverse')!;
      expect(rev.fit).toBeNull();
      expect(rev.notes.join(' ')).toMatch(/do not all turn the same way/);
      expect(s.margin_source).toBe('given for this report');
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });

  it('says when the reverse direction\'s sense rests on the runs\' rates not wandering', async () => {
    // the test batch gives every steady run an interval allowing for undetected wander 3 × as wide (writeTestBatch)
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-compare-wander-'));
    try {
      await writeTestBatch(dir, [
        { run: 'f1', direction: 'forward', setting: 1, rate_deg_s: 40, se_deg_s: 0.4 },
        { run: 'r1', direction: 'reverse', setting: 1, rate_deg_s: -0.12, se_deg_s: 0.05 },
        { run: 'f2', direction: 'forward', setting: 2, rate_deg_s: 90, se_deg_s: 0.4 },
        { run: 'r2', direction: 'reverse', setting: 2, rate_deg_s: -2.5, se_deg_s: 0.05 },
      ]);
      const s = buildComparison((await loadReportData(dir)).runs);
      const [one, two] = s.settings;
      // setting 1: −0.12 ± 0.05 deg/s turns the other way (z = 2.4); with the 3 × wider interval it is not settled
      expect(one!.comparison!.p_opposite).toBeLessThan(0.05);
      expect(one!.comparison_allowing_wander!.p_opposite).toBeGreaterThan(0.05);
      expect(one!.notes.join(' ')).toMatch(/Allowing for a rate wander too small for the runs to detect, the sense of the reverse direction is not settled/);
      // setting 2: −2.5 ± 0.15 deg/s is clear either way, and no such note is added
      expect(two!.comparison_allowing_wander!.p_opposite).toBeLessThan(0.05);
      expect(two!.notes.join(' ')).not.toMatch(/wander/);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });

  it('takes the rate of the model the fit chose, not a steady fit carried beside a spin-up', () => {
    // With --model auto every model is fitted; a spin-up run's steady fit averages the spin-up and must not be its rate.
    const est = (value: number) => ({ value, se: 0.5, ci: [value - 1, value + 1] as [number, number], level: 0.95 });
    const record = { run: 'f1', direction: 'forward', status: 'ok', group: '', setting: 1, setting_unit: '' } as unknown as RunRecord;
    const both = { steady: { rate_deg_s: est(52), zero_test: { df: 7 } }, spinup: { terminal_rate_deg_s: est(90) } };
    const spun = runRate(record, { model: 'spinup', ...both } as unknown as FitReport).rate!;
    expect(spun.source).toBe('spin-up terminal rate');
    expect(spun.estimate.value_deg_s).toBe(90);
    const steady = runRate(record, { model: 'steady', ...both } as unknown as FitReport).rate!;
    expect(steady.source).toBe('steady rate');
    expect(steady.estimate.value_deg_s).toBe(52);
    expect(runRate(record, { model: 'spindown', ...both } as unknown as FitReport).rate).toBeNull();
  });
});
