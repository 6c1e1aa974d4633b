import { invertAffine } from './affine2d.js';
import { blendCoverage, clipBox, discCoverage } from './discCoverage.js';
import type { SynthSpec } from './SynthSpec.js';
import { rotorToScene } from './viewTransform.js';

/** Gray levels of the fixed scene parts. */
const FIDUCIAL_DARK = 30;
const FIDUCIAL_LIGHT = 225;
const RIM_LEVEL = 25;
const LIP_LEVEL = 180;
const RIM_PX = 4;
const LIP_PX = 3;
/** Fiducial checkerboard cells per side. */
const CELLS = 4;

/** Mean of a piecewise-constant profile over [lo, hi): bands are [start, level] pairs in increasing order. */
function meanOverInterval(bands: Array<[number, number]>, lo: number, hi: number): number {
  let sum = 0;
  for (let b = 0; b < bands.length; b++) {
    const start = Math.max(lo, bands[b][0]);
    const end = Math.min(hi, b + 1 < bands.length ? bands[b + 1][0] : Infinity);
    if (end > start) sum += (end - start) * bands[b][1];
  }
  return sum / (hi - lo);
}

/**
 * The still part of the scene in unshaken image coordinates, as a float image (channels interleaved):
 * background, the tank edge, the checkerboard fiducial and the hub disc (seen as an ellipse when oblique),
 * every edge anti-aliased by area coverage.
 */
export function renderStaticLayer(spec: SynthSpec): Float32Array {
  const { width_px: w, height_px: h, channels: ch } = spec;
  const layer = new Float32Array(w * h * ch);
  const bg = spec.background.level;
  const edge = spec.background.tank_edge_y_px;
  const bands: Array<[number, number]> = [[-Infinity, bg]];
  if (edge !== null) bands.push([edge, RIM_LEVEL], [edge + RIM_PX, LIP_LEVEL], [edge + RIM_PX + LIP_PX, Math.min(255, bg + 25)]);
  for (let j = 0; j < h; j++) {
    const level = meanOverInterval(bands, j - 0.5, j + 0.5);
    layer.fill(level, j * w * ch, (j + 1) * w * ch);
  }

  const fid = spec.background.fiducial;
  if (fid) {
    const cell = fid.size_px / CELLS;
    const s = 8;
    // the square covers [x, x+size) in continuous coordinates where pixel i spans [i−½, i+½]
    const x0 = fid.x_px - 0.5;
    const y0 = fid.y_px - 0.5;
    for (let j = Math.max(0, fid.y_px - 1); j <= Math.min(h - 1, fid.y_px + fid.size_px); j++) {
      for (let i = Math.max(0, fid.x_px - 1); i <= Math.min(w - 1, fid.x_px + fid.size_px); i++) {
        let sum = 0;
        let inside = 0;
        for (let sy = 0; sy < s; sy++) {
          const y = j - 0.5 + (sy + 0.5) / s - y0;
          if (y < 0 || y >= fid.size_px) continue;
          for (let sx = 0; sx < s; sx++) {
            const x = i - 0.5 + (sx + 0.5) / s - x0;
            if (x < 0 || x >= fid.size_px) continue;
            inside++;
            sum += (Math.floor(x / cell) + Math.floor(y / cell)) % 2 === 0 ? FIDUCIAL_DARK : FIDUCIAL_LIGHT;
          }
        }
        if (inside === 0) continue;
        const cover = inside / (s * s);
        const p = (j * w + i) * ch;
        for (let c = 0; c < ch; c++) layer[p + c] = layer[p + c] * (1 - cover) + (sum / inside) * cover;
      }
    }
  }

  const toScene = rotorToScene(spec);
  const r = spec.hub.radius_px;
  const box = clipBox(spec.hub.cx_px - r, spec.hub.cy_px - r, spec.hub.cx_px + r, spec.hub.cy_px + r, w, h);
  if (box) {
    const mask = discCoverage(invertAffine(toScene), new Float64Array([0, 0]), r, box, 8);
    blendCoverage(layer, w, ch, mask, new Array<number>(ch).fill(spec.hub.level));
  }
  return layer;
}
