import { mkdir, stat } from 'node:fs/promises';
import { dirname, resolve } from 'node:path';

/**
 * Creates `dir` and any missing parents, one level at a time, and returns the levels it made (outermost first). Node 20's `mkdir(…, { recursive: true })`
 * spins forever on some paths (for example under /proc), so revtrace never uses it; an error here
 * is the ordinary file-system error of the first level that could not be made.
 */
export async function makeFolders(dir: string): Promise<string[]> {
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
  const made: string[] = [];
  for (const level of missing.reverse()) {
    try {
      await mkdir(level);
      made.push(level);
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw err; // made meanwhile by a parallel run
    }
  }
  return made;
}
