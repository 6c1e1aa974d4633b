import { mkdir, stat } from 'node:fs/promises';
import { dirname, resolve } from 'node:path';

/** How many times makeFolders starts again when a parallel run removes a level it has just seen. */
const ATTEMPTS = 5;

/**
 * Creates `dir` and any missing parents, one level at a time, and returns the levels it made (outermost first). Node 20's `mkdir(…, { recursive: true })`
 * spins forever on some paths (for example under /proc), so revtrace never uses it; an error here
 * is the ordinary file-system error of the first level that could not be made. A level that vanishes
 * between the look and the mkdir (a parallel run removing its empty probe folders) makes it start again.
 */
export async function makeFolders(dir: string): Promise<string[]> {
  const made: string[] = [];
  for (let attempt = 1; ; attempt++) {
    try {
      for (const level of await missingLevels(dir)) {
        try {
          await mkdir(level);
          if (!made.includes(level)) made.push(level);
        } catch (err) {
          if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw err; // made meanwhile by a parallel run
        }
      }
      return made;
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== 'ENOENT' || attempt >= ATTEMPTS) throw err;
    }
  }
}

/** The levels of `dir` that do not exist yet, outermost first. */
async function missingLevels(dir: string): Promise<string[]> {
  const missing: string[] = [];
  let here = resolve(dir);
  for (;;) {
    try {
      const s = await stat(here);
      if (!s.isDirectory()) throw Object.assign(new Error(`${here} is not a folder`), { code: 'ENOTDIR' });
      break;
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== 'ENOENT') throw err;
      missing.push(here);
      const up = dirname(here);
      if (up === here) break;
      here = up;
    }
  }
  return missing.reverse();
}
