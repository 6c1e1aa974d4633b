import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';

/** A seeded stream of random numbers (pure-rand's xoroshiro128+ underneath). */
export interface SeededRandom {
  /** Uniform on [0, 1). */
  uniform(): number;
  /** Standard normal (Box–Muller, pairs cached). */
  normal(): number;
}

/** Mixes a seed with a stream number into one 32-bit seed (the murmur3 finaliser), so streams are unrelated. */
export function mixSeed(seed: number, stream: number): number {
  let h = (seed ^ Math.imul(stream + 0x9e3779b9, 0x85ebca6b)) >>> 0;
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h | 0;
}

/** Creates a deterministic random stream for (seed, stream); the same pair always gives the same numbers. */
export function seededRandom(seed: number, stream: number): SeededRandom {
  const rng = xoroshiro128plus(mixSeed(seed, stream));
  let spare = NaN;
  const uniform = (): number => (rng.next() >>> 0) / 4294967296;
  return {
    uniform,
    normal(): number {
      if (!Number.isNaN(spare)) {
        const s = spare;
        spare = NaN;
        return s;
      }
      let u = uniform();
      while (u === 0) u = uniform();
      const v = uniform();
      const m = Math.sqrt(-2 * Math.log(u));
      spare = m * Math.sin(2 * Math.PI * v);
      return m * Math.cos(2 * Math.PI * v);
    },
  };
}
