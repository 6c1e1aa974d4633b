import { open, rm, rmdir } from 'node:fs/promises';
import { makeFolders } from './makeFolders.js';
import { join } from 'node:path';
import { randomBytes } from 'node:crypto';
import { InputError } from './errors.js';

/** How a file-system error code reads to a person. */
function reason(code: string | undefined): string {
  switch (code) {
    case 'EACCES':
    case 'EPERM':
      return 'permission denied';
    case 'EROFS':
      return 'the file system is read-only';
    case 'ENOTDIR':
    case 'EEXIST':
      return 'part of the path is a file, not a folder';
    case 'ENOSPC':
      return 'the disk is full';
    case 'ENOENT':
      return 'nothing can be created there';
    default:
      return code ?? 'not writable';
  }
}

/** How many times the probe is tried again when a parallel run removes the folder between its making and the probe. */
const ATTEMPTS = 5;

/**
 * Proves `dir` writable by creating (and removing again) any missing levels and an empty probe file,
 * so a command fails in its first second with one sentence naming `option` rather than after the
 * work, and a command that fails later leaves no empty folder behind. Parallel runs on one folder
 * (shards) each remove only the levels they made, and only while empty; a probe that finds its
 * folder gone for that reason is tried again.
 */
export async function ensureWritableFolder(dir: string, option: string): Promise<void> {
  const made: string[] = [];
  try {
    for (let attempt = 1; ; attempt++) {
      for (const level of await makeFolders(dir)) if (!made.includes(level)) made.push(level);
      try {
        const probe = join(dir, `.revtrace-write-probe.${process.pid}.${randomBytes(4).toString('hex')}.tmp`);
        const handle = await open(probe, 'wx');
        await handle.close();
        await rm(probe, { force: true });
        return;
      } catch (err) {
        if ((err as NodeJS.ErrnoException).code !== 'ENOENT' || attempt >= ATTEMPTS) throw err;
      }
    }
  } catch (err) {
    throw new InputError(`cannot write to ${option} ${dir} (${reason((err as NodeJS.ErrnoException).code)}); choose a folder you can write to`, { cause: err });
  } finally {
    for (const level of made.reverse()) await rmdir(level).catch(() => {}); // a parallel run may have filled it meanwhile
  }
}
