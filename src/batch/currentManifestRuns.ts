import { readFile } from 'node:fs/promises';
import { parse } from 'csv-parse/sync';
import { MANIFEST_CSV } from './parseManifest.js';
import { readRunRecords } from './rebuildSummary.js';

/** The run ids a manifest file lists now (its "run" column), or null when it cannot be read as one. */
async function listedRuns(path: string): Promise<Set<string> | null> {
  try {
    const rows = parse(await readFile(path), MANIFEST_CSV) as string[][];
    const column = (rows[0] ?? []).findIndex((h) => h.trim().toLowerCase() === 'run');
    if (column < 0) return null;
    return new Set(rows.slice(1).map((r) => (r[column] ?? '').trim()).filter((id) => id !== ''));
  } catch {
    return null;
  }
}

/**
 * The runs of a batch folder that its manifests still list: each run record names the manifest it came from, and
 * that file, read as it is now, lists the runs that belong (shards of one manifest all do, whichever of them ran
 * last; a row since deleted, or a run since renamed, does not). Runs whose manifest cannot be read (a results folder
 * copied elsewhere) are kept. `only` is undefined when nothing is left out.
 */
export async function currentManifestRuns(outDir: string): Promise<{ only: Set<string> | undefined; left_out: string[] }> {
  const { records } = await readRunRecords(outDir);
  const lists = new Map<string, Set<string> | null>();
  for (const r of records) if (r.manifest && !lists.has(r.manifest.path)) lists.set(r.manifest.path, await listedRuns(r.manifest.path));
  const belongs = (r: (typeof records)[number]) => {
    const ids = r.manifest ? lists.get(r.manifest.path) : null;
    return !ids || ids.has(r.run);
  };
  const left_out = records.filter((r) => !belongs(r)).map((r) => r.run).sort();
  return { only: left_out.length > 0 ? new Set(records.filter(belongs).map((r) => r.run)) : undefined, left_out };
}
