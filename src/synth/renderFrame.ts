import type { Affine2d } from './affine2d.js';
import { applyAffine, composeAffine, invertAffine } from './affine2d.js';
import { createCameraShake } from './cameraShake.js';
import { blendCoverage, clipBox, discCoverage } from './discCoverage.js';
import { frameTimes } from './frameTimes.js';
import type { TextureRaster } from './hubTexture.js';
import { createHubTexture, rasterizeHubTexture } from './hubTexture.js';
import type { Particle } from './particles.js';
import { markerPlaneCentre, particleAt, particleOverMarker, planParticles } from './particles.js';
import { profileState } from './rotationProfile.js';
import type { SynthSpec, SynthSpecInput } from './SynthSpec.js';
import { resolveSynthSpec } from './SynthSpec.js';
import { seededRandom } from './seededRandom.js';
import { noisyBytes } from './sensorNoise.js';
import { renderStaticLayer } from './staticLayer.js';
import type { ShakeState } from './viewTransform.js';
import { rotorToScene, sceneToImage } from './viewTransform.js';

/** Where one marker truly is in a rendered frame. */
export interface SynthMarkerTruth {
  /** Marker centre in the displayed image after every view effect (oblique view, shake), px; pixel centres at integers. */
  x_px: number;
  y_px: number;
  /** True when a drifting particle overlaps the marker in this frame. */
  occluded: boolean;
}

/** One rendered frame and its truth. */
export interface SynthFrame {
  /** width × height × channels bytes, row-major, channels interleaved. */
  data: Uint8Array;
  /** One entry per marker of the spec, in order. */
  markers: SynthMarkerTruth[];
  /** Rotor angle in its own plane, degrees CCW as seen (marker i sits at angle_deg + its phase_deg). */
  angle_deg: number;
  rate_deg_s: number;
  /** Camera shake applied to this frame. */
  shake: ShakeState;
}

/** Everything about a spec that does not change from frame to frame, built once per spec object. */
interface PreparedSynth {
  spec: SynthSpec;
  staticLayer: Float32Array;
  shakeAt: (t_s: number) => ShakeState;
  texture: TextureRaster | null;
  particles: Particle[];
  toScene: Affine2d;
  sceneToPlane: Affine2d;
  flickerPhase_rad: number;
}

/** Random stream numbers: flicker phase, and per-frame sensor noise from NOISE_STREAM + frame index. */
const FLICKER_STREAM = 505;
const NOISE_STREAM = 1_000_000;
/** Largest marker step between blur sub-samples, px, and the most sub-samples per frame. */
const BLUR_STEP_PX = 0.25;
const MAX_BLUR_SAMPLES = 256;
const TEXTURE_STEP_PX = 1;
const MAX_TEXTURE_SAMPLES = 8;

const prepared = new WeakMap<object, { json: string; value: PreparedSynth }>();

/**
 * Resolves a spec once and caches what every frame shares (static layer, texture, particles, shake),
 * keyed by the spec object and checked against its JSON so that a spec changed in place is prepared again.
 */
function prepare(input: SynthSpec | SynthSpecInput): PreparedSynth {
  const json = JSON.stringify(input);
  const hit = prepared.get(input);
  if (hit && hit.json === json) return hit.value;
  const spec = resolveSynthSpec(input as SynthSpecInput);
  const toScene = rotorToScene(spec);
  const p: PreparedSynth = {
    spec,
    staticLayer: renderStaticLayer(spec),
    shakeAt: createCameraShake(spec),
    texture: spec.realism.hub_texture ? rasterizeHubTexture(createHubTexture(spec), spec.hub.radius_px) : null,
    particles: planParticles(spec, frameTimes(spec)),
    toScene,
    sceneToPlane: invertAffine(toScene),
    flickerPhase_rad: 2 * Math.PI * seededRandom(spec.seed, FLICKER_STREAM).uniform(),
  };
  prepared.set(input, { json, value: p });
  return p;
}

/** Static layer moved by the shake: each output pixel samples the unshaken layer bilinearly (edges clamped). */
function shakenStaticLayer(p: PreparedSynth, imageToScene: Affine2d): Float32Array {
  const { width_px: w, height_px: h, channels: ch } = p.spec;
  const src = p.staticLayer;
  const out = new Float32Array(w * h * ch);
  const { a, b, c, d, e, f } = imageToScene;
  const rowStride = w * ch;
  for (let j = 0; j < h; j++) {
    // scene coordinates move by (a, d) per output pixel along a row
    let x = b * j + c;
    let y = e * j + f;
    let q = j * rowStride;
    for (let i = 0; i < w; i++, x += a, y += d, q += ch) {
      let xs = x, ys = y;
      if (xs < 0) xs = 0; else if (xs > w - 1) xs = w - 1;
      if (ys < 0) ys = 0; else if (ys > h - 1) ys = h - 1;
      let x0 = xs | 0;
      let y0 = ys | 0;
      if (x0 > w - 2) x0 = w - 2;
      if (y0 > h - 2) y0 = h - 2;
      const fx = xs - x0;
      const fy = ys - y0;
      const p00 = (y0 * w + x0) * ch;
      const p10 = p00 + rowStride;
      const w00 = (1 - fx) * (1 - fy), w01 = fx * (1 - fy), w10 = (1 - fx) * fy, w11 = fx * fy;
      for (let k = 0; k < ch; k++) {
        out[q + k] = src[p00 + k] * w00 + src[p00 + ch + k] * w01 + src[p10 + k] * w10 + src[p10 + ch + k] * w11;
      }
    }
  }
  return out;
}

/** Sub-sample times spread evenly over an exposure centred on t_s. */
function exposureTimes(t_s: number, exposure_s: number, count: number): Float64Array {
  if (count <= 1 || exposure_s <= 0) return new Float64Array([t_s]);
  return Float64Array.from({ length: count }, (_, k) => t_s + exposure_s * ((k + 0.5) / count - 0.5));
}

/**
 * Adds the turning hub texture (averaged over the exposure's sub-angles) to the layer: each pixel inside the
 * hub is taken back to the rotor plane, turned back by each angle and sampled bilinearly from the raster.
 */
function paintTexture(layer: Float32Array, p: PreparedSynth, texture: TextureRaster, toPlane: Affine2d, angles_deg: Float64Array): void {
  const { width_px: w, height_px: h, channels: ch } = p.spec;
  const { raster, side, half } = texture;
  const k = angles_deg.length;
  const cos = Float64Array.from(angles_deg, (a) => Math.cos((a * Math.PI) / 180));
  const sin = Float64Array.from(angles_deg, (a) => Math.sin((a * Math.PI) / 180));
  const R = p.spec.hub.radius_px;
  const toImage = invertAffine(toPlane);
  const c = applyAffine(toImage, 0, 0);
  const box = clipBox(c.x - R, c.y - R, c.x + R, c.y + R, w, h);
  if (!box) return;
  const limit = (half - 1) * (half - 1);
  for (let j = box.y0; j <= box.y1; j++) {
    for (let i = box.x0; i <= box.x1; i++) {
      const u = toPlane.a * i + toPlane.b * j + toPlane.c;
      const v = toPlane.d * i + toPlane.e * j + toPlane.f;
      if (u * u + v * v >= limit) continue;
      let sum = 0;
      for (let s = 0; s < k; s++) {
        // rotor-plane point turned back by the rotor angle, then grid coordinates (column u + half, row half − v)
        const gx = u * cos[s] + v * sin[s] + half;
        const gy = half - (-u * sin[s] + v * cos[s]);
        const x0 = Math.floor(gx);
        const y0 = Math.floor(gy);
        const fx = gx - x0;
        const fy = gy - y0;
        const q = y0 * side + x0;
        sum += (raster[q] * (1 - fx) + raster[q + 1] * fx) * (1 - fy) + (raster[q + side] * (1 - fx) + raster[q + side + 1] * fx) * fy;
      }
      const add = sum / k;
      const q = (j * w + i) * ch;
      for (let c2 = 0; c2 < ch; c2++) layer[q + c2] += add;
    }
  }
}

/** Bounding box in the image of discs of a given radius whose centres are given in some plane. */
function boxOfDiscs(toImage: Affine2d, centres: Float64Array, radius_px: number, w: number, h: number) {
  let xmin = Infinity, ymin = Infinity, xmax = -Infinity, ymax = -Infinity;
  for (let s = 0; s < centres.length; s += 2) {
    const c = applyAffine(toImage, centres[s], centres[s + 1]);
    xmin = Math.min(xmin, c.x); xmax = Math.max(xmax, c.x);
    ymin = Math.min(ymin, c.y); ymax = Math.max(ymax, c.y);
  }
  return clipBox(xmin - radius_px, ymin - radius_px, xmax + radius_px, ymax + radius_px, w, h);
}

/**
 * Renders one synthetic frame at time t_s and reports where each marker truly is. Pure and deterministic:
 * the same spec, t_s and index give the same bytes (index seeds the sensor noise). Edges are anti-aliased
 * by area coverage, so sub-pixel motion shows in the pixels; with an exposure, positions are integrated
 * over [t_s − exposure/2, t_s + exposure/2] and the truth is the position at t_s.
 * @param spec  a resolved spec (a partial one is resolved first); frame-invariant work is cached per spec object
 * @param t_s   frame time, seconds
 * @param index frame number, seeds the per-frame sensor noise
 */
export function renderFrame(spec: SynthSpec | SynthSpecInput, t_s: number, index: number): SynthFrame {
  const p = prepare(spec);
  const s = p.spec;
  const { width_px: w, height_px: h, channels: ch } = s;
  const state = profileState(s.profile, t_s);
  const shake = p.shakeAt(t_s);
  const sceneToImg = sceneToImage(s, shake);
  const imgToScene = invertAffine(sceneToImg);
  const toImage = composeAffine(sceneToImg, p.toScene);
  const toPlane = invertAffine(toImage);
  const still = shake.dx_px === 0 && shake.dy_px === 0 && shake.rotation_deg === 0;
  const layer = still ? p.staticLayer.slice() : shakenStaticLayer(p, imgToScene);

  const exposure = s.realism.exposure_s;
  let sweep_deg = 0;
  if (exposure > 0) {
    const a0 = profileState(s.profile, t_s - exposure / 2).angle_deg;
    const a1 = profileState(s.profile, t_s + exposure / 2).angle_deg;
    sweep_deg = Math.max(Math.abs(state.angle_deg - a0), Math.abs(a1 - state.angle_deg)) * 2;
  }
  const sweep_rad = (sweep_deg * Math.PI) / 180;

  if (p.texture) {
    const k = Math.min(MAX_TEXTURE_SAMPLES, Math.max(1, Math.ceil((sweep_rad * s.hub.radius_px) / TEXTURE_STEP_PX)));
    const times = exposureTimes(t_s, exposure, k);
    paintTexture(layer, p, p.texture, toPlane, times.map((t) => profileState(s.profile, t).angle_deg));
  }

  const maxReach = s.markers.reduce((m, mk) => Math.max(m, mk.radius_px), 0);
  const kMarker = Math.min(MAX_BLUR_SAMPLES, Math.max(1, Math.ceil((sweep_rad * maxReach) / BLUR_STEP_PX)));
  const subTimes = exposureTimes(t_s, exposure, kMarker);
  const subAngles = subTimes.map((t) => profileState(s.profile, t).angle_deg);
  const supersample = subTimes.length === 1 ? 16 : 4;
  for (const marker of s.markers) {
    const centres = new Float64Array(2 * subAngles.length);
    subAngles.forEach((a, n) => {
      const c = markerPlaneCentre(marker, a);
      centres[2 * n] = c.u;
      centres[2 * n + 1] = c.v;
    });
    const box = boxOfDiscs(toImage, centres, marker.size_px, w, h);
    if (!box) continue;
    const colour = marker.kind === 'color' ? marker.rgb : [marker.level, marker.level, marker.level];
    blendCoverage(layer, w, ch, discCoverage(toPlane, centres, marker.size_px, box, supersample), colour);
  }

  const particleLevel = new Array<number>(ch).fill(s.realism.particles.level);
  for (const particle of p.particles) {
    // a particle's own smear: sub-samples at most 0.5 px apart along its path during the exposure
    const travel_px = Math.hypot(particle.vx_px_s, particle.vy_px_s) * exposure;
    const particleTimes = exposureTimes(t_s, exposure, Math.min(MAX_BLUR_SAMPLES, Math.max(1, Math.ceil(travel_px / 0.5))));
    const centres = new Float64Array(2 * particleTimes.length);
    particleTimes.forEach((t, n) => {
      const c = particleAt(particle, t);
      centres[2 * n] = c.x;
      centres[2 * n + 1] = c.y;
    });
    const box = boxOfDiscs(sceneToImg, centres, particle.radius_px, w, h);
    if (!box) continue;
    blendCoverage(layer, w, ch, discCoverage(imgToScene, centres, particle.radius_px, box, particleTimes.length === 1 ? 8 : 4), particleLevel);
  }

  const markers: SynthMarkerTruth[] = s.markers.map((marker) => {
    const c = markerPlaneCentre(marker, state.angle_deg);
    const at = applyAffine(toImage, c.u, c.v);
    const occluded = p.particles.some((particle) => {
      const q = particleAt(particle, t_s);
      return particleOverMarker(p.toScene, p.sceneToPlane, marker, state.angle_deg, q.x, q.y, particle.radius_px);
    });
    return { x_px: at.x, y_px: at.y, occluded };
  });

  return { data: quantize(layer, s, t_s, index, p.flickerPhase_rad), markers, angle_deg: state.angle_deg, rate_deg_s: state.rate_deg_s, shake };
}

/** Applies flicker gain and sensor noise, then rounds to bytes clamped to 0–255. */
function quantize(layer: Float32Array, s: SynthSpec, t_s: number, index: number, phase_rad: number): Uint8Array {
  const { amplitude, frequency_hz } = s.realism.flicker;
  const gain = amplitude > 0 ? 1 + amplitude * Math.sin(2 * Math.PI * frequency_hz * t_s + phase_rad) : 1;
  return noisyBytes(layer, gain, s.realism.noise_sigma, s.seed, NOISE_STREAM + index);
}
