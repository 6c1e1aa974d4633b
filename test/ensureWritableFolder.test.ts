// ensureWritableFolder: a writable place passes and is left as it was; an unwritable one is one sentence naming the option.
import { describe, expect, it } from 'vitest';
import { mkdtemp, readdir, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ensureWritableFolder } from '../src/ensureWritableFolder.js';
import { InputError } from '../src/errors.js';

describe('ensureWritableFolder', () => {
  it('passes a writable place and leaves no probe file and no new folder behind', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-writable-'));
    await ensureWritableFolder(dir, '--out');
    await ensureWritableFolder(join(dir, 'new', 'deeper'), '--out');
    expect(await readdir(dir)).toEqual([]);
  });

  it('names the option and the reason when a plain file stands in the way', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-writable-'));
    await writeFile(join(dir, 'f'), 'x');
    const err = await ensureWritableFolder(join(dir, 'f', 'out'), '--out').catch((e: unknown) => e);
    expect(err).toBeInstanceOf(InputError);
    expect((err as InputError).message).toBe(`cannot write to --out ${join(dir, 'f', 'out')} (part of the path is a file, not a folder); choose a folder you can write to`);
    expect(await readdir(dir)).toEqual(['f']);
  });
});
