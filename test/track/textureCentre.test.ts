import { describe, expect, it } from 'vitest';
import { refineTextureCentre } from '../../src/track/textureCentre.js';
import { drawTextureDisc, makeTextureDiscScene } from './textureDisc.js';

// Truth: the drawn disc's centre (textureDisc.ts), turned by a known angle.
const scene = makeTextureDiscScene(7);
const frameOf = (data: Uint8Array) => ({ data, width: scene.width, height: scene.height, origin_x_px: 0, origin_y_px: 0 });
const first = frameOf(drawTextureDisc(scene, 0));

describe('refineTextureCentre', () => {
  it('finds the centre within 0.02 px from a guess 1.8 px off, for turns of 15° to 170°', () => {
    for (const angle of [15, -40, 170]) {
      const got = refineTextureCentre(first, frameOf(drawTextureDisc(scene, angle)), {
        centre: { x_px: scene.cx - 1.5, y_px: scene.cy + 1 },
        r_inner_px: 12,
        r_outer_px: 62,
        angle_deg: angle + 0.4, // a rough start value
      });
      expect(got).not.toBeNull();
      expect(Math.abs(got!.x_px - scene.cx)).toBeLessThan(0.02);
      expect(Math.abs(got!.y_px - scene.cy)).toBeLessThan(0.02);
      expect(Math.abs(got!.angle_deg - angle)).toBeLessThan(0.02);
      expect(got!.correlation).toBeGreaterThan(0.99);
    }
  });

  it('separates a camera shift between the views from the centre', () => {
    // The same hub drawn 2.4 px right and 1.1 px up in the later view, turned by 35°.
    const shifted = { ...scene, cx: scene.cx + 2.4, cy: scene.cy - 1.1 };
    const got = refineTextureCentre(first, frameOf(drawTextureDisc(shifted, 35)), {
      centre: { x_px: scene.cx + 0.7, y_px: scene.cy + 0.5 },
      r_inner_px: 12,
      r_outer_px: 62,
      angle_deg: 35,
      offset: { dx_px: 2.4, dy_px: -1.1 },
    });
    expect(Math.abs(got!.x_px - scene.cx)).toBeLessThan(0.02);
    expect(Math.abs(got!.y_px - scene.cy)).toBeLessThan(0.02);
  });

  it('declines when the turn is too small to pin the centre down', () => {
    expect(refineTextureCentre(first, frameOf(drawTextureDisc(scene, 3)), { centre: { x_px: scene.cx, y_px: scene.cy }, r_inner_px: 12, r_outer_px: 62, angle_deg: 3 })).toBeNull();
  });
});
