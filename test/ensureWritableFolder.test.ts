// ensureWritableFolder: a writable place passes and is left as it was; an unwritable one is one sentence naming the option.
import { describe, expect, it, vi } from 'vitest';
import { mkdtemp, readdir, rmdir, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ensureWritableFolder } from '../src/ensureWritableFolder.js';
import { InputError } from '../src/errors.js';

/** Runs once before the next real open: stands in for a parallel run acting between the folder's making and the probe. */
let beforeOpen: (() => Promise<void>) | null = null;
vi.mock('node:fs/promises', async (importOriginal) => {
  const real = await importOriginal<typeof import('node:fs/promises')>();
  return {
    ...real,
    open: async (...args: Parameters<typeof real.open>) => {
      const hook = beforeOpen;
      beforeOpen = null;
      if (hook) await hook();
      return real.open(...args);
    },
  };
});

describe('ensureWritableFolder', () => {
  it('passes a writable place and leaves no probe file and no new folder behind', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-writable-'));
    await ensureWritableFolder(dir, '--out');
    await ensureWritableFolder(join(dir, 'new', 'deeper'), '--out');
    expect(await readdir(dir)).toEqual([]);
  });

  it('passes when a parallel run (another shard on the same --out) removes the folder just before the probe', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-writable-'));
    const out = join(dir, 'out');
    beforeOpen = () => rmdir(out); // the other shard made out/ too and removes it, empty, after its own probe
    await ensureWritableFolder(out, '--out');
    expect(beforeOpen).toBeNull();
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
