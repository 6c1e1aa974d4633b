// Test helper: tracking errors against the renderer's truth, with the arbitrary zero of the angle removed.

/** Tracked minus true angle for every kept frame (`frames` index the truth), less their mean, deg. */
export function offsetRemovedErrors(frames: Int32Array, got: Float64Array, truth: Float64Array): number[] {
  const d: number[] = [];
  for (let i = 0; i < frames.length; i++) if (Number.isFinite(got[i])) d.push(got[i] - truth[frames[i]]);
  const mean = d.reduce((s, v) => s + v, 0) / d.length;
  return d.map((v) => v - mean);
}

/** Root mean square. */
export const rms = (a: number[]): number => Math.sqrt(a.reduce((s, v) => s + v * v, 0) / a.length);
