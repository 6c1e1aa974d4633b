// Coverage of the steady-rate interval under five noise scenarios (seeded Monte Carlo), beside the
// coverage of a naive least-squares interval; and the white-noise variance against the Cramér–Rao bound.
// Run: npm run build && node bench/fitCoverage.mjs [replicates=1000] [seconds=60] [seed offset=0]
// (a non-zero offset moves every seed, to check that the figures are not an artefact of one seed set)
import { fitSteadyRate } from '../dist/fit/steadyRate.js';
import { linearLeastSquares } from '../dist/fit/linearLeastSquares.js';
import { simulateSteady, normalSource, SCENARIOS, SMALL_WANDER_SCENARIOS } from './fitScenarios.mjs';
import jstatModule from 'jstat';

const { jStat } = jstatModule;
const reps = Number(process.argv[2] ?? 1000);
const seconds = Number(process.argv[3] ?? 60);
const offset = Number(process.argv[4] ?? 0);
const fps = 60;
const n = Math.round(seconds * fps);
const rate = 0.8;

console.log(`steady-rate coverage, ${reps} replicates per scenario, ${n} frames (${seconds} s at ${fps} fps), true rate ${rate} deg/s, nominal 95%, seed offset ${offset}`);
console.log('scenario | coverage | allowing for hidden wander (median half-width ratio) | naive OLS coverage | mean se / sd of estimate | share with a walk part | median df (jackknife alone) | segment test p < 0.05 | p < 0.01 | ms per fit | coverage of fits with / without a walk part');
for (const [si, sc] of [...SCENARIOS, ...SMALL_WANDER_SCENARIOS].entries()) {
  let cover = 0;
  let coverWander = 0;
  const widen = [];
  let coverNaive = 0;
  let integrated = 0;
  let integratedCover = 0;
  const est = [];
  let seSum = 0;
  let seg05 = 0;
  let seg01 = 0;
  const dfs = [];
  const jackDfs = [];
  const started = performance.now();
  for (let r = 0; r < reps; r++) {
    const { t_s, angle_deg } = simulateSteady({ seed: 1000 * si + r + 1 + offset, n, fps, t0_s: 3600, rate_deg_s: rate, ...sc.noise });
    const fit = fitSteadyRate(t_s, angle_deg, { level: 0.95 });
    const e = fit.result.rate_deg_s;
    const covers = e.ci[0] <= rate && rate <= e.ci[1];
    if (covers) cover++;
    const w = fit.result.wander_allowance.rate_deg_s;
    if (w.ci[0] <= rate && rate <= w.ci[1]) coverWander++;
    widen.push((w.ci[1] - w.ci[0]) / (e.ci[1] - e.ci[0]));
    if (fit.noise.walk_deg2_per_s > 0) {
      integrated++;
      if (covers) integratedCover++;
    }
    dfs.push(fit.df);
    jackDfs.push(fit.jackknife_df);
    est.push(e.value);
    if (fit.segment_p_value !== null && fit.segment_p_value < 0.05) seg05++;
    if (fit.segment_p_value !== null && fit.segment_p_value < 0.01) seg01++;
    seSum += e.se;
    const t = Float64Array.from(t_s, (v) => v - t_s[0]);
    const ols = linearLeastSquares([new Float64Array(t.length).fill(1), t], angle_deg);
    const half = jStat.studentt.inv(0.975, ols.df) * ols.se[1];
    if (Math.abs(ols.coefficients[1] - rate) <= half) coverNaive++;
  }
  const mean = est.reduce((a, b) => a + b, 0) / reps;
  const sd = Math.sqrt(est.reduce((a, b) => a + (b - mean) ** 2, 0) / (reps - 1));
  const ms = (performance.now() - started) / reps;
  const median = (a) => a.sort((x, y) => x - y)[Math.floor(a.length / 2)];
  const share = (k, of) => (of > 0 ? `${((100 * k) / of).toFixed(1)}%` : '–');
  console.log(
    `${sc.name} | ${(100 * cover / reps).toFixed(1)}% | ${(100 * coverWander / reps).toFixed(1)}% (${median(widen).toFixed(2)}) | ${(100 * coverNaive / reps).toFixed(1)}% | ${(seSum / reps / sd).toFixed(3)} | ${(100 * integrated / reps).toFixed(0)}% | ${median(dfs).toFixed(1)} (${median(jackDfs).toFixed(1)}) | ${(100 * seg05 / reps).toFixed(1)}% | ${(100 * seg01 / reps).toFixed(1)}% | ${ms.toFixed(1)} ms/fit | ${share(integratedCover, integrated)} / ${share(cover - integratedCover, reps - integrated)}`,
  );
}

// Cramér–Rao check (white noise): the OLS slope variance σ²/Σ(t − t̄)² is the bound for Gaussian white noise.
{
  const sigma = SCENARIOS[0].noise.white_deg;
  const est = [];
  let stt = 0;
  for (let r = 0; r < reps; r++) {
    const { t_s, angle_deg } = simulateSteady({ seed: 900000 + r + offset, n, fps, rate_deg_s: rate, white_deg: sigma });
    est.push(fitSteadyRate(t_s, angle_deg).result.rate_deg_s.value);
    if (r === 0) {
      const mt = t_s.reduce((a, b) => a + b, 0) / t_s.length;
      stt = t_s.reduce((a, b) => a + (b - mt) ** 2, 0);
    }
  }
  const mean = est.reduce((a, b) => a + b, 0) / reps;
  const variance = est.reduce((a, b) => a + (b - mean) ** 2, 0) / (reps - 1);
  const bound = (sigma * sigma) / stt;
  console.log(`white noise: estimator variance / Cramér–Rao bound = ${(variance / bound).toFixed(3)} (${reps} replicates; sampling sd of this ratio ≈ ${Math.sqrt(2 / (reps - 1)).toFixed(3)})`);
}

// Segment homogeneity test on short footage-like series (8 s at 30 fps, −2.6 deg/s; white 0.03° + AR(1)
// φ = 0.7, SD 0.02° + a 2.5 Hz flicker error of 0.02° with random phase): false alarms when steady, and
// the share flagged when the rate steps at t = 4 s.
{
  console.log('segment test, footage-like series (240 frames): rate step deg/s | share p < 0.05 | share p < 0.01');
  for (const step of [0, 0.1, 0.2, 0.3]) {
    let b05 = 0;
    let b01 = 0;
    for (let r = 0; r < reps; r++) {
      const seed = 700000 + r + offset;
      const { t_s, angle_deg } = simulateSteady({ seed, n: 240, fps: 30, rate_deg_s: -2.6, white_deg: 0.03, ar_phi: 0.7, ar_sd_deg: 0.02 });
      const phase = 3 * normalSource(seed + 99)();
      const a = Float64Array.from(angle_deg, (v, i) => v + 0.02 * Math.sin(2 * Math.PI * 2.5 * t_s[i] + phase) + (t_s[i] > 4 ? step * (t_s[i] - 4) : 0));
      const p = fitSteadyRate(t_s, a).segment_p_value;
      if (p < 0.05) b05++;
      if (p < 0.01) b01++;
    }
    console.log(`${step} | ${(100 * b05 / reps).toFixed(1)}% | ${(100 * b01 / reps).toFixed(1)}%`);
  }
}
