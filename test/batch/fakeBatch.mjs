// Runs a batch with the fake processor from the compiled library (dist/), for tests that kill it.
// Usage: node fakeBatch.mjs <manifest> <out> [pauseAt]   (delay per run from FAKE_DELAY_MS)
// Prints "PAUSED <what>" on stdout when it reaches the pause point, then waits to be killed.
import { runBatch, runRecordFor, RevtraceError } from '../../dist/index.js';
import { writeFileAtomic } from '../../dist/writeFileAtomic.js';
import { makeFakeProcessor } from './fakeProcessor.mjs';

const [manifest, out, pauseAt] = process.argv.slice(2);
const processor = makeFakeProcessor(
  { writeFileAtomic, runRecordFor, RevtraceError },
  { delayMs: Number(process.env.FAKE_DELAY_MS ?? 0), pauseAt, onPause: (what) => process.stdout.write(`PAUSED ${what}\n`) },
);
const outcome = await runBatch(manifest, {
  out, jobs: 2, processor,
  onEvent: (e) => process.stdout.write(`${JSON.stringify(e)}\n`),
});
process.exitCode = outcome.failed.length > 0 ? 1 : 0;
