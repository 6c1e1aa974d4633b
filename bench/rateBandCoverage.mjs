// Coverage of the pointwise 95% band of rate.csv on seeded steady series (true rate 120 deg/s, 30 fps):
// the band from smoothRate alone (residual-based inflation) against the band fitAngleSeries gives a steady
// run (the steady fit's noise model, exact variance of each rate). Run after `npm run build`:
//   node bench/rateBandCoverage.mjs [series per case, default 200] [frames per series, default 90]
import { fitAngleSeries } from '../dist/fit/fitAngleSeries.js';
import { smoothRate } from '../dist/signal/smoothRate.js';
import { simulateSteady } from './fitScenarios.mjs';

const N = Number(process.argv[2] ?? 200);
const n = Number(process.argv[3] ?? 90);
const cases = [
  ['white 0.05°', { white_deg: 0.05 }],
  ['AR(1) φ 0.7, 0.03° + white 0.02°', { white_deg: 0.02, ar_phi: 0.7, ar_sd_deg: 0.03 }],
  ['AR(1) φ 0.95, 0.5°', { ar_phi: 0.95, ar_sd_deg: 0.5 }],
  ['walk 0.3 deg/√s + white 0.05°', { white_deg: 0.05, walk_deg_sqrt_s: 0.3 }],
];
console.log(`${N} series of ${n} frames per case`);
for (const [name, noise] of cases) {
  let inA = 0, inB = 0, total = 0, wA = 0, wB = 0;
  for (let seed = 1; seed <= N; seed++) {
    const s = simulateSteady({ seed, n, fps: 30, rate_deg_s: 120, ...noise });
    const t = Float64Array.from(s.t_s);
    const y = Float64Array.from(s.angle_deg);
    const a = smoothRate(t, y);
    const b = fitAngleSeries({ t_s: t, angle_deg: y }, { model: 'steady' }).rate;
    for (let i = 0; i < a.t_s.length; i++) { total++; if (a.lo_deg_s[i] <= 120 && 120 <= a.hi_deg_s[i]) inA++; wA += a.hi_deg_s[i] - a.lo_deg_s[i]; }
    for (let i = 0; i < b.t_s.length; i++) { if (b.lo_deg_s[i] <= 120 && 120 <= b.hi_deg_s[i]) inB++; wB += b.hi_deg_s[i] - b.lo_deg_s[i]; }
  }
  console.log(`${name.padEnd(34)} residual-based ${(100 * inA / total).toFixed(1)}%   noise model ${(100 * inB / total).toFixed(1)}%   width ratio ${(wB / wA).toFixed(2)}`);
}
