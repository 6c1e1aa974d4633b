// Monte Carlo coverage of the spin-up intervals (τ and terminal rate, 95%) on synthetic series with
// autocorrelated noise, plus the cost of one fit. Run after `npm run build`:
//   node bench/spinUpCoverage.mjs [replicates=1000] [rho=0.8] [n=360]
// Invented test input: θ0 = 30°, onset 2 s, ω∞ = 90 deg/s, τ = 1.5 s, 30 frames/s, noise AR(1) with lag-1
// correlation rho and sd 1° plus white noise sd 0.3°. Seeded (pure-rand), so the figures are reproducible.
import { fitSpinUp } from '../dist/fit/spinUp.js';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';

const reps = Number(process.argv[2] ?? 1000);
const rho = Number(process.argv[3] ?? 0.8);
const n = Number(process.argv[4] ?? 360);
const rng = xoroshiro128plus(20261202);
const gauss = () => {
  const u = uniformFloat64(rng) || 1e-300;
  const v = uniformFloat64(rng);
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
};
const truth = { theta0: 30, onset: 2, rate: 90, tau: 1.5 };
let coverTau = 0;
let coverRate = 0;
let coverBoth = 0;
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
  const { result } = fitSpinUp(t, y, { seed: r + 1 });
  const inTau = result.tau_s.ci[0] <= truth.tau && truth.tau <= result.tau_s.ci[1];
  const inRate = result.terminal_rate_deg_s.ci[0] <= truth.rate && truth.rate <= result.terminal_rate_deg_s.ci[1];
  coverTau += inTau ? 1 : 0;
  coverRate += inRate ? 1 : 0;
  coverBoth += inTau && inRate ? 1 : 0;
  done++;
}
const ms = (performance.now() - started) / done;
const fmt = (k) => {
  const p = k / done;
  return `${(100 * p).toFixed(1)}% ± ${(100 * Math.sqrt((p * (1 - p)) / done)).toFixed(1)}% (binomial se)`;
};
console.log(`spin-up coverage, ${done} series of n = ${n}, noise AR(1) rho = ${rho} sd 1° + white 0.3°`);
console.log(`  tau_s 95% interval:               ${fmt(coverTau)}`);
console.log(`  terminal_rate_deg_s 95% interval: ${fmt(coverRate)}`);
console.log(`  both:                             ${fmt(coverBoth)}`);
console.log(`  mean time per fit (199 bootstrap-t replicates): ${ms.toFixed(0)} ms`);
