import { realpath, stat } from 'node:fs/promises';
import { dirname, join, resolve } from 'node:path';
import { InputError } from '../errors.js';

/** A path made absolute with symbolic links followed as far as it exists (a missing file keeps its resolved name). */
async function canonical(path: string): Promise<string> {
  const full = resolve(path);
  try {
    return await realpath(full);
  } catch {
    try {
      return join(await realpath(dirname(full)), full.slice(dirname(full).length + 1));
    } catch {
      return full;
    }
  }
}

/**
 * Checks `fit --out` before any work: it must not be a folder, and neither fit.json nor the rate.csv
 * written beside it may be the angle table being read (a person's data is never written over).
 */
export async function checkFitOutputPaths(anglePath: string, outPath: string): Promise<void> {
  try {
    if ((await stat(outPath)).isDirectory()) throw new InputError(`--out ${outPath} is a folder; give the file to write, e.g. --out ${join(outPath, 'fit.json')}`);
  } catch (err) {
    if (err instanceof InputError) throw err; // a missing --out is the usual case
  }
  const input = await canonical(anglePath);
  const fitJson = await canonical(outPath);
  const rateCsv = join(dirname(fitJson), 'rate.csv');
  if (fitJson === input) throw new InputError(`--out ${outPath} is the angle table being fitted and would be written over; choose another --out, e.g. fit.json beside it`);
  if (rateCsv === input) throw new InputError(`--out ${outPath} puts rate.csv over the angle table being fitted (${anglePath}); choose --out in another folder`);
}
