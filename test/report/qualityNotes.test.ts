// The report's data-quality notes: one sentence each, naming what a person can check.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { qualityNotes } from '../../src/report/qualityNotes.js';
import type { RunData } from '../../src/report/ReportData.js';
import { loadFirstTestRun } from './writeTestBatch.js';

let run: RunData;
let remove: () => Promise<void>;
beforeAll(async () => {
  ({ run, remove } = await loadFirstTestRun('notes'));
});
afterAll(async () => {
  await remove();
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
