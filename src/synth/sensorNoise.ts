import { mixSeed } from './seededRandom.js';

/**
 * Turns a float frame into bytes in one pass: each value times the lighting gain, plus zero-mean sensor
 * noise of standard deviation sigma (gray levels), rounded and clamped to 0–255. Fast on purpose: an inline
 * xorshift128 generator (Marsaglia, "Xorshift RNGs", J. Stat. Softw. 8(14), 2003) seeded from (seed, stream),
 * and an approximately normal deviate from the sum of eight uniform bytes (Irwin–Hall, variance
 * 8·(256² − 1)/12; tails end at ±4.9σ). The same (seed, stream) always gives the same bytes.
 */
export function noisyBytes(layer: Float32Array, gain: number, sigma: number, seed: number, stream: number): Uint8Array {
  const out = new Uint8Array(layer.length);
  if (sigma <= 0) {
    for (let i = 0; i < layer.length; i++) {
      const v = gain * layer[i] + 0.5;
      // floor(v + ½) rounds half up, like Math.round, for the positive values that reach it
      out[i] = v <= 0.5 ? 0 : v >= 255 ? 255 : v | 0;
    }
    return out;
  }
  let x = mixSeed(seed, stream) | 1;
  let y = mixSeed(seed, stream + 0x51ed) | 0;
  let z = mixSeed(seed, stream + 0x2b7e) | 0;
  let w = mixSeed(seed, stream + 0x7f4a) | 0;
  const mean = 8 * 127.5;
  const scale = sigma / Math.sqrt((8 * (256 * 256 - 1)) / 12);
  for (let i = 0; i < layer.length; i++) {
    let t = x ^ (x << 11);
    x = y; y = z; z = w;
    w = (w ^ (w >>> 19) ^ (t ^ (t >>> 8))) | 0;
    const a = w;
    t = x ^ (x << 11);
    x = y; y = z; z = w;
    w = (w ^ (w >>> 19) ^ (t ^ (t >>> 8))) | 0;
    const b = w;
    // sum of the eight bytes, two 16-bit lanes at a time (each lane ≤ 4·255, no overflow)
    const lanes = (a & 0x00ff00ff) + ((a >>> 8) & 0x00ff00ff) + (b & 0x00ff00ff) + ((b >>> 8) & 0x00ff00ff);
    const sum = (lanes & 0xffff) + (lanes >>> 16);
    const v = gain * layer[i] + (sum - mean) * scale + 0.5;
    out[i] = v <= 0.5 ? 0 : v >= 255 ? 255 : v | 0;
  }
  return out;
}
