// Monte Carlo coverage of the spin-up intervals (τ and terminal rate, 95%) on synthetic series with
// autocorrelated noise, plus the cost of one fit. Run after `npm run build`:
//   node bench/spinUpCoverage.mjs [replicates=1000] [rho=0.8] [n=360] [set=1]
// `set` picks an independent seed set: set 1 draws the series from seed 20261202 and bootstraps replicate r
// with seed r + 1; set k draws from seed 20261202 + k − 1 and bootstraps with seed 1e6·(k − 1) + r + 1.
//   node bench/spinUpCoverage.mjs --speed     (200,000-row series: fit times as ratios to a baseline)
// Invented test input: θ0 = 30°, onset 2 s, ω∞ = 90 deg/s, τ = 1.5 s, 30 frames/s, noise AR(1) with lag-1
// correlation rho and sd 1° plus white noise sd 0.3°. Seeded (pure-rand), so the figures are reproducible.
import { fitSpinUp } from '../dist/fit/spinUp.js';
import { fitCoastDown } from '../dist/fit/coastDown.js';
import { fitAngleSeries } from '../dist/fit/fitAngleSeries.js';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';

if (process.argv[2] === '--speed') {
  // 200,000 rows at 240 frames/s of a spin-up with AR(1) noise (invented input). Baseline: one ordinary
  // least-squares line through the same rows (a single pass), timed in the same process.
  const n = 200000;
  const t = new Float64Array(n);
  const y = new Float64Array(n);
  let ar = 0;
  let s = 1;
  const uniform = () => ((s = (s * 16807) % 2147483647), s / 2147483647 - 0.5);
  for (let i = 0; i < n; i++) {
    t[i] = i / 240;
    const d = t[i] - 2;
    ar = 0.8 * ar + uniform();
    y[i] = (d > 0 ? 30 + 90 * (d - 1.5 * (1 - Math.exp(-d / 1.5))) : 30) + ar;
  }
  const cpu = (f) => {
    const c = process.cpuUsage();
    const w = performance.now();
    f();
    const u = process.cpuUsage(c);
    return { cpu_ms: (u.user + u.system) / 1000, wall_ms: performance.now() - w };
  };
  const line = () => {
    let st = 0, sy = 0, stt = 0, sty = 0;
    for (let i = 0; i < n; i++) { st += t[i]; sy += y[i]; stt += t[i] * t[i]; sty += t[i] * y[i]; }
    return (n * sty - st * sy) / (n * stt - st * st);
  };
  for (let round = 0; round < 2; round++) {
    const base = cpu(() => { for (let r = 0; r < 10; r++) line(); });
    const baseMs = base.cpu_ms / 10;
    const su = cpu(() => fitSpinUp(t, y));
    const cd = cpu(() => fitCoastDown(t, y));
    const auto = cpu(() => fitAngleSeries({ t_s: t, angle_deg: y }, { model: 'auto' }));
    console.log(`round ${round + 1} (${round === 0 ? 'cold' : 'warm'}): baseline line fit ${baseMs.toFixed(2)} ms CPU`);
    for (const [name, m] of [['fitSpinUp', su], ['fitCoastDown', cd], ['fitAngleSeries auto', auto]]) {
      console.log(`  ${name}: ${m.cpu_ms.toFixed(0)} ms CPU (${(m.cpu_ms / baseMs).toFixed(0)}× baseline), ${m.wall_ms.toFixed(0)} ms wall`);
    }
  }
  process.exit(0);
}

const reps = Number(process.argv[2] ?? 1000);
const rho = Number(process.argv[3] ?? 0.8);
const n = Number(process.argv[4] ?? 360);
const set = Number(process.argv[5] ?? 1);
const rng = xoroshiro128plus(20261202 + set - 1);
const gauss = () => {
  const u = uniformFloat64(rng) || 1e-300;
  const v = uniformFloat64(rng);
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
};
const truth = { theta0: 30, onset: 2, rate: 90, tau: 1.5 };
let coverTau = 0;
let coverRate = 0;
let coverBoth = 0;
const missed = { tauLow: 0, tauHigh: 0, rateLow: 0, rateHigh: 0 };
let done = 0;
const started = performance.now();
for (let r = 0; r < reps; r++) {
  const t = new Float64Array(n);
  const y = new Float64Array(n);
  let ar = 0;
  for (let i = 0; i < n; i++) {
    t[i] = i / 30;
    const d = t[i] - truth.onset;
    const angle = d > 0 ? truth.theta0 + truth.rate * (d - truth.tau * (1 - Math.exp(-d / truth.tau))) : truth.theta0;
    ar = rho * ar + Math.sqrt(1 - rho * rho) * gauss();
    y[i] = angle + ar + 0.3 * gauss();
  }
  const { result } = fitSpinUp(t, y, { seed: 1e6 * (set - 1) + r + 1 });
  const inTau = result.tau_s.ci[0] <= truth.tau && truth.tau <= result.tau_s.ci[1];
  const inRate = result.terminal_rate_deg_s.ci[0] <= truth.rate && truth.rate <= result.terminal_rate_deg_s.ci[1];
  coverTau += inTau ? 1 : 0;
  coverRate += inRate ? 1 : 0;
  coverBoth += inTau && inRate ? 1 : 0;
  if (result.tau_s.ci[1] < truth.tau) missed.tauLow++;
  if (result.tau_s.ci[0] > truth.tau) missed.tauHigh++;
  if (result.terminal_rate_deg_s.ci[1] < truth.rate) missed.rateLow++;
  if (result.terminal_rate_deg_s.ci[0] > truth.rate) missed.rateHigh++;
  done++;
}
const ms = (performance.now() - started) / done;
const fmt = (k) => {
  const p = k / done;
  return `${(100 * p).toFixed(1)}% ± ${(100 * Math.sqrt((p * (1 - p)) / done)).toFixed(1)}% (binomial se)`;
};
console.log(`spin-up coverage, ${done} series of n = ${n}, noise AR(1) rho = ${rho} sd 1° + white 0.3°, seed set ${set}`);
console.log(`  tau_s 95% interval:               ${fmt(coverTau)}; missed below ${missed.tauLow}, above ${missed.tauHigh}`);
console.log(`  terminal_rate_deg_s 95% interval: ${fmt(coverRate)}; missed below ${missed.rateLow}, above ${missed.rateHigh}`);
console.log(`  both:                             ${fmt(coverBoth)}`);
console.log(`  mean time per fit (199 bootstrap-t replicates): ${ms.toFixed(0)} ms`);
