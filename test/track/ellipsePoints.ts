// Test helper: points on an ellipse with known centre, axes and orientation (analytic geometry), optionally with seeded Gaussian noise.
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';

/** Points on an ellipse from its parametric form x = cx + a cos t cos φ − b sin t sin φ (y up, then flipped to image y down), px. */
export function ellipsePoints(cx: number, cy: number, a: number, b: number, phiDeg: number, t0: number, t1: number, n: number, noise = 0, seed = 1) {
  const rng = xoroshiro128plus(seed);
  const gauss = () => Math.sqrt(-2 * Math.log(1 - uniformFloat64(rng))) * Math.cos(2 * Math.PI * uniformFloat64(rng));
  const phi = (phiDeg * Math.PI) / 180;
  const x_px = new Float64Array(n);
  const y_px = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const t = t0 + ((t1 - t0) * i) / n;
    const u = a * Math.cos(t) * Math.cos(phi) - b * Math.sin(t) * Math.sin(phi);
    const v = a * Math.cos(t) * Math.sin(phi) + b * Math.sin(t) * Math.cos(phi);
    x_px[i] = cx + u + noise * gauss();
    y_px[i] = cy - v + noise * gauss();
  }
  return { x_px, y_px };
}
