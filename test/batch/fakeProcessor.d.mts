import type { RunProcessor } from '../../src/batch/RunJob.js';

export interface FakeProcessorOptions {
  delayMs?: number;
  pauseAt?: string;
  onPause?: (what: string) => void;
  calls?: string[];
}

export function makeFakeProcessor(deps: { writeFileAtomic: unknown; runRecordFor: unknown; RevtraceError: unknown }, options?: FakeProcessorOptions): RunProcessor;
