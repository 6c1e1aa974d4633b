// The report's data-quality notes: one sentence each, naming what a person can check.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadReportData } from '../../src/report/loadReportData.js';
import { qualityNotes } from '../../src/report/qualityNotes.js';
import type { RunData } from '../../src/report/ReportData.js';
import { SMALL_DAY, writeTestBatch } from './writeTestBatch.js';

let dir: string;
let run: RunData;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'revtrace-notes-'));
  await writeTestBatch(dir, SMALL_DAY.slice(0, 1));
  run = (await loadReportData(dir)).runs[0]!;
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('qualityNotes, correlated residuals', () => {
  it('is one sentence, without the method paragraph, and for a coast-down also names a model that misses the data', () => {
    const correlated = (model: string): RunData => ({ ...run, fit: { ...run.fit!, model, method: 'A LONG METHOD PARAGRAPH.', diagnostics: { ...run.fit!.diagnostics, residual_autocorrelation: [0.93, 0.8] } } as RunData['fit'] });
    const note = (model: string) => qualityNotes(correlated(model)).find((n) => n.label === 'correlated residuals')!.words;
    expect(note('steady')).toBe('Residuals are strongly correlated from frame to frame (lag-1 correlation 0.93): the rotor does not turn perfectly evenly or the marker wobbles; the intervals allow for correlated noise (see Methods).');
    expect(note('spindown')).toContain('the marker wobbles, or the model does not follow the data;');
    expect(note('spindown')).not.toContain('METHOD');
  });
});
