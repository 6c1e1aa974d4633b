import { Matrix, solve } from 'ml-matrix';

/** A circle in full-frame pixels. */
export interface Circle {
  cx_px: number;
  cy_px: number;
  r_px: number;
}

/**
 * Algebraic least-squares circle (Kåsa 1976): minimises Σ (x² + y² + D x + E y + F)², solved as a
 * linear system on centred coordinates. Used for a first centre guess; biased inward on short, noisy arcs.
 */
export function fitCircle(x_px: ArrayLike<number>, y_px: ArrayLike<number>): Circle {
  const n = x_px.length;
  let mx = 0;
  let my = 0;
  for (let i = 0; i < n; i++) {
    mx += x_px[i];
    my += y_px[i];
  }
  mx /= n;
  my /= n;
  const A = new Matrix(n, 3);
  const b = new Matrix(n, 1);
  for (let i = 0; i < n; i++) {
    const x = x_px[i] - mx;
    const y = y_px[i] - my;
    A.set(i, 0, x);
    A.set(i, 1, y);
    A.set(i, 2, 1);
    b.set(i, 0, -(x * x + y * y));
  }
  const p = solve(A, b, true).to1DArray();
  const cx = -p[0] / 2;
  const cy = -p[1] / 2;
  const r = Math.sqrt(Math.max(0, cx * cx + cy * cy - p[2]));
  return { cx_px: cx + mx, cy_px: cy + my, r_px: r };
}
