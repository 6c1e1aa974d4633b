import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { createPolarGrid, polarUnwrap } from '../../src/track/polarUnwrap.js';

describe('polarUnwrap', () => {
  // Bilinear interpolation reproduces a plane a + b·x + c·y exactly (common practice, no source), so the
  // sample at radius r, angle θ must equal the plane at x = cx + r cos θ, y = cy − r sin θ (CCW as displayed).
  it('samples a plane image exactly at the polar positions, counterclockwise as displayed', () => {
    const width = 40;
    const height = 30;
    const data = new Uint8Array(width * height);
    const plane = (x: number, y: number): number => 20 + 3 * x + 2 * y;
    for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) data[y * width + x] = plane(x, y);
    const frame = { data, width, height, origin_x_px: 100, origin_y_px: 50 };
    const centre = { x_px: 118.4, y_px: 64.7 }; // (18.4, 14.7) inside the crop
    const grid = createPolarGrid({ r_inner_px: 2, r_outer_px: 10, angular_bins: 16 });
    expect(Array.from(grid.radii_px)).toEqual([2, 3, 4, 5, 6, 7, 8, 9, 10]);
    const polar = polarUnwrap(frame, grid, centre);
    for (let r = 0; r < grid.radii_px.length; r++) {
      for (let j = 0; j < 16; j++) {
        const theta = (2 * Math.PI * j) / 16;
        const x = 18.4 + grid.radii_px[r] * Math.cos(theta);
        const y = 14.7 - grid.radii_px[r] * Math.sin(theta);
        expect(polar[r * 16 + j]).toBeCloseTo(plane(x, y), 9);
      }
    }
    // Angle 90° (column 4) is straight up on screen: smaller y, so a smaller value on this plane than at 270°.
    expect(polar[8 * 16 + 4]).toBeLessThan(polar[8 * 16 + 12]);
  });

  it('refuses an annulus that reaches outside the crop, naming the region', () => {
    const frame = { data: new Uint8Array(20 * 20), width: 20, height: 20, origin_x_px: 0, origin_y_px: 0 };
    const grid = createPolarGrid({ r_inner_px: 0, r_outer_px: 12, angular_bins: 8 });
    expect(() => polarUnwrap(frame, grid, { x_px: 10, y_px: 10 })).toThrow(InputError);
    expect(() => polarUnwrap(frame, grid, { x_px: 10, y_px: 10 })).toThrow(/outside the 20×20 region/);
  });

  it('refuses radii in the wrong order', () => {
    expect(() => createPolarGrid({ r_inner_px: 10, r_outer_px: 5, angular_bins: 64 })).toThrow(InputError);
  });
});
