// Speed of `fit` on an hour-long series (200,000 rows ≈ 55 min at 60 fps), as ratios against baselines run
// in the same script: reading the CSV alone, and one plain OLS pass over the same rows.
// Run: npm run build && node bench/fitSpeed.mjs
import { mkdtempSync, writeFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { readAngleTable } from '../dist/fit/readAngleTable.js';
import { fitAngleSeries } from '../dist/fit/fitAngleSeries.js';
import { linearLeastSquares } from '../dist/fit/linearLeastSquares.js';
import { simulateSteady } from './fitScenarios.mjs';

const n = 200_000;
const dir = mkdtempSync(join(tmpdir(), 'revtrace-fitspeed-'));
const path = join(dir, 'angle.csv');
const { t_s, angle_deg } = simulateSteady({ seed: 7, n, fps: 60, rate_deg_s: 2.5, white_deg: 0.3, ar_phi: 0.9, ar_sd_deg: 0.3, walk_deg_sqrt_s: 0.05, lost_share: 0.03 });
const lines = ['frame,t_s,angle_deg'];
for (let i = 0; i < t_s.length; i++) lines.push(`${i},${t_s[i].toFixed(6)},${angle_deg[i].toFixed(5)}`);
writeFileSync(path, lines.join('\n') + '\n');

async function time(label, fn, repeat = 3) {
  let best = Infinity;
  let out;
  for (let r = 0; r < repeat; r++) {
    const start = performance.now();
    out = await fn();
    best = Math.min(best, performance.now() - start);
  }
  return { label, ms: best, out };
}

const parse = await time('read CSV (baseline)', () => readAngleTable(path));
const table = parse.out;
const t = Float64Array.from(table.t_s, (v) => v - table.t_s[0]);
const ols = await time('plain OLS pass (baseline)', () => linearLeastSquares([new Float64Array(t.length).fill(1), t], table.angle_deg));
const steady = await time('fit --model steady (fit only)', () => fitAngleSeries(table, { model: 'steady' }));
const auto = await time('fit --model auto (fit only)', () => fitAngleSeries(table, { model: 'auto' }), 1);
const total = parse.ms + auto.ms;
console.log(`${t_s.length} rows (${(t_s[t_s.length - 1] / 60).toFixed(1)} min at 60 fps, 3% lost), best of 3 (auto: 1 run)`);
for (const r of [parse, ols, steady, auto]) {
  console.log(`${r.label.padEnd(34)} ${(r.ms / 1000).toFixed(3)} s  = ${(r.ms / parse.ms).toFixed(1)}× CSV read, ${(r.ms / ols.ms).toFixed(0)}× OLS pass`);
}
console.log(`read + fit --model auto: ${(total / 1000).toFixed(3)} s (target ≤ 2 s); chosen model: ${auto.out.report.model}`);
rmSync(dir, { recursive: true, force: true });
