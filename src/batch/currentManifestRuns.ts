import { stat } from 'node:fs/promises';
import { join } from 'node:path';
import { readRunRecords } from './rebuildSummary.js';

/**
 * The runs of a batch folder that belong to its current manifest: when the run records name more than one
 * manifest (another file, or an earlier version of the same one — a row since deleted or renamed), the current
 * one is that of the most recently written run.json (a batch rewrites the record of every run it keeps, cached
 * or not, when its manifest changed). `only` is undefined when there is nothing to leave out; records that name
 * no manifest always count.
 */
export async function currentManifestRuns(outDir: string): Promise<{ only: Set<string> | undefined; left_out: string[] }> {
  const { records } = await readRunRecords(outDir);
  const versionOf = (r: (typeof records)[number]) => (r.manifest ? `${r.manifest.path}\n${r.manifest.sha256}` : null);
  const versions = new Set(records.map(versionOf).filter((v): v is string => v !== null));
  if (versions.size < 2) return { only: undefined, left_out: [] };
  let newest = { version: '', mtime: -Infinity };
  for (const r of records) {
    const version = versionOf(r);
    if (version === null) continue;
    const mtime = (await stat(join(outDir, 'runs', r.run, 'run.json'))).mtimeMs;
    if (mtime > newest.mtime) newest = { version, mtime };
  }
  const only = new Set(records.filter((r) => versionOf(r) === null || versionOf(r) === newest.version).map((r) => r.run));
  return { only, left_out: records.filter((r) => !only.has(r.run)).map((r) => r.run).sort() };
}
