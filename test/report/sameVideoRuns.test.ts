// One recording listed under two file names must not pass for two replicates unnoticed.
import { describe, expect, it } from 'vitest';
import { sameVideoRuns } from '../../src/report/sameVideoRuns.js';
import type { RunRecord } from '../../src/batch/RunRecord.js';

const rec = (run: string, sha256: string, window: { from_s?: number | null; to_s?: number | null } = {}, status = 'ok') =>
  ({ run, status, input: { size_bytes: 10, sha256 }, settings: { track: { from_s: window.from_s ?? null, to_s: window.to_s ?? null } } }) as unknown as RunRecord;

describe('sameVideoRuns', () => {
  it('groups finished runs of identical content and window, and leaves other windows and failed runs alone', () => {
    const records = [rec('F1', 'aa'), rec('F2', 'bb'), rec('F1-copy', 'aa'), rec('F1-late', 'aa', { from_s: 4 }), rec('F1-failed', 'aa', {}, 'failed')];
    expect(sameVideoRuns(records)).toEqual([['F1', 'F1-copy']]);
    expect(sameVideoRuns([rec('F1', 'aa'), rec('F2', 'bb')])).toEqual([]);
  });
});
