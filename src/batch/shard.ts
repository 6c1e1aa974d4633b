import { createHash } from 'node:crypto';
import { InputError } from '../errors.js';

/** One of n deterministic parts of a manifest: index 1..count. */
export interface Shard {
  index: number;
  count: number;
}

/** Parses "i/n" (1 ≤ i ≤ n), as given to --shard. */
export function parseShard(text: string): Shard {
  const m = /^\s*(\d+)\s*\/\s*(\d+)\s*$/.exec(text);
  const index = m ? Number(m[1]) : NaN;
  const count = m ? Number(m[2]) : NaN;
  if (!m || count < 1 || index < 1 || index > count) {
    throw new InputError(`--shard "${text}" is not a part of the manifest; write i/n with 1 ≤ i ≤ n, e.g. 2/8 for the second of eight parts`);
  }
  return { index, count };
}

/**
 * The shard (1..count) a run belongs to: the first 8 hex digits of SHA-256 of the run id, as an
 * unsigned integer, modulo count, plus one. Depends on the run id only, so adding, removing or
 * reordering rows never moves other runs between shards.
 */
export function shardOf(run: string, count: number): number {
  const h = createHash('sha256').update(run, 'utf8').digest();
  return (h.readUInt32BE(0) % count) + 1;
}
