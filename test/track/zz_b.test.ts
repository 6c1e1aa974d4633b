import { it } from 'vitest';
import { createTextureTracker } from '../../src/track/textureTracker.js';
import { drawTextureDisc, makeTextureDiscScene } from './textureDisc.js';
const scene = makeTextureDiscScene(7);
it('x', () => {
  for (const rad of [14, 18, 22]) for (const level of [250, 10]) {
    const tracker = createTextureTracker({ centre: { x_px: scene.cx, y_px: scene.cy }, r_inner_px: 12, r_outer_px: 62, min_quality: 0.4 });
    tracker.update({ data: drawTextureDisc(scene, 0), width: 160, height: 160, origin_x_px: 0, origin_y_px: 0 });
    const out: string[] = [];
    for (let i = 1; i < 8; i++) {
      const angle = -3.3 * i;
      const data = drawTextureDisc(scene, angle);
      const bx = scene.cx - 40 + 8 * i, by = scene.cy - 30;
      for (let y = 0; y < 160; y++) for (let x = 0; x < 160; x++) if ((x - bx) ** 2 + (y - by) ** 2 < rad * rad) data[y * 160 + x] = level;
      const g = tracker.update({ data, width: 160, height: 160, origin_x_px: 0, origin_y_px: 0 });
      out.push(`${(g.angle_deg - angle).toFixed(3)}/${g.quality.toFixed(2)}`);
    }
    console.log('r', rad, 'level', level, out.join(' '));
  }
});
