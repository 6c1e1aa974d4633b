// OpenCV (npm @techstark/opencv-js, OpenCV 4.5 compiled to WebAssembly), loaded once per process.
import type * as OpenCv from '@techstark/opencv-js';

/** The initialised OpenCV module (the `cv` namespace). */
export type Cv = typeof OpenCv;

let loading: Promise<Cv> | undefined;

/**
 * Loads OpenCV once and resolves when its WebAssembly runtime is initialised (`cv.Mat` usable).
 * The module object is thenable in this build (an Emscripten `then` that resolves to itself), so
 * readiness is taken from `onRuntimeInitialized` and the `then` is removed before the module is
 * returned: a promise resolving to a thenable that yields itself would never settle.
 */
export function loadOpenCv(): Promise<Cv> {
  loading ??= (async () => {
    const mod = (await import('@techstark/opencv-js')) as unknown as { default: Cv & { Mat?: unknown; onRuntimeInitialized?: () => void } };
    const cv = mod.default as Cv & { Mat?: unknown; onRuntimeInitialized?: () => void; then?: unknown };
    if (!cv.Mat) {
      await new Promise<void>((resolve) => {
        cv.onRuntimeInitialized = resolve;
      });
    }
    delete cv.then;
    return cv;
  })();
  loading.catch(() => { loading = undefined; });
  return loading;
}
