import { createHash } from 'node:crypto';

/** JSON with object keys sorted at every level, so equal settings always give equal text. */
export function canonicalJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`;
  if (value !== null && typeof value === 'object') {
    const entries = Object.entries(value as Record<string, unknown>).filter(([, v]) => v !== undefined).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`;
  }
  return JSON.stringify(value);
}

/** What decides whether a run's outputs are still valid. */
export interface CacheKeyInput {
  input: { size_bytes: number; sha256: string };
  settings: unknown;
  software_version: string;
}

/** The cache key of a run: SHA-256 (hex) of the input's size and hash, the effective settings and the software version. */
export function cacheKey(k: CacheKeyInput): string {
  return createHash('sha256').update(canonicalJson({ input: k.input, settings: k.settings, software_version: k.software_version })).digest('hex');
}
