import { describe, expect, it } from 'vitest';
import { existsSync } from 'node:fs';
import { mkdtemp, readFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runDemo } from '../../src/demo/runDemo.js';

// The demo end to end on its reduced day. The truth each run is checked against is the synthetic
// renderer's own rotation profile (known by construction), not a value computed by the tracker or the fit.
describe('revtrace demo (reduced day)', () => {
  it('makes the report, every run covers its true rate, and the spoiled clip fails with its reason', async () => {
    const out = await mkdtemp(join(tmpdir(), 'revtrace-demo-'));
    const outcome = await runDemo({ out, quick: true, jobs: 2 });

    expect(existsSync(outcome.report_path)).toBe(true);
    const html = await readFile(outcome.report_path, 'utf8');
    expect(html).toContain('<html');
    for (const run of outcome.runs) expect(html, run.run).toContain(run.run);

    const byRun = new Map(outcome.batch.records.map((r) => [r.run, r]));
    expect(byRun.size).toBe(outcome.runs.length);
    for (const run of outcome.runs) {
      const record = byRun.get(run.run)!;
      if (run.spoiled) {
        expect(record.status).toBe('failed');
        expect(record.error).toMatch(/\w+/);
        expect(record.error!.split(/\.\s/).length).toBeLessThanOrEqual(2); // one sentence for a person
        continue;
      }
      expect(record.status, `${run.run}: ${record.error}`).toBe('ok');
      // the truth is the rate the clip was rendered with: the steady rate, or the terminal rate of a spin-up
      const profile = run.spec.profile as { kind: string; rate_deg_s?: number; terminal_rate_deg_s?: number };
      expect(run.truth_rate_deg_s, run.run).toBe(profile.kind === 'spinup' ? profile.terminal_rate_deg_s : profile.rate_deg_s);
      const est = record.fit?.steady?.rate_deg_s ?? record.fit?.spinup?.terminal_rate_deg_s;
      expect(est, `${run.run} has a rate`).toBeDefined();
      const [lo, hi] = est!.ci;
      expect(run.truth_rate_deg_s!, `${run.run}: truth ${run.truth_rate_deg_s} in [${lo}, ${hi}]`).toBeGreaterThanOrEqual(lo);
      expect(run.truth_rate_deg_s!, `${run.run}: truth ${run.truth_rate_deg_s} in [${lo}, ${hi}]`).toBeLessThanOrEqual(hi);
    }

    // a second demo reuses the rendered footage and the cached results
    const again = await runDemo({ out, quick: true, jobs: 2 });
    expect(again.rendered).toBe(0);
    expect(again.batch.processed - again.batch.failed.length).toBe(0);
  });
});
