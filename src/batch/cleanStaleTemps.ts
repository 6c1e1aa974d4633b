import { readdir, rm } from 'node:fs/promises';
import { join } from 'node:path';

/** Whether a file name is a temporary file left by writeFileAtomic (".<name>.<pid>.<hex>.tmp"). */
export function isTempName(name: string): boolean {
  return /^\..+\.tmp$/.test(name);
}

/** Removes temporary files (never anything else) directly inside each folder; returns the paths removed. */
export async function cleanStaleTemps(folders: string[]): Promise<string[]> {
  const removed: string[] = [];
  for (const folder of folders) {
    let names: string[];
    try {
      names = (await readdir(folder, { withFileTypes: true })).filter((d) => d.isFile() && isTempName(d.name)).map((d) => d.name);
    } catch {
      continue;
    }
    for (const name of names) {
      await rm(join(folder, name), { force: true });
      removed.push(join(folder, name));
    }
  }
  return removed;
}
