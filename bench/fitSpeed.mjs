// Speed of `fit` on an hour-long series (200,000 rows ≈ 55 min at 60 fps), as ratios against baselines run
// in the same process: reading the CSV alone, and one plain OLS pass over the same rows (each best of 3).
// Run: npm run build && node bench/fitSpeed.mjs [rounds=5]
// Each round is a fresh Node process (as a `revtrace fit` run is), so the first `fit --model auto` in it is
// cold (code not yet optimised) like the command's; the same process then repeats it warm. Reported: the
// median over rounds of wall and CPU time (CPU = this process, all threads), and the load average.
import { mkdtempSync, writeFileSync, rmSync } from 'node:fs';
import { execFileSync } from 'node:child_process';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { readAngleTable } from '../dist/fit/readAngleTable.js';
import { fitAngleSeries } from '../dist/fit/fitAngleSeries.js';
import { linearLeastSquares } from '../dist/fit/linearLeastSquares.js';
import { simulateSteady } from './fitScenarios.mjs';

/** Wall and CPU milliseconds of fn() (awaited). */
async function measure(fn) {
  const cpu0 = process.cpuUsage();
  const start = performance.now();
  const out = await fn();
  const wall_ms = performance.now() - start;
  const cpu = process.cpuUsage(cpu0);
  return { wall_ms, cpu_ms: (cpu.user + cpu.system) / 1000, out };
}

if (process.argv[2] === '--child') {
  const path = process.argv[3];
  const best = async (first, fn) => {
    let b = first;
    for (let r = 0; r < 2; r++) {
      const m = await measure(fn);
      if (m.wall_ms < b.wall_ms) b = m;
    }
    return b;
  };
  const readCold = await measure(() => readAngleTable(path));
  const table = readCold.out;
  const read = await best(readCold, () => readAngleTable(path));
  const t = Float64Array.from(table.t_s, (v) => v - table.t_s[0]);
  const ones = new Float64Array(t.length).fill(1);
  const ols = await best(await measure(() => linearLeastSquares([ones, t], table.angle_deg)), () => linearLeastSquares([ones, t], table.angle_deg));
  const autoCold = await measure(() => fitAngleSeries(table, { model: 'auto' }));
  const autoWarm = await measure(() => fitAngleSeries(table, { model: 'auto' }));
  const steadyWarm = await measure(() => fitAngleSeries(table, { model: 'steady' }));
  const row = (m) => ({ wall_ms: m.wall_ms, cpu_ms: m.cpu_ms });
  console.log(JSON.stringify({ rows: t.length, model: autoCold.out.report.model, readCold: row(readCold), read: row(read), ols: row(ols), autoCold: row(autoCold), autoWarm: row(autoWarm), steadyWarm: row(steadyWarm) }));
  process.exit(0);
}

const rounds = Number(process.argv[2] ?? 5);
const n = 200_000;
const dir = mkdtempSync(join(tmpdir(), 'revtrace-fitspeed-'));
const path = join(dir, 'angle.csv');
const { t_s, angle_deg } = simulateSteady({ seed: 7, n, fps: 60, rate_deg_s: 2.5, white_deg: 0.3, ar_phi: 0.9, ar_sd_deg: 0.3, walk_deg_sqrt_s: 0.05, lost_share: 0.03 });
const lines = ['frame,t_s,angle_deg'];
for (let i = 0; i < t_s.length; i++) lines.push(`${i},${t_s[i].toFixed(6)},${angle_deg[i].toFixed(5)}`);
writeFileSync(path, lines.join('\n') + '\n');

const load0 = loadavg();
const results = [];
for (let r = 0; r < rounds; r++) {
  const out = execFileSync(process.execPath, [fileURLToPath(import.meta.url), '--child', path], { encoding: 'utf8' });
  results.push(JSON.parse(out.trim().split('\n').pop()));
}
const load1 = loadavg();
rmSync(dir, { recursive: true, force: true });

const median = (xs) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};
const med = (key, field) => median(results.map((r) => r[key][field]));
const total = (field) => median(results.map((r) => r.readCold[field] + r.autoCold[field]));
console.log(`${results[0].rows} rows (${(t_s[t_s.length - 1] / 60).toFixed(1)} min at 60 fps, 3% lost); chosen model ${results[0].model}`);
console.log(`${rounds} rounds, each a fresh process; medians. Load average ${load0.map((v) => v.toFixed(1)).join(' / ')} before, ${load1.map((v) => v.toFixed(1)).join(' / ')} after (1/5/15 min)`);
console.log('step                                   wall s   CPU s   wall × CSV read   wall × OLS pass   CPU × CSV read');
const show = (label, wall, cpu) =>
  console.log(`${label.padEnd(38)} ${(wall / 1000).toFixed(3).padStart(6)}  ${(cpu / 1000).toFixed(3).padStart(6)}   ${(wall / med('read', 'wall_ms')).toFixed(2).padStart(15)}   ${(wall / med('ols', 'wall_ms')).toFixed(1).padStart(15)}   ${(cpu / med('read', 'cpu_ms')).toFixed(2).padStart(14)}`);
show('read CSV (baseline, best of 3)', med('read', 'wall_ms'), med('read', 'cpu_ms'));
show('plain OLS pass (baseline, best of 3)', med('ols', 'wall_ms'), med('ols', 'cpu_ms'));
show('read CSV, first call (cold)', med('readCold', 'wall_ms'), med('readCold', 'cpu_ms'));
show('fit --model auto, first call (cold)', med('autoCold', 'wall_ms'), med('autoCold', 'cpu_ms'));
show('fit --model auto, repeated (warm)', med('autoWarm', 'wall_ms'), med('autoWarm', 'cpu_ms'));
show('fit --model steady, repeated (warm)', med('steadyWarm', 'wall_ms'), med('steadyWarm', 'cpu_ms'));
show('read + fit --model auto (both cold)', total('wall_ms'), total('cpu_ms'));
console.log(`read + fit --model auto (both cold) per round, wall s: ${results.map((r) => ((r.readCold.wall_ms + r.autoCold.wall_ms) / 1000).toFixed(3)).join(', ')} (target ≤ 2 s)`);
