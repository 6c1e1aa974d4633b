// Test drawing: a hub with no marker, covered in a smooth random texture, drawn at any rotation with
// 3×3 supersampling (anti-aliased). The texture rotates rigidly, so the truth is the angle given.
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';

export interface TextureDiscScene {
  width: number;
  height: number;
  cx: number;
  cy: number;
  radius: number;
  blobs: { r: number; phi: number; sigma: number; amp: number }[];
  waves: { k: number; amp: number; phase: number }[];
}

/** A seeded texture: Gaussian spots and a few angular waves on a disc of `radius` px. */
export function makeTextureDiscScene(seed: number, width = 160, height = 160, cx = 80.3, cy = 79.6, radius = 70): TextureDiscScene {
  const rng = xoroshiro128plus(seed);
  const u = (): number => uniformFloat64(rng);
  const blobs = Array.from({ length: 90 }, () => ({
    r: 8 + u() * (radius - 10),
    phi: u() * 2 * Math.PI,
    sigma: 1.8 + u() * 3,
    amp: (u() - 0.5) * 140,
  }));
  const waves = Array.from({ length: 5 }, () => ({ k: 1 + Math.floor(u() * 9), amp: 8 + u() * 12, phase: u() * 2 * Math.PI }));
  return { width, height, cx, cy, radius, blobs, waves };
}

/** Renders the scene with the disc turned counterclockwise (as displayed) by angle_deg; gain/offset model lighting flicker. */
export function drawTextureDisc(scene: TextureDiscScene, angle_deg: number, light: { gain?: number; offset?: number } = {}): Uint8Array {
  const { width, height, cx, cy, radius } = scene;
  const alpha = (angle_deg * Math.PI) / 180;
  const spots = scene.blobs.map((b) => ({
    x: cx + b.r * Math.cos(b.phi + alpha),
    y: cy - b.r * Math.sin(b.phi + alpha),
    inv2s2: 1 / (2 * b.sigma * b.sigma),
    reach2: (4 * b.sigma) ** 2,
    amp: b.amp,
  }));
  const gain = light.gain ?? 1;
  const offset = light.offset ?? 0;
  const sub = [-1 / 3, 0, 1 / 3];
  // Sub-sample values (3×3 per pixel): base and waves first, then each spot splatted over its own box.
  const acc = new Float64Array(width * height * 9);
  const inside = new Uint8Array(width * height * 9);
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      for (let q = 0; q < 9; q++) {
        const dx = x + sub[q % 3] - cx;
        const dy = y + sub[Math.floor(q / 3)] - cy;
        const k = (y * width + x) * 9 + q;
        if (dx * dx + dy * dy > radius * radius) {
          acc[k] = 40;
          continue;
        }
        inside[k] = 1;
        const phi = Math.atan2(-dy, dx) - alpha;
        let v = 120;
        for (const w of scene.waves) v += w.amp * Math.cos(w.k * phi + w.phase);
        acc[k] = v;
      }
    }
  }
  for (const s of spots) {
    const reach = Math.sqrt(s.reach2);
    const x0 = Math.max(0, Math.floor(s.x - reach));
    const x1 = Math.min(width - 1, Math.ceil(s.x + reach));
    const y0 = Math.max(0, Math.floor(s.y - reach));
    const y1 = Math.min(height - 1, Math.ceil(s.y + reach));
    for (let y = y0; y <= y1; y++) {
      for (let x = x0; x <= x1; x++) {
        for (let q = 0; q < 9; q++) {
          const k = (y * width + x) * 9 + q;
          if (!inside[k]) continue;
          const ex = x + sub[q % 3] - s.x;
          const ey = y + sub[Math.floor(q / 3)] - s.y;
          const d2 = ex * ex + ey * ey;
          if (d2 < s.reach2) acc[k] += s.amp * Math.exp(-d2 * s.inv2s2);
        }
      }
    }
  }
  const out = new Uint8Array(width * height);
  for (let i = 0; i < width * height; i++) {
    let sum = 0;
    for (let q = 0; q < 9; q++) sum += acc[i * 9 + q];
    out[i] = Math.max(0, Math.min(255, Math.round((sum / 9) * gain + offset)));
  }
  return out;
}
