import type { RunRecord } from '../batch/RunRecord.js';

/**
 * Groups of finished runs that measured the same video content (equal SHA-256) over the same window: pooled as
 * separate replicates they would count one recording two or more times. Each group lists run ids in record order.
 */
export function sameVideoRuns(records: readonly RunRecord[]): string[][] {
  const groups = new Map<string, string[]>();
  for (const r of records) {
    if (r.status !== 'ok' || !r.input?.sha256) continue;
    const track = (r.settings as { track?: { from_s?: number | null; to_s?: number | null } } | undefined)?.track;
    const key = `${r.input.sha256} ${track?.from_s ?? ''} ${track?.to_s ?? ''}`;
    groups.set(key, [...(groups.get(key) ?? []), r.run]);
  }
  return [...groups.values()].filter((g) => g.length > 1);
}
