import { describe, expect, it } from 'vitest';
import { mkdtemp, readdir, readFile, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeFileAtomic } from '../src/writeFileAtomic.js';

describe('writeFileAtomic', () => {
  it('replaces a file with the new content and leaves no temporary file behind', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-atomic-'));
    const target = join(dir, 'out.json');
    await writeFile(target, 'old');
    await writeFileAtomic(target, '{"new":true}');
    expect(await readFile(target, 'utf8')).toBe('{"new":true}');
    expect(await readdir(dir)).toEqual(['out.json']);
  });

  it('creates missing parent folders', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-atomic-'));
    const target = join(dir, 'a', 'b', 'c.txt');
    await writeFileAtomic(target, new Uint8Array([104, 105]));
    expect(await readFile(target, 'utf8')).toBe('hi');
  });
});
