import type { SynthSpec } from './SynthSpec.js';
import { seededRandom } from './seededRandom.js';

/** Random stream number reserved for the hub texture. */
const TEXTURE_STREAM = 303;
/** Blobs painted on the hub. */
const BLOBS = 40;

/** One Gaussian spot of the hub texture, in rotor-plane px at rotor angle 0 (v up). */
export interface TextureBlob {
  u_px: number;
  v_px: number;
  sigma_px: number;
  /** Added gray level at the spot's centre (either sign). */
  amplitude: number;
}

/**
 * A seeded random texture for the hub: Gaussian spots of varied size and contrast, each kept 3σ inside
 * the hub rim so the rim stays round. It turns with the rotor.
 */
export function createHubTexture(spec: Pick<SynthSpec, 'seed' | 'hub'>): TextureBlob[] {
  const random = seededRandom(spec.seed, TEXTURE_STREAM);
  const R = spec.hub.radius_px;
  const blobs: TextureBlob[] = [];
  for (let b = 0; b < BLOBS; b++) {
    const sigma_px = Math.max(1.2, R * (0.02 + 0.07 * random.uniform()));
    const reach = Math.max(0, R - 3 * sigma_px);
    const rho = reach * Math.sqrt(random.uniform());
    const phi = 2 * Math.PI * random.uniform();
    const amplitude = (random.uniform() < 0.5 ? -1 : 1) * (25 + 45 * random.uniform());
    blobs.push({ u_px: rho * Math.cos(phi), v_px: rho * Math.sin(phi), sigma_px, amplitude });
  }
  return blobs;
}

/** The hub texture sampled on a square grid in rotor-plane px at rotor angle 0: value at (u, v) is raster[(half − v)·side + (u + half)]. */
export interface TextureRaster {
  raster: Float32Array;
  side: number;
  half: number;
}

/** Sums the blobs on a grid of 1 px covering the hub (done once per spec; frames sample it bilinearly). */
export function rasterizeHubTexture(blobs: TextureBlob[], radius_px: number): TextureRaster {
  const half = Math.ceil(radius_px) + 1;
  const side = 2 * half + 1;
  const raster = new Float32Array(side * side);
  for (const blob of blobs) {
    const reach = 3.5 * blob.sigma_px;
    const inv2s2 = 1 / (2 * blob.sigma_px * blob.sigma_px);
    const c0 = Math.max(0, Math.floor(blob.u_px - reach + half));
    const c1 = Math.min(side - 1, Math.ceil(blob.u_px + reach + half));
    const r0 = Math.max(0, Math.floor(half - blob.v_px - reach));
    const r1 = Math.min(side - 1, Math.ceil(half - blob.v_px + reach));
    for (let r = r0; r <= r1; r++) {
      const dv = half - r - blob.v_px;
      for (let c = c0; c <= c1; c++) {
        const du = c - half - blob.u_px;
        raster[r * side + c] += blob.amplitude * Math.exp(-(du * du + dv * dv) * inv2s2);
      }
    }
  }
  return { raster, side, half };
}
