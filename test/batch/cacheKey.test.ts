import { describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { cacheKey, canonicalJson } from '../../src/batch/cacheKey.js';
import { shardOf } from '../../src/batch/shard.js';

const input = { size_bytes: 1234, sha256: 'ab'.repeat(32) };
const settings = { track: { roi: null, marker: 'bright' }, fit: { model: 'steady', level: 0.95 } };

describe('cacheKey', () => {
  it('does not depend on the order of keys in the settings', () => {
    const reordered = { fit: { level: 0.95, model: 'steady' }, track: { marker: 'bright', roi: null } };
    expect(cacheKey({ input, settings: reordered, software_version: '1.0.0' })).toBe(cacheKey({ input, settings, software_version: '1.0.0' }));
    expect(canonicalJson(reordered)).toBe('{"fit":{"level":0.95,"model":"steady"},"track":{"marker":"bright","roi":null}}');
  });

  it('changes with the content hash, the size, any setting and the software version', () => {
    const base = cacheKey({ input, settings, software_version: '1.0.0' });
    expect(cacheKey({ input: { ...input, sha256: 'cd'.repeat(32) }, settings, software_version: '1.0.0' })).not.toBe(base);
    expect(cacheKey({ input: { ...input, size_bytes: 1235 }, settings, software_version: '1.0.0' })).not.toBe(base);
    expect(cacheKey({ input, settings: { ...settings, fit: { model: 'steady', level: 0.9 } }, software_version: '1.0.0' })).not.toBe(base);
    expect(cacheKey({ input, settings, software_version: '1.0.1' })).not.toBe(base);
  });
});

describe('shardOf', () => {
  it('follows the documented rule: first 4 bytes of SHA-256 of the run id, big-endian, mod n, plus 1', () => {
    // SHA-256 computed by Node's crypto (OpenSSL) as the reference
    for (const run of ['fwd-01', 'rev-01', 'F-040-a', 'x']) {
      const h = createHash('sha256').update(run).digest();
      const expected = (((h[0]! << 24) >>> 0) + (h[1]! << 16) + (h[2]! << 8) + h[3]!) % 7 + 1;
      expect(shardOf(run, 7)).toBe(expected);
    }
  });

  it('spreads 600 run ids over 3 shards roughly evenly', () => {
    const counts = [0, 0, 0];
    for (let i = 0; i < 600; i++) counts[shardOf(`run-${i}`, 3) - 1]!++;
    for (const c of counts) expect(c).toBeGreaterThan(150);
  });
});
