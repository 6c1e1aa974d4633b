// The report of a real small batch: synthetic clips rendered here with known truth (both directions,
// two settings, reverse about 15× slower and turning the other way), tracked and fitted by the real
// pipeline through the built CLI (`npm run build` first), then the report read back.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdir, mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { renderClip } from '../../src/synth/renderClip.js';
import { loadReportData } from '../../src/report/loadReportData.js';
import { buildComparison } from '../../src/report/buildComparison.js';

const bin = fileURLToPath(new URL('../../bin/revtrace', import.meta.url));

// run id, direction, setting (L/min), true steady rate (deg/s, counterclockwise as seen), seed
const RUNS: [string, 'forward' | 'reverse', number, number, number][] = [
  ['fwd-1a', 'forward', 1, 90, 21],
  ['fwd-1b', 'forward', 1, 92, 22],
  ['rev-1a', 'reverse', 1, -6, 23],
  ['rev-1b', 'reverse', 1, -6.2, 24],
  ['fwd-2a', 'forward', 2, 170, 25],
  ['rev-2a', 'reverse', 2, -11, 26],
];

let dir = '';
const truth = new Map<string, number>();

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'revtrace-report-real-'));
  await mkdir(join(dir, 'clips'));
  const lines = ['video,run,direction,setting,setting_unit,center,notes'];
  for (const [run, direction, setting, rate, seed] of RUNS) {
    const clip = await renderClip({
      seed, width_px: 320, height_px: 240, fps: 30, duration_s: 2,
      markers: [{ kind: 'bright', size_px: 5 }],
      profile: { kind: 'steady', angle0_deg: seed * 11, rate_deg_s: rate },
      realism: { noise_sigma: 3 },
    }, join(dir, 'clips', `${run}.mp4`));
    truth.set(run, clip.truth.rate_deg_s[0]!);
    // the hub is at the frame centre (the renderer's default); a slow reverse run sweeps too short an arc to fit it
    lines.push(`clips/${run}.mp4,${run},${direction},${setting},L/min,"160,120","<b>bench</b> note"`);
  }
  await writeFile(join(dir, 'day.csv'), `${lines.join('\n')}\n`);
  await writeFile(join(dir, 'day.defaults.json'), JSON.stringify({ marker: 'bright', model: 'steady' }));
});

afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('report of a real small batch', () => {
  it('shows every run with its charts and compares the directions correctly', async () => {
    const out = join(dir, 'out');
    const r = spawnSync(process.execPath, [bin, 'batch', 'day.csv', '--out', out, '--jobs', '2', '--quiet'], { cwd: dir, encoding: 'utf8' });
    expect(r.status, r.stderr).toBe(0);
    const rep = spawnSync(process.execPath, [bin, 'report', out, '--title', 'Real batch'], { encoding: 'utf8' });
    expect(rep.status, rep.stderr).toBe(0);
    const html = await readFile(join(out, 'report.html'), 'utf8');
    expect(html).toContain('<h1>Real batch</h1>');
    expect(html).toContain('&lt;b&gt;bench&lt;/b&gt; note');
    expect(html.match(/<figure class="chart"/g)?.length).toBe(3 + RUNS.length * 6);
    expect(html.match(/<img src="data:image\/png;base64,/g)?.length).toBe(RUNS.length);

    const data = await loadReportData(out);
    expect(data.runs.every((x) => x.record.status === 'ok' && x.angle !== null && x.rate !== null && x.track !== null)).toBe(true);
    const summary = buildComparison(data.runs);
    expect(summary.settings.map((s) => s.setting)).toEqual([1, 2]);
    for (const s of summary.settings) {
      // each run's true rate (the renderer's truth table) lies within the run's interval
      for (const run of [...s.forward.runs, ...s.reverse.runs]) {
        const t = truth.get(run.run)!;
        expect(run.ci_deg_s[0], run.run).toBeLessThanOrEqual(t);
        expect(run.ci_deg_s[1], run.run).toBeGreaterThanOrEqual(t);
      }
      // the reverse rotor clearly turns the other way, and the ratio interval holds the true ratio
      const c = s.comparison!;
      expect(c.p_opposite).toBeLessThan(0.05);
      const fwdTrue = s.forward.runs.reduce((a, x) => a + truth.get(x.run)!, 0) / s.forward.runs.length;
      const revTrue = s.reverse.runs.reduce((a, x) => a + truth.get(x.run)!, 0) / s.reverse.runs.length;
      expect(c.ratio.fieller.kind).toBe('bounded');
      expect(c.ratio.fieller.bounds[0]).toBeLessThanOrEqual(revTrue / fwdTrue);
      expect(c.ratio.fieller.bounds[1]).toBeGreaterThanOrEqual(revTrue / fwdTrue);
    }
  });
});
