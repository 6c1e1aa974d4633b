import { describe, expect, it } from 'vitest';
import { createWorkerPool } from '../../src/batch/createWorkerPool.js';
import type { RunJob, RunProgress } from '../../src/batch/RunJob.js';

const script = new URL('./stubWorker.mjs', import.meta.url);
const job = (run: string) => ({ run }) as RunJob;
const never = new AbortController().signal;

describe('createWorkerPool', () => {
  it('runs jobs in worker threads, forwards progress and reuses an idle thread for the next job', async () => {
    const pool = createWorkerPool(script, 2);
    try {
      const progress: RunProgress[] = [];
      const records = await Promise.all(['ok-1', 'ok-2', 'ok-3', 'ok-4'].map((r) => pool.processor(job(r), never, (p) => progress.push(p))));
      expect(records.map((r) => r.run)).toEqual(['ok-1', 'ok-2', 'ok-3', 'ok-4']);
      expect(progress.length).toBe(8);
      const more = await pool.processor(job('ok-5'), never, () => {});
      const threadOf = (r: unknown) => (r as { thread: number }).thread;
      const first = new Set(records.map(threadOf));
      expect(first.size).toBe(4); // four jobs at once: four threads
      expect(first.has(threadOf(more))).toBe(true); // the fifth job ran on one of them, kept idle
    } finally {
      await pool.close();
    }
  });

  it('turns an error in the thread into a rejection with its message, and a dead thread into a failed run', async () => {
    const pool = createWorkerPool(script, 1);
    try {
      await expect(pool.processor(job('throw-1'), never, () => {})).rejects.toThrow('the marker was never found');
      await expect(pool.processor(job('crash-1'), never, () => {})).rejects.toThrow(/the worker thread processing this run stopped unexpectedly \(exit code 3\)/);
      expect((await pool.processor(job('ok-after'), never, () => {})).run).toBe('ok-after');
    } finally {
      await pool.close();
    }
  });

  it('cancels a run on abort, and stops a thread that ignores the cancel after a grace period', async () => {
    const pool = createWorkerPool(script, 2);
    try {
      const a = new AbortController();
      const slow = pool.processor(job('slow-1'), a.signal, () => {});
      const hang = pool.processor(job('hang-1'), a.signal, () => {});
      setTimeout(() => a.abort(new Error('stop')), 50);
      await expect(slow).rejects.toThrow('stop');
      await expect(hang).rejects.toThrow('stop');
    } finally {
      await pool.close();
    }
  });
});
