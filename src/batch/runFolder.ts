import { readFile, rm, stat } from 'node:fs/promises';
import { makeFolders } from '../makeFolders.js';
import { join } from 'node:path';
import { writeFileAtomic } from '../writeFileAtomic.js';
import { cleanStaleTemps } from './cleanStaleTemps.js';
import type { RunRecord } from './RunRecord.js';

/** The files a run may write into runs/<run>/ besides run.json (the commit marker, written last). */
export const RUN_OUTPUT_FILES = ['angle.csv', 'track.json', 'fit.json', 'rate.csv', 'preview.png'] as const;

/** Reads runs/<run>/run.json, or null when the run was never committed or the file is unreadable. */
export async function readCommittedRecord(runDir: string): Promise<RunRecord | null> {
  try {
    return JSON.parse(await readFile(join(runDir, 'run.json'), 'utf8')) as RunRecord;
  } catch {
    return null;
  }
}

/** Whether every output a committed ok record lists is still present. */
export async function outputsPresent(runDir: string, record: RunRecord): Promise<boolean> {
  for (const name of record.outputs ?? []) {
    try {
      if (!(await stat(join(runDir, name))).isFile()) return false;
    } catch {
      return false;
    }
  }
  return true;
}

/**
 * Makes runs/<run>/ ready for a fresh run: removes run.json first (so an interruption from here on
 * leaves the run uncommitted), then the known outputs and any temporary files. Nothing else is touched.
 */
export async function resetRunFolder(runDir: string): Promise<void> {
  await makeFolders(runDir);
  await rm(join(runDir, 'run.json'), { force: true });
  for (const name of RUN_OUTPUT_FILES) await rm(join(runDir, name), { force: true });
  await cleanStaleTemps([runDir]);
}

/** Commits a run: writes run.json atomically, after every other output. */
export async function commitRecord(runDir: string, record: RunRecord): Promise<void> {
  await writeFileAtomic(join(runDir, 'run.json'), `${JSON.stringify(record, null, 2)}\n`);
}
