// Test drawing: a still, textured scene (random Gaussian spots on a gradient) seen by a camera that
// shifts and rolls. A pixel at X in the moved frame shows the scene point
// X0 = pivot + R(−φ)(X − pivot − t), R(φ) = [[cos φ, sin φ], [−sin φ, cos φ]] (counterclockwise as displayed),
// written out here independently of the code under test. 3×3 supersampling anti-aliases each pixel.
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';

export interface StillScene {
  width: number;
  height: number;
  spots: { x: number; y: number; inv2s2: number; reach2: number; amp: number }[];
}

export interface CameraPose {
  dx_px: number;
  dy_px: number;
  rotation_deg: number;
  pivot_x_px: number;
  pivot_y_px: number;
}

/** Seeded scene of `count` spots of sigma 1.5–4 px over the frame (and a margin around it). */
export function makeStillScene(seed: number, width: number, height: number, count = 600): StillScene {
  const rng = xoroshiro128plus(seed);
  const u = (): number => uniformFloat64(rng);
  const spots = Array.from({ length: count }, () => {
    const sigma = 1.5 + u() * 2.5;
    return { x: -20 + u() * (width + 40), y: -20 + u() * (height + 40), inv2s2: 1 / (2 * sigma * sigma), reach2: (4 * sigma) ** 2, amp: (u() - 0.5) * 160 };
  });
  return { width, height, spots };
}

/** Gray frame of the scene as seen with the camera moved by `pose`; `noise` adds seeded uniform noise of that half-width (gray levels). */
export function drawStillScene(scene: StillScene, pose: CameraPose, noise = 0, seed = 1): Uint8Array {
  const { width, height } = scene;
  const phi = (pose.rotation_deg * Math.PI) / 180;
  const c = Math.cos(phi);
  const s = Math.sin(phi);
  const rng = xoroshiro128plus(seed);
  const out = new Uint8Array(width * height);
  const sub = [-1 / 3, 0, 1 / 3];
  // Bucket spots on a coarse grid for speed.
  const cell = 16;
  const gw = Math.ceil((width + 80) / cell);
  const gh = Math.ceil((height + 80) / cell);
  const grid: number[][] = Array.from({ length: gw * gh }, () => []);
  scene.spots.forEach((sp, i) => {
    const r = Math.sqrt(sp.reach2);
    for (let gy = Math.floor((sp.y - r + 40) / cell); gy <= Math.floor((sp.y + r + 40) / cell); gy++) {
      for (let gx = Math.floor((sp.x - r + 40) / cell); gx <= Math.floor((sp.x + r + 40) / cell); gx++) {
        if (gx >= 0 && gy >= 0 && gx < gw && gy < gh) grid[gy * gw + gx].push(i);
      }
    }
  });
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      let sum = 0;
      for (const sy of sub) {
        for (const sx of sub) {
          const ax = x + sx - pose.pivot_x_px - pose.dx_px;
          const ay = y + sy - pose.pivot_y_px - pose.dy_px;
          const x0 = pose.pivot_x_px + c * ax - s * ay;
          const y0 = pose.pivot_y_px + s * ax + c * ay;
          let v = 100 + 0.2 * x0 - 0.1 * y0;
          const gx = Math.floor((x0 + 40) / cell);
          const gy = Math.floor((y0 + 40) / cell);
          if (gx >= 0 && gy >= 0 && gx < gw && gy < gh) {
            for (const i of grid[gy * gw + gx]) {
              const sp = scene.spots[i];
              const ex = x0 - sp.x;
              const ey = y0 - sp.y;
              const d2 = ex * ex + ey * ey;
              if (d2 < sp.reach2) v += sp.amp * Math.exp(-d2 * sp.inv2s2);
            }
          }
          sum += v;
        }
      }
      const n = noise > 0 ? (uniformFloat64(rng) * 2 - 1) * noise : 0;
      out[y * width + x] = Math.max(0, Math.min(255, Math.round(sum / 9 + n)));
    }
  }
  return out;
}
