// makeFolders: parents made one level at a time, with the ordinary file-system error where a level cannot be made.
import { describe, expect, it, vi } from 'vitest';
import { mkdtemp, rmdir, stat, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { makeFolders } from '../src/makeFolders.js';

/** Runs once before the real mkdir of `path`: stands in for a parallel run acting between makeFolders' look and its mkdir. */
const beforeMkdir = new Map<string, () => Promise<void>>();
vi.mock('node:fs/promises', async (importOriginal) => {
  const real = await importOriginal<typeof import('node:fs/promises')>();
  return {
    ...real,
    mkdir: async (path: string, ...rest: []) => {
      const hook = beforeMkdir.get(String(path));
      beforeMkdir.delete(String(path));
      if (hook) await hook();
      return real.mkdir(path, ...rest);
    },
  };
});

describe('makeFolders', () => {
  it('makes every missing level and accepts folders that already exist', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-folders-'));
    const deep = join(dir, 'a', 'b', 'c');
    expect(await makeFolders(deep)).toEqual([join(dir, 'a'), join(dir, 'a', 'b'), deep]);
    expect((await stat(deep)).isDirectory()).toBe(true);
    expect(await makeFolders(deep)).toEqual([]);
    await makeFolders(dir);
  });

  it('starts again when a parallel run removes a level it has just made (shards sharing one --out)', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-folders-'));
    const deep = join(dir, 'a', 'b');
    beforeMkdir.set(deep, () => rmdir(join(dir, 'a'))); // the other run removes its empty probe folder
    expect(await makeFolders(deep)).toEqual([join(dir, 'a'), deep]);
    expect((await stat(deep)).isDirectory()).toBe(true);
  });

  it('fails with ENOTDIR when a level is a plain file', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-folders-'));
    await writeFile(join(dir, 'f'), 'x');
    await expect(makeFolders(join(dir, 'f', 'sub'))).rejects.toMatchObject({ code: 'ENOTDIR' });
  });

  it('fails (rather than spinning, as recursive mkdir does in Node 20) under /proc', async () => {
    // Linux procfs refuses new entries (proc(5), Linux man-pages).
    await expect(makeFolders('/proc/revtrace-none/sub')).rejects.toMatchObject({ code: 'ENOENT' });
  });
});
