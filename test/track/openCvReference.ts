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

/** The OpenCV module, initialised once per test file (wrapped: the module object is itself a thenable). */
export async function openCvReference(): Promise<Cv> {
  loaded ??= (async () => {
    // Node's own require: the vitest transform of the 10 MB wasm bundle is very slow
    const cv = createRequire(import.meta.url)('@techstark/opencv-js') as Cv;
    if (!cv.Mat) await new Promise<void>((resolve) => (cv.onRuntimeInitialized = resolve));
    return { cv };
  })();
  return (await loaded).cv;
}
