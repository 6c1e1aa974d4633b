// Seeded synthetic angle series with known true rate for the steady-fit coverage checks
// (invented numbers: a slow rotor filmed at 60 fps; every noise term named and off by default).
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';

/** A seeded standard-normal generator (Box–Muller on xoroshiro128+). */
export function normalSource(seed) {
  const rng = xoroshiro128plus(seed);
  let spare = null;
  return () => {
    if (spare !== null) {
      const s = spare;
      spare = null;
      return s;
    }
    let u = 0;
    while (u === 0) u = uniformFloat64(rng);
    const v = uniformFloat64(rng);
    const r = Math.sqrt(-2 * Math.log(u));
    spare = r * Math.sin(2 * Math.PI * v);
    return r * Math.cos(2 * Math.PI * v);
  };
}

/**
 * angle(t_k) = rate·t_k + white + AR(1) + random walk, t_k = t0 + k/fps; then frames lost at random.
 * @param {{seed:number, n:number, fps?:number, t0_s?:number, rate_deg_s:number, white_deg?:number,
 *   ar_phi?:number, ar_sd_deg?:number, walk_deg_sqrt_s?:number, lost_share?:number}} o
 *   walk_deg_sqrt_s: the rate fluctuates (white, around its mean), so the angle does a random walk with
 *   this diffusion (deg/√s); ar_sd_deg: marginal SD of the AR(1) angle noise.
 */
export function simulateSteady(o) {
  const normal = normalSource(o.seed);
  const fps = o.fps ?? 60;
  const dt = 1 / fps;
  const t0 = o.t0_s ?? 0;
  const phi = o.ar_phi ?? 0;
  const arSd = o.ar_sd_deg ?? 0;
  const innov = arSd * Math.sqrt(1 - phi * phi);
  let ar = arSd * normal();
  let walk = 0;
  const keepT = [];
  const keepA = [];
  for (let k = 0; k < o.n; k++) {
    if (k > 0) {
      ar = phi * ar + innov * normal();
      walk += (o.walk_deg_sqrt_s ?? 0) * Math.sqrt(dt) * normal();
    }
    const white = (o.white_deg ?? 0) * normal();
    keepT.push(t0 + k * dt);
    keepA.push(o.rate_deg_s * k * dt + white + ar + walk);
  }
  if ((o.lost_share ?? 0) > 0) {
    const t = [];
    const a = [];
    const lostNormal = normalSource(o.seed * 7919 + 17);
    // a frame is lost when a standard normal exceeds the (1 − share) quantile: an independent Bernoulli draw
    const cut = inverseNormal(1 - o.lost_share);
    for (let k = 0; k < keepT.length; k++) {
      if (lostNormal() > cut) continue;
      t.push(keepT[k]);
      a.push(keepA[k]);
    }
    return { t_s: Float64Array.from(t), angle_deg: Float64Array.from(a) };
  }
  return { t_s: Float64Array.from(keepT), angle_deg: Float64Array.from(keepA) };
}

/** Standard-normal quantile (Acklam's rational approximation, relative error < 1.2e-9). */
function inverseNormal(p) {
  const a = [-39.69683028665376, 220.9460984245205, -275.9285104469687, 138.357751867269, -30.66479806614716, 2.506628274631];
  const b = [-54.47609879822406, 161.5858368580409, -155.6989798598866, 66.80131188771972, -13.28068155288572];
  const c = [-0.007784894002430293, -0.3223964580411365, -2.400758277161838, -2.549732539343734, 4.374664141464968, 2.938163982698783];
  const d = [0.007784695709041462, 0.3224671290700398, 2.445134137142996, 3.754408661907416];
  const pl = 0.02425;
  if (p < pl) {
    const q = Math.sqrt(-2 * Math.log(p));
    return (((((c[0] * q + c[1]) * q + c[2]) * q + c[3]) * q + c[4]) * q + c[5]) / ((((d[0] * q + d[1]) * q + d[2]) * q + d[3]) * q + 1);
  }
  if (p > 1 - pl) return -inverseNormal(1 - p);
  const q = p - 0.5;
  const r = q * q;
  return ((((((a[0] * r + a[1]) * r + a[2]) * r + a[3]) * r + a[4]) * r + a[5]) * q) / (((((b[0] * r + b[1]) * r + b[2]) * r + b[3]) * r + b[4]) * r + 1);
}

/** The five coverage scenarios (invented rig: a slow rotor at 0.8 deg/s, 60 fps). */
export const SCENARIOS = [
  { name: 'white angle noise', noise: { white_deg: 0.5 } },
  { name: 'AR(1) noise, phi = 0.95', noise: { ar_phi: 0.95, ar_sd_deg: 0.5 } },
  { name: 'random-walk rate fluctuation', noise: { white_deg: 0.05, walk_deg_sqrt_s: 0.3 } },
  { name: 'AR(1) + random walk', noise: { ar_phi: 0.95, ar_sd_deg: 0.5, walk_deg_sqrt_s: 0.3 } },
  { name: 'AR(1) + random walk, 3% frames lost', noise: { ar_phi: 0.95, ar_sd_deg: 0.5, walk_deg_sqrt_s: 0.3, lost_share: 0.03 } },
];

/**
 * Rate wander between "none" and the large walk above: too small for one 60 s window to detect reliably,
 * large enough to matter for the slope (invented rig, same rotor).
 */
export const SMALL_WANDER_SCENARIOS = [
  { name: 'white + small walk 0.01', noise: { white_deg: 0.5, walk_deg_sqrt_s: 0.01 } },
  { name: 'white + small walk 0.02', noise: { white_deg: 0.5, walk_deg_sqrt_s: 0.02 } },
  { name: 'AR(1) + small walk 0.05', noise: { ar_phi: 0.95, ar_sd_deg: 0.5, walk_deg_sqrt_s: 0.05 } },
  { name: 'AR(1) + small walk 0.09', noise: { ar_phi: 0.95, ar_sd_deg: 0.5, walk_deg_sqrt_s: 0.09 } },
];
