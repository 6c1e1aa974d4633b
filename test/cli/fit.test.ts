import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { simulateSteady } from '../../bench/fitScenarios.mjs';

// Spawns the built CLI (run `npm run build` first, as `npm test` does).
const bin = fileURLToPath(new URL('../../bin/revtrace', import.meta.url));
const dir = mkdtempSync(join(tmpdir(), 'revtrace-cli-fit-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function run(args: string[]): { status: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [bin, ...args], { encoding: 'utf8' });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

let anglePath = '';
beforeAll(() => {
  // invented reverse-flow run: the rotor creeps at −0.25 deg/s, 20 s at 30 fps, every 25th frame lost
  const { t_s, angle_deg } = simulateSteady({ seed: 8, n: 600, fps: 30, t0_s: 2, rate_deg_s: -0.25, white_deg: 0.15, ar_phi: 0.8, ar_sd_deg: 0.2 });
  const lines = ['frame,t_s,angle_deg,flag'];
  for (let i = 0; i < t_s.length; i++) lines.push(`${i},${t_s[i]!.toFixed(6)},${i % 25 === 3 ? '' : angle_deg[i]!.toFixed(5)},${i % 25 === 3 ? 'lost:gate' : ''}`);
  anglePath = join(dir, 'angle.csv');
  writeFileSync(anglePath, lines.join('\n') + '\n');
});

describe('revtrace fit', () => {
  it('writes fit.json and rate.csv and prints the rate with its interval', () => {
    const out = join(dir, 'run', 'fit.json');
    const r = run(['fit', anglePath, '--out', out, '--margin', '0.5', '--level', '0.9']);
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    const report = JSON.parse(readFileSync(out, 'utf8'));
    expect(report.model).toBe('steady');
    const rate = report.steady.rate_deg_s as { value: number; ci: [number, number]; level: number };
    expect(rate.level).toBe(0.9);
    // Truth: −0.25 deg/s, the rate given to the seeded simulator (bench/fitScenarios.mjs, our own, known by
    // construction). Interval coverage is checked over many seeds in test/fit and bench/; here one run only has
    // to land near the truth (0.05 deg/s is many standard errors for 576 frames) with its interval around it.
    expect(Math.abs(rate.value - -0.25)).toBeLessThan(0.05);
    expect(rate.ci[0]).toBeLessThan(rate.value);
    expect(rate.ci[1]).toBeGreaterThan(rate.value);
    // the printed line shows the numbers written to fit.json
    const printed = /rate (-?\d+\.\d+) deg\/s \(90% CI (-?\d+\.\d+) to (-?\d+\.\d+)\)/.exec(r.stdout);
    expect(printed, r.stdout).not.toBeNull();
    expect(Number(printed![1])).toBeCloseTo(rate.value, 3);
    expect(Number(printed![2])).toBeCloseTo(rate.ci[0], 3);
    expect(Number(printed![3])).toBeCloseTo(rate.ci[1], 3);
    expect(report.steady.zero_test.margin_deg_s).toBe(0.5);
    // p-values read the same on every line: two significant digits, or "< 0.001" (never "0.00" or "2.49e-9")
    expect(r.stdout).toMatch(/differs from zero: p (< 0\.001|= 0\.\d\d+);/);
    expect(r.stdout).toMatch(/\(TOST p (< 0\.001|= 0\.\d\d+)\)/);
    expect(report.diagnostics.lost_share).toBeCloseTo(24 / 600, 3); // frames i ≡ 3 (mod 25) of 600 were written blank: 24
    expect(existsSync(join(dir, 'run', 'rate.csv'))).toBe(true);
  });

  const bad: [string, string[], RegExp][] = [
    ['a window after the data', ['--from', '100', '--to', '200'], /^revtrace: --from 100 s is at or after the last row/],
    ['a start after the data without an end', ['--from', '100'], /^revtrace: --from 100 s is at or after the last row/],
    ['a level of 95', ['--level', '95'], /--level must lie between 0 and 1/],
    ['a non-numeric --from', ['--from', 'abc'], /--from must be a number/],
    ['an unknown model', ['--model', 'linear'], /--model must be steady, spinup, spindown or auto/],
  ];
  for (const [what, extra, message] of bad) {
    it(`exits 2 with one sentence and writes nothing for ${what}`, () => {
      const out = join(dir, `bad-${what.replace(/\W+/g, '-')}`, 'fit.json');
      const r = run(['fit', anglePath, '--out', out, ...extra]);
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(message);
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
      expect(r.stderr).not.toMatch(/\n\s+at /);
      expect(existsSync(out)).toBe(false);
    });
  }

  it('never writes over the angle table it reads, and refuses a folder as --out, before any work', () => {
    const own = join(dir, 'own');
    mkdirSync(own);
    const table = readFileSync(anglePath, 'utf8');
    for (const name of ['angle.csv', 'rate.csv']) writeFileSync(join(own, name), table);
    const cases: [string, RegExp][] = [
      [join(own, 'angle.csv'), /is the angle table being fitted and would be written over; choose another --out/],
      [join(own, 'fit.json'), /puts rate\.csv over the angle table being fitted/], // when the table read is own/rate.csv
      [own, /is a folder; give the file to write, e\.g\. --out .*own\/fit\.json$/],
    ];
    for (const [i, [out, message]] of cases.entries()) {
      const input = i === 1 ? join(own, 'rate.csv') : join(own, 'angle.csv');
      const r = run(['fit', input, '--out', out]);
      expect(r.status, out).toBe(2);
      expect(r.stderr.trim(), out).toMatch(new RegExp(`^revtrace: --out .*${message.source}`));
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
    }
    for (const name of ['angle.csv', 'rate.csv']) expect(readFileSync(join(own, name), 'utf8')).toBe(table);
    expect(existsSync(join(own, 'fit.json'))).toBe(false);
  });

  it('notes a window reaching past the data, and fits the data there is', () => {
    const out = join(dir, 'wide', 'fit.json');
    const r = run(['fit', anglePath, '--out', out, '--from', '-1', '--to', '500']);
    expect(r.status).toBe(0);
    expect(r.stderr).toBe('note: --from -1 s is before the first row (2 s); the window starts there\nnote: --to 500 s is past the last row (21.966667 s); the window ends there\n');
  });

  it('exits 2 for a table without an angle_deg column', () => {
    const p = join(dir, 'noangle.csv');
    writeFileSync(p, 't_s,theta\n' + Array.from({ length: 20 }, (_, i) => `${i},${i}`).join('\n'));
    const r = run(['fit', p, '--out', join(dir, 'x', 'fit.json')]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/^revtrace: .*no angle_deg column/);
  });
});
