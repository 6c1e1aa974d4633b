import type { Affine2d } from './affine2d.js';
import { applyAffine, invertAffine } from './affine2d.js';
import { profileAngle } from './rotationProfile.js';
import type { SynthMarker, SynthSpec } from './SynthSpec.js';
import { seededRandom } from './seededRandom.js';
import { rotorToScene } from './viewTransform.js';

/** Random stream number reserved for particles. */
const PARTICLE_STREAM = 404;
/** Points on a marker's outline used to measure its distance to a particle. */
const OUTLINE_POINTS = 96;

/** A particle drifting in a straight line through the scene: at t_s it is at (x, y) + velocity·(t_s − t_ref_s). */
export interface Particle {
  x_px: number;
  y_px: number;
  t_ref_s: number;
  vx_px_s: number;
  vy_px_s: number;
  radius_px: number;
}

/** Rotor-plane centre (u, v) of a marker at rotor angle angle_deg (v up, CCW positive). */
export function markerPlaneCentre(marker: SynthMarker, angle_deg: number): { u: number; v: number } {
  const a = ((angle_deg + marker.phase_deg) * Math.PI) / 180;
  return { u: marker.radius_px * Math.cos(a), v: marker.radius_px * Math.sin(a) };
}

/** Scene position of a particle at t_s. */
export function particleAt(p: Particle, t_s: number): { x: number; y: number } {
  return { x: p.x_px + p.vx_px_s * (t_s - p.t_ref_s), y: p.y_px + p.vy_px_s * (t_s - p.t_ref_s) };
}

/**
 * Whether a particle disc (scene px) overlaps a marker disc painted on the rotor (seen as an ellipse
 * under an oblique view): the particle centre lies inside the marker, or within its radius of the
 * marker's outline (sampled at OUTLINE_POINTS points).
 */
export function particleOverMarker(toScene: Affine2d, toPlane: Affine2d, marker: SynthMarker, angle_deg: number, px: number, py: number, radius_px: number): boolean {
  const m = markerPlaneCentre(marker, angle_deg);
  const q = applyAffine(toPlane, px, py);
  if ((q.x - m.u) ** 2 + (q.y - m.v) ** 2 <= marker.size_px ** 2) return true;
  const centre = applyAffine(toScene, m.u, m.v);
  const reach = marker.size_px + radius_px;
  if ((centre.x - px) ** 2 + (centre.y - py) ** 2 > reach * reach) return false;
  for (let k = 0; k < OUTLINE_POINTS; k++) {
    const a = (2 * Math.PI * k) / OUTLINE_POINTS;
    const b = applyAffine(toScene, m.u + marker.size_px * Math.cos(a), m.v + marker.size_px * Math.sin(a));
    if ((b.x - px) ** 2 + (b.y - py) ** 2 < radius_px * radius_px) return true;
  }
  return false;
}

/**
 * Plans drifting particles so that about `share` of the frames have one over a marker: each new particle
 * is aimed through a marker's position at a frame that is still clear, in a random direction at about
 * speed_px_s, until the covered frames reach the share. Seeded, so the same spec gives the same plan.
 * @param times_s frame times of the clip, seconds
 */
export function planParticles(spec: SynthSpec, times_s: Float64Array): Particle[] {
  const { share, size_px, speed_px_s } = spec.realism.particles;
  if (share <= 0 || times_s.length === 0) return [];
  const random = seededRandom(spec.seed, PARTICLE_STREAM);
  const toScene = rotorToScene(spec);
  const toPlane = invertAffine(toScene);
  const targets: SynthMarker[] = spec.markers.length > 0
    ? spec.markers
    : [{ radius_px: 0.75 * spec.hub.radius_px, phase_deg: 0, size_px: 0.1 * spec.hub.radius_px, kind: 'bright', level: 0, rgb: [0, 0, 0] }];
  const angles = Float64Array.from(times_s, (t) => profileAngle(spec.profile, t));
  const covered = new Uint8Array(times_s.length);
  let count = 0;
  const goal = Math.ceil(share * times_s.length);
  const reach = Math.max(spec.hub.radius_px, ...targets.map((mk) => mk.radius_px + mk.size_px)) + size_px;
  const particles: Particle[] = [];
  for (let attempt = 0; attempt < 4 * times_s.length && count < goal; attempt++) {
    // a random frame that no particle covers yet (the n-th clear frame)
    let nth = Math.floor(random.uniform() * (covered.length - count));
    let f = 0;
    for (; f < covered.length; f++) if (!covered[f] && nth-- === 0) break;
    const marker = targets[Math.floor(random.uniform() * targets.length)];
    const m = markerPlaneCentre(marker, angles[f]);
    const at = applyAffine(toScene, m.u, m.v);
    const heading = 2 * Math.PI * random.uniform();
    const speed = speed_px_s * (0.7 + 0.6 * random.uniform());
    const jitter = 0.5 * marker.size_px * (2 * random.uniform() - 1);
    const p: Particle = {
      x_px: at.x - jitter * Math.sin(heading),
      y_px: at.y + jitter * Math.cos(heading),
      t_ref_s: times_s[f],
      vx_px_s: speed * Math.cos(heading),
      vy_px_s: speed * Math.sin(heading),
      radius_px: size_px,
    };
    particles.push(p);
    // the particle can only be near the rotor while it crosses a disc of radius `reach` around the hub centre
    const hubDistance = Math.hypot(p.x_px - spec.hub.cx_px, p.y_px - spec.hub.cy_px);
    const window_s = (hubDistance + reach) / speed;
    const g0 = firstAtOrAfter(times_s, p.t_ref_s - window_s);
    const g1 = firstAtOrAfter(times_s, p.t_ref_s + window_s + 1e-9);
    for (let g = g0; g < g1; g++) {
      if (covered[g]) continue;
      const pos = particleAt(p, times_s[g]);
      if ((pos.x - spec.hub.cx_px) ** 2 + (pos.y - spec.hub.cy_px) ** 2 > reach * reach) continue;
      if (targets.some((mk) => particleOverMarker(toScene, toPlane, mk, angles[g], pos.x, pos.y, size_px))) {
        covered[g] = 1;
        count++;
      }
    }
  }
  return particles;
}

/** Index of the first time ≥ t in an increasing array (binary search); the length when there is none. */
function firstAtOrAfter(times_s: Float64Array, t: number): number {
  let lo = 0;
  let hi = times_s.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (times_s[mid] < t) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
