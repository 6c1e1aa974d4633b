import { it } from 'vitest';
import { createPolarGrid, polarUnwrap } from '../../src/track/polarUnwrap.js';
import { CircularShiftEstimator } from '../../src/track/circularShift.js';
import { outlierWeights, applyRowWeights, shiftRowWeights } from '../../src/track/textureOutlierWeights.js';
import { drawTextureDisc, makeTextureDiscScene } from './textureDisc.js';
const scene = makeTextureDiscScene(7);
it('x', () => {
  const grid = createPolarGrid({ r_inner_px: 12, r_outer_px: 62, angular_bins: 512 });
  const est = new CircularShiftEstimator(512);
  const rows = grid.radii_px.length, bins = 512;
  const c = { x_px: scene.cx, y_px: scene.cy };
  const fr = (d: Uint8Array) => ({ data: d, width: 160, height: 160, origin_x_px: 0, origin_y_px: 0 });
  const ref = polarUnwrap(fr(drawTextureDisc(scene, 0)), grid, c);
  const i = 2, angle = -3.3 * i, rad = 4;
  const data = drawTextureDisc(scene, angle);
  const bx = scene.cx - 40 + 8 * i, by = scene.cy - 30;
  for (let y = 0; y < 160; y++) for (let x = 0; x < 160; x++) if ((x - bx) ** 2 + (y - by) ** 2 < rad * rad) data[y * 160 + x] = 250;
  const cur = polarUnwrap(fr(data), grid, c);
  const e0 = est.estimate(est.spectra(ref, rows), est.spectra(cur, rows));
  let shift = e0.shift_bins;
  console.log('initial', (shift * 360 / 512 - angle).toFixed(4), e0.correlation);
  for (let p = 0; p < 6; p++) {
    const w = outlierWeights(cur, ref, rows, bins, shift);
    let zero = 0, sum = 0; for (const v of w) { if (v < 0.01) zero++; sum += v; }
    const a = est.estimate(est.spectra(applyRowWeights(ref, shiftRowWeights(w, rows, bins, shift), rows, bins), rows), est.spectra(applyRowWeights(cur, w, rows, bins), rows), { predicted_bins: shift, window_bins: 2 });
    shift = a.shift_bins;
    console.log(p, 'zero', zero, 'of', w.length, 'mean w', (sum / w.length).toFixed(3), 'err', (shift * 360 / 512 - angle).toFixed(4), a.correlation.toFixed(4));
  }
  // the true-shift mask
  const w = outlierWeights(cur, ref, rows, bins, angle * 512 / 360);
  let zero = 0; for (const v of w) if (v < 0.01) zero++;
  console.log('true-shift mask zero', zero);
});
