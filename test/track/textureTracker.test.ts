import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { createTextureTracker } from '../../src/track/textureTracker.js';
import { drawTextureDisc, makeTextureDiscScene, type TextureDiscScene } from './textureDisc.js';

// Truth comes from the drawing: the texture is drawn turned by a known angle (textureDisc.ts).
const scene = makeTextureDiscScene(7);
const frameOf = (s: TextureDiscScene, data: Uint8Array) => ({ data, width: s.width, height: s.height, origin_x_px: 0, origin_y_px: 0 });
const annulus = { centre: { x_px: scene.cx, y_px: scene.cy }, r_inner_px: 12, r_outer_px: 62 };
const reference = drawTextureDisc(scene, 0);

describe('createTextureTracker', () => {
  it('recovers single rotations of a textured disc within 0.02°', () => {
    for (const angle of [0.37, 3.11, -5.71, 12.345, 44.4, -87.6]) {
      const tracker = createTextureTracker(annulus);
      expect(tracker.update(frameOf(scene, reference))).toEqual({ angle_deg: 0, quality: 1 });
      const got = tracker.update(frameOf(scene, drawTextureDisc(scene, angle)));
      expect(Math.abs(got.angle_deg - angle)).toBeLessThan(0.02);
      expect(got.quality).toBeGreaterThan(0.99);
    }
  });

  it('ignores lighting flicker (gain and offset changes)', () => {
    const tracker = createTextureTracker(annulus);
    tracker.update(frameOf(scene, reference));
    for (const light of [{ gain: 0.6, offset: 10 }, { gain: 1.3, offset: -20 }, { gain: 0.8, offset: 40 }]) {
      const got = tracker.update(frameOf(scene, drawTextureDisc(scene, 7.25, light)));
      expect(Math.abs(got.angle_deg - 7.25)).toBeLessThan(0.02);
    }
  });

  it('follows two turns over 60 noisy, flickering frames without drift', () => {
    // Also the annulus centre is given off by a fraction of a pixel from the drawn one, as in practice.
    const tracker = createTextureTracker({ ...annulus, centre: { x_px: scene.cx + 0.3, y_px: scene.cy - 0.2 } });
    const errors: number[] = [];
    for (let i = 0; i < 60; i++) {
      const angle = 12.2 * i; // 732° in all, about 2 turns, counterclockwise
      const data = drawTextureDisc(scene, angle, { gain: 1 + 0.15 * Math.sin(i), offset: 5 * Math.cos(0.7 * i) });
      for (let p = 0; p < data.length; p++) data[p] = Math.max(0, Math.min(255, data[p] + ((p * 7919 + i * 104729) % 7) - 3)); // deterministic ±3 noise
      const got = tracker.update(frameOf(scene, data));
      errors.push(got.angle_deg - angle);
    }
    const maxAbs = Math.max(...errors.map(Math.abs));
    expect(maxAbs).toBeLessThan(0.05);
    // No drift: the last ten frames are no further off than the first ten allow.
    const mean = (a: number[]) => a.reduce((s, v) => s + v, 0) / a.length;
    expect(Math.abs(mean(errors.slice(-10)))).toBeLessThan(0.02);
    // The first frame stayed the reference (re-made once after each centre refinement).
    expect(tracker.references_made).toBe(1 + tracker.centre_refinements);
    // the documented default schedule refines once each at 20°, 60° and 150° of turn (refine_centre_at_deg in
    // src/track/textureTracker.ts); this run turns about 720°, past all three
    expect(tracker.centre_refinements).toBe(3);
    expect(Math.hypot(tracker.centre_px.x_px - scene.cx, tracker.centre_px.y_px - scene.cy)).toBeLessThan(0.02);
  });

  it('survives a bubble over the annulus and returns to the first reference afterwards', () => {
    const tracker = createTextureTracker(annulus);
    const results: { angle: number; got: number; quality: number }[] = [];
    for (let i = 0; i < 24; i++) {
      const angle = -3.3 * i; // clockwise
      const data = drawTextureDisc(scene, angle);
      if (i >= 8 && i < 14) {
        // A bright bubble of radius 14 px drifting across the annulus.
        const bx = scene.cx - 40 + 6 * (i - 8);
        const by = scene.cy - 30;
        for (let y = 0; y < scene.height; y++) for (let x = 0; x < scene.width; x++) if ((x - bx) ** 2 + (y - by) ** 2 < 14 * 14) data[y * scene.width + x] = 250;
      }
      const got = tracker.update(frameOf(scene, data));
      results.push({ angle, got: got.angle_deg, quality: got.quality });
    }
    for (const r of results) {
      if (Number.isNaN(r.got)) expect(r.quality).toBe(0);
      else expect(Math.abs(r.got - r.angle)).toBeLessThan(0.05);
    }
    for (const r of results.slice(16)) expect(Math.abs(r.got - r.angle)).toBeLessThan(0.02);
    expect(Math.min(...results.slice(8, 14).map((r) => r.quality))).toBeLessThan(0.95);
  });

  it('masks small bubbles and dark specks: error stays under 0.03° though the correlation drops', () => {
    for (const [radius, level] of [[4, 250], [6, 10], [9, 250]] as const) {
      const tracker = createTextureTracker(annulus);
      tracker.update(frameOf(scene, reference));
      for (let i = 1; i <= 4; i++) {
        const angle = 2.7 * i;
        const data = drawTextureDisc(scene, angle);
        const bx = scene.cx + 35 - 7 * i;
        const by = scene.cy + 20;
        for (let y = 0; y < scene.height; y++) for (let x = 0; x < scene.width; x++) if ((x - bx) ** 2 + (y - by) ** 2 < radius * radius) data[y * scene.width + x] = level;
        const got = tracker.update(frameOf(scene, data));
        expect(got.quality).toBeLessThan(0.99);
        expect(Math.abs(got.angle_deg - angle)).toBeLessThan(0.03);
      }
    }
  });

  it('without centre refinement, a centre 0.36 px off costs more than 0.05° (why it refines)', () => {
    const tracker = createTextureTracker({ ...annulus, centre: { x_px: scene.cx + 0.3, y_px: scene.cy - 0.2 }, refine_centre: false });
    let worst = 0;
    for (let i = 0; i < 8; i++) {
      const angle = 25 * i;
      worst = Math.max(worst, Math.abs(tracker.update(frameOf(scene, drawTextureDisc(scene, angle))).angle_deg - angle));
    }
    expect(worst).toBeGreaterThan(0.05);
  });

  it('keeps a bounded error when told to refresh its reference every 30°', () => {
    const tracker = createTextureTracker({ ...annulus, reference_refresh_deg: 30 });
    let worst = 0;
    for (let i = 0; i < 40; i++) {
      const angle = 9.1 * i;
      worst = Math.max(worst, Math.abs(tracker.update(frameOf(scene, drawTextureDisc(scene, angle))).angle_deg - angle));
    }
    expect(tracker.references_made).toBeGreaterThan(5);
    expect(worst).toBeLessThan(0.05);
  });

  it('reports NaN with quality 0 when the hub shows no texture', () => {
    const tracker = createTextureTracker(annulus);
    tracker.update(frameOf(scene, reference));
    const blank = new Uint8Array(scene.width * scene.height).fill(120);
    expect(tracker.update(frameOf(scene, blank))).toEqual({ angle_deg: Number.NaN, quality: 0 });
  });

  it('refuses an annulus that does not fit the frame', () => {
    const tracker = createTextureTracker({ ...annulus, r_outer_px: 90 });
    expect(() => tracker.update(frameOf(scene, reference))).toThrow(InputError);
  });
});
