import { open, rename, rm } from 'node:fs/promises';
import { makeFolders } from './makeFolders.js';
import { dirname, basename, join } from 'node:path';
import { randomBytes } from 'node:crypto';

/**
 * Writes a file so that a reader never sees it half-written: the content goes to a temporary file
 * in the same folder, is flushed to disk, then renamed over the target (rename is atomic on POSIX).
 */
export async function writeFileAtomic(path: string, content: string | Uint8Array): Promise<void> {
  await makeFolders(dirname(path));
  const tmp = join(dirname(path), `.${basename(path)}.${process.pid}.${randomBytes(4).toString('hex')}.tmp`);
  const handle = await open(tmp, 'w');
  try {
    await handle.writeFile(content);
    await handle.sync();
  } catch (err) {
    await handle.close();
    await rm(tmp, { force: true });
    throw err;
  }
  await handle.close();
  try {
    await rename(tmp, path);
  } catch (err) {
    await rm(tmp, { force: true });
    throw err;
  }
}
