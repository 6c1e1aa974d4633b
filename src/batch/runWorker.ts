// Worker-thread entry: processes one job at a time with the real pipeline (see createWorkerPool.ts).
import { parentPort } from 'node:worker_threads';
import { RevtraceError } from '../errors.js';
import type { FromWorker, ToWorker } from './createWorkerPool.js';
import { processRun } from './processRun.js';

if (!parentPort) throw new Error('runWorker.js must run as a worker thread');
const port = parentPort;
let controller: AbortController | null = null;

port.on('message', (m: ToWorker) => {
  if (m.type === 'cancel') {
    controller?.abort(new Error('cancelled'));
    return;
  }
  controller = new AbortController();
  const signal = controller.signal;
  processRun(m.job, signal, (progress) => port.postMessage({ type: 'progress', progress } satisfies FromWorker)).then(
    (record) => port.postMessage({ type: 'done', record } satisfies FromWorker),
    (err: unknown) => {
      const e = err instanceof Error ? err : new Error(String(err));
      const exitCode = err instanceof RevtraceError ? err.exitCode : 1;
      port.postMessage({ type: 'error', name: e.name, message: e.message, exitCode, stack: e.stack } satisfies FromWorker);
    },
  );
});
