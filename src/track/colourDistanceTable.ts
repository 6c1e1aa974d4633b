/** CIELAB coordinates (D65 white), L* 0–100. */
export interface Lab {
  L: number;
  a: number;
  b: number;
}

/**
 * sRGB (0–255) to CIELAB, D65 white: IEC 61966-2-1 sRGB transfer curve and matrix, then CIE 15:2004 Lab.
 */
export function rgbToLab(r: number, g: number, b: number): Lab {
  const lin = (c: number): number => {
    const v = c / 255;
    return v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4;
  };
  const R = lin(r);
  const G = lin(g);
  const B = lin(b);
  const X = (0.4124 * R + 0.3576 * G + 0.1805 * B) / 0.95047;
  const Y = 0.2126 * R + 0.7152 * G + 0.0722 * B;
  const Z = (0.0193 * R + 0.1192 * G + 0.9505 * B) / 1.08883;
  const f = (t: number): number => (t > 216 / 24389 ? Math.cbrt(t) : ((24389 / 27) * t + 16) / 116);
  const fx = f(X);
  const fy = f(Y);
  const fz = f(Z);
  return { L: 116 * fy - 16, a: 500 * (fx - fy), b: 200 * (fy - fz) };
}

/**
 * A lookup table (64 levels per channel, index (r>>2)<<12 | (g>>2)<<6 | b>>2) of how much each colour looks
 * like the marker colour, 0–255: 255·max(0, 1 − ΔE/tolerance), where ΔE is the CIE76 distance with the
 * lightness difference weighted by `lightness_weight` (below 1 so lighting flicker matters less).
 */
export function colourSimilarityTable(target: [number, number, number], tolerance: number, lightness_weight = 0.5): Uint8Array {
  const ref = rgbToLab(target[0], target[1], target[2]);
  const table = new Uint8Array(64 * 64 * 64);
  for (let r = 0; r < 64; r++) {
    for (let g = 0; g < 64; g++) {
      for (let b = 0; b < 64; b++) {
        const c = rgbToLab(r * 4 + 2, g * 4 + 2, b * 4 + 2);
        const dE = Math.hypot(lightness_weight * (c.L - ref.L), c.a - ref.a, c.b - ref.b);
        table[(r << 12) | (g << 6) | b] = Math.round(255 * Math.max(0, 1 - dE / tolerance));
      }
    }
  }
  return table;
}
