import { Worker } from 'node:worker_threads';
import { RevtraceError } from '../errors.js';
import type { RunJob, RunProcessor, RunProgress } from './RunJob.js';
import type { RunRecord } from './RunRecord.js';

/** Messages between the pool and a worker thread (see runWorker.ts). */
export type ToWorker = { type: 'run'; job: RunJob } | { type: 'cancel' };
export type FromWorker =
  | { type: 'progress'; progress: RunProgress }
  | { type: 'done'; record: RunRecord }
  | { type: 'error'; name: string; message: string; exitCode: number; stack?: string };

/** An error raised inside a worker thread, carried back with its name and exit code. */
export class WorkerRunError extends RevtraceError {
  readonly originalName: string;
  constructor(name: string, message: string, exitCode: number) {
    super(message, exitCode);
    this.originalName = name;
  }
}

/** How long a cancelled run may take to stop by itself before its thread is terminated, ms. */
const CANCEL_GRACE_MS = 1500;

export interface WorkerPool {
  processor: RunProcessor;
  /** Stops every worker thread. */
  close(): Promise<void>;
}

/**
 * A processor that runs each job in a worker thread (so CPU-bound tracking of several runs uses
 * several cores). At most `size` threads exist; each does one job at a time and is reused.
 */
export function createWorkerPool(script: URL, size: number): WorkerPool {
  const idle: Worker[] = [];
  const all = new Set<Worker>();
  let closed = false;

  const take = (): Worker => {
    const w = idle.pop();
    if (w) return w;
    const created = new Worker(script);
    all.add(created);
    return created;
  };

  const processor: RunProcessor = (job, signal, onProgress) =>
    new Promise<RunRecord>((resolvePromise, rejectPromise) => {
      if (signal.aborted) {
        rejectPromise(signal.reason);
        return;
      }
      const worker = take();
      const finish = (reuse: boolean) => {
        worker.off('message', onMessage);
        worker.off('error', onError);
        worker.off('exit', onExit);
        signal.removeEventListener('abort', onAbort);
        clearTimeout(grace);
        if (reuse && !closed && idle.length < size) idle.push(worker);
        else {
          all.delete(worker);
          void worker.terminate();
        }
      };
      const onMessage = (m: FromWorker) => {
        if (m.type === 'progress') onProgress(m.progress);
        else if (m.type === 'done') {
          finish(true);
          resolvePromise(m.record);
        } else {
          finish(true);
          if (signal.aborted) rejectPromise(signal.reason);
          else rejectPromise(new WorkerRunError(m.name, m.message, m.exitCode));
        }
      };
      const onError = (err: Error) => {
        finish(false);
        rejectPromise(signal.aborted ? signal.reason : new RevtraceError(`the worker thread processing this run failed: ${err.message}`));
      };
      const onExit = (code: number) => {
        all.delete(worker);
        finish(false);
        rejectPromise(signal.aborted ? signal.reason : new RevtraceError(`the worker thread processing this run stopped unexpectedly (exit code ${code})`));
      };
      let grace: NodeJS.Timeout | undefined;
      const onAbort = () => {
        worker.postMessage({ type: 'cancel' } satisfies ToWorker);
        // a run that does not stop within the grace period is stopped with its thread
        grace = setTimeout(() => {
          finish(false);
          rejectPromise(signal.reason);
        }, CANCEL_GRACE_MS);
      };
      worker.on('message', onMessage);
      worker.on('error', onError);
      worker.on('exit', onExit);
      signal.addEventListener('abort', onAbort, { once: true });
      worker.postMessage({ type: 'run', job } satisfies ToWorker);
    });

  return {
    processor,
    async close() {
      closed = true;
      idle.length = 0;
      await Promise.all([...all].map((w) => w.terminate()));
      all.clear();
    },
  };
}
