// A stand-in worker thread for createWorkerPool tests. The job's run id says what to do:
// "ok-*" answers with a record after two progress messages, "throw-*" reports an error,
// "crash-*" exits the thread, "hang-*" ignores cancel and never answers, "slow-*" stops on cancel.
import { parentPort, threadId } from 'node:worker_threads';

let pending = null;
parentPort.on('message', (m) => {
  if (m.type === 'cancel') {
    if (pending) {
      clearTimeout(pending);
      pending = null;
      parentPort.postMessage({ type: 'error', name: 'AbortError', message: 'cancelled', exitCode: 1 });
    }
    return;
  }
  const run = m.job.run;
  if (run.startsWith('ok-')) {
    parentPort.postMessage({ type: 'progress', progress: { frames: 1, t_s: 0.5, duration_s: 1 } });
    parentPort.postMessage({ type: 'progress', progress: { frames: 2, t_s: 1, duration_s: 1 } });
    parentPort.postMessage({ type: 'done', record: { run, status: 'ok', thread: threadId } });
  } else if (run.startsWith('throw-')) {
    parentPort.postMessage({ type: 'error', name: 'TrackingError', message: 'the marker was never found', exitCode: 1 });
  } else if (run.startsWith('crash-')) {
    process.exit(3);
  } else if (run.startsWith('slow-')) {
    pending = setTimeout(() => parentPort.postMessage({ type: 'done', record: { run, status: 'ok' } }), 10_000);
  }
  // hang-*: never answers
});
