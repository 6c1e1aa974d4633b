/** A 2-D affine map x' = a·x + b·y + c, y' = d·x + e·y + f (pixel coordinates). */
export interface Affine2d {
  a: number;
  b: number;
  c: number;
  d: number;
  e: number;
  f: number;
}

/** Applies an affine map to one point. */
export function applyAffine(m: Affine2d, x: number, y: number): { x: number; y: number } {
  return { x: m.a * x + m.b * y + m.c, y: m.d * x + m.e * y + m.f };
}

/** The map "first `inner`, then `outer`". */
export function composeAffine(outer: Affine2d, inner: Affine2d): Affine2d {
  return {
    a: outer.a * inner.a + outer.b * inner.d,
    b: outer.a * inner.b + outer.b * inner.e,
    c: outer.a * inner.c + outer.b * inner.f + outer.c,
    d: outer.d * inner.a + outer.e * inner.d,
    e: outer.d * inner.b + outer.e * inner.e,
    f: outer.d * inner.c + outer.e * inner.f + outer.f,
  };
}

/** The inverse map (the linear part must be non-singular). */
export function invertAffine(m: Affine2d): Affine2d {
  const det = m.a * m.e - m.b * m.d;
  const a = m.e / det;
  const b = -m.b / det;
  const d = -m.d / det;
  const e = m.a / det;
  return { a, b, c: -(a * m.c + b * m.f), d, e, f: -(d * m.c + e * m.f) };
}

/** Largest singular value of the linear part: the most a unit step can be stretched. */
export function affineStretch(m: Affine2d): number {
  const p = m.a * m.a + m.b * m.b + m.d * m.d + m.e * m.e;
  const det = m.a * m.e - m.b * m.d;
  return Math.sqrt((p + Math.sqrt(Math.max(0, p * p - 4 * det * det))) / 2);
}
