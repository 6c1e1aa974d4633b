import { createReadStream } from 'node:fs';
import { stat } from 'node:fs/promises';
import { createHash } from 'node:crypto';

/** Size and SHA-256 of a file's content, read as a stream (constant memory); the signal stops the reading. */
export async function hashFile(path: string, options: { signal?: AbortSignal } = {}): Promise<{ size_bytes: number; sha256: string }> {
  const { size } = await stat(path);
  const hash = createHash('sha256');
  for await (const chunk of createReadStream(path, { signal: options.signal })) hash.update(chunk as Buffer);
  return { size_bytes: size, sha256: hash.digest('hex') };
}
