import { createRequire } from 'node:module';
import { expect } from 'vitest';

// Loads @techstark/opencv-js (a general-purpose reference library from npm) for tests that compare against it.
export interface Cv {
  Mat: unknown;
  CV_32FC2: number;
  matFromArray(rows: number, cols: number, type: number, data: number[]): { delete(): void };
  fitEllipse(points: unknown): { center: { x: number; y: number }; size: { width: number; height: number }; angle: number };
  onRuntimeInitialized?: () => void;
}

let loaded: Promise<{ cv: Cv }> | undefined;

/**
 * The OpenCV module, initialised once per test file. It comes wrapped in `{ cv }` because the module
 * object is itself a thenable: returning it from an async function would never settle.
 */
export function openCvReference(): Promise<{ cv: Cv }> {
  loaded ??= (async () => {
    // loaded with Node's own require, outside vitest's module transform
    const cv = createRequire(import.meta.url)('@techstark/opencv-js') as Cv;
    if (!cv.Mat) await new Promise<void>((resolve) => (cv.onRuntimeInitialized = resolve));
    return { cv };
  })();
  return loaded;
}

/** An ellipse as revtrace reports it: centre, semi-axes (px) and major-axis direction (deg, counterclockwise as displayed). */
interface EllipseLike { cx_px: number; cy_px: number; semi_major_px: number; semi_minor_px: number; major_axis_deg: number }

/**
 * Fits the same points with OpenCV's cv.fitEllipse and expects `e` to agree: centre to 0.05 px, full axes to
 * 0.5 px, major-axis direction to 0.5°. OpenCV reports full axes and the width axis angle clockwise as displayed.
 */
export async function expectAgreesWithOpenCvEllipse(e: EllipseLike, x_px: Float64Array, y_px: Float64Array): Promise<void> {
  const { cv } = await openCvReference();
  const flat: number[] = [];
  for (let i = 0; i < x_px.length; i++) flat.push(x_px[i], y_px[i]);
  const mat = cv.matFromArray(x_px.length, 1, cv.CV_32FC2, flat);
  let ref;
  try {
    ref = cv.fitEllipse(mat);
  } finally {
    mat.delete();
  }
  expect(e.cx_px).toBeCloseTo(ref.center.x, 1);
  expect(e.cy_px).toBeCloseTo(ref.center.y, 1);
  expect(2 * e.semi_major_px).toBeCloseTo(Math.max(ref.size.width, ref.size.height), 0);
  expect(2 * e.semi_minor_px).toBeCloseTo(Math.min(ref.size.width, ref.size.height), 0);
  // OpenCV angle of the major axis, clockwise as displayed → counterclockwise, folded to (−90, 90]
  let refMajor = ref.size.width >= ref.size.height ? -ref.angle : -(ref.angle + 90);
  refMajor -= 180 * Math.round(refMajor / 180);
  expect(Math.abs(e.major_axis_deg - refMajor)).toBeLessThan(0.5);
}
