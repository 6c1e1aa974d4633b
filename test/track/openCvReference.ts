import { createRequire } from 'node:module';

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
