import { describe, expect, it } from 'vitest';
import { mkdtemp, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { hashFile } from '../../src/video/hashFile.js';

describe('hashFile', () => {
  it('gives the published SHA-256 of "abc"', async () => {
    // Reference: FIPS 180-2, Appendix B.1 (SHA-256 of the message "abc").
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-hash-'));
    const file = join(dir, 'abc.txt');
    await writeFile(file, 'abc');
    expect(await hashFile(file)).toEqual({
      size_bytes: 3,
      sha256: 'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad',
    });
  });
});
