// A stand-in for the real per-run processor, for testing the batch machinery (validation, cache,
// resume, shards) without decoding video. Its "videos" are small text files: `rate=<deg/s>` gives a
// run whose steady rate is that value ±1 deg/s; `fail=<reason>` makes the run fail with that reason.
// Dependencies are passed in so the same code runs from the TypeScript sources (vitest) and from
// dist/ (a child process that a test kills).
import { readFile, open } from 'node:fs/promises';
import { join } from 'node:path';

const sleep = (ms, signal) =>
  new Promise((resolve, reject) => {
    if (signal?.aborted) return reject(signal.reason);
    const onAbort = () => { clearTimeout(t); reject(signal.reason); };
    const t = setTimeout(() => { signal?.removeEventListener('abort', onAbort); resolve(); }, ms);
    signal?.addEventListener('abort', onAbort, { once: true });
  });

/**
 * @param deps { writeFileAtomic, runRecordFor, RevtraceError }
 * @param options { delayMs?: number, pauseAt?: string ("<run>:decode" | "<run>:midwrite"), onPause?: (what) => void, calls?: string[] }
 */
export function makeFakeProcessor(deps, options = {}) {
  const { writeFileAtomic, runRecordFor, RevtraceError } = deps;
  const delayMs = options.delayMs ?? 0;
  return async (job, signal, onProgress) => {
    options.calls?.push(job.run);
    const started = new Date();
    const text = (await readFile(job.video_abs, 'utf8')).trim();
    for (let i = 1; i <= 4; i++) {
      await sleep(delayMs / 4, signal);
      onProgress({ frames: i * 10, t_s: i * 0.5, duration_s: 2 });
    }
    if (options.pauseAt === `${job.run}:decode`) {
      options.onPause?.(options.pauseAt);
      await sleep(1e9, signal);
    }
    if (text.startsWith('fail=')) throw new RevtraceError(text.slice(5));
    const rate = Number(/^rate=(.*)$/.exec(text)?.[1]);
    if (!Number.isFinite(rate)) throw new RevtraceError(`the fake video ${job.video} has no rate= line`);
    const est = (v) => ({ value: v, se: 0.5, ci: [v - 1, v + 1], level: 0.95 });
    const fit = {
      model: 'steady', window_s: [0, 2], n: 40, method: 'fake fit for tests', selection: undefined,
      diagnostics: { residual_autocorrelation: [0.1], lost_share: 0, residual_rms_deg: 0.2, warnings: [] },
      steady: { rate_deg_s: est(rate), rate_rpm: { value: rate / 6, se: 0.5 / 6, ci: [(rate - 1) / 6, (rate + 1) / 6], level: 0.95 }, rate_rev_s: est(rate / 360), segments: [], zero_test: { p_value: 0.001, p_sign: 0.0005, statistic: 10, df: 39 }, min_detectable_deg_s: 0.3 },
      software: { name: 'revtrace', version: 'test' },
    };
    const angleCsv = ['frame,t_s,angle_deg', ...Array.from({ length: 40 }, (_, i) => `${i},${(i * 0.05).toFixed(2)},${(rate * i * 0.05).toFixed(4)}`)].join('\n') + '\n';
    if (options.pauseAt === `${job.run}:midwrite`) {
      // a write interrupted half-way: the temporary file exists with part of the content
      const handle = await open(join(job.run_dir, `.angle.csv.${process.pid}.deadbeef.tmp`), 'w');
      await handle.write(angleCsv.slice(0, angleCsv.length / 2));
      await handle.sync();
      await handle.close();
      options.onPause?.(options.pauseAt);
      await sleep(1e9, signal);
    }
    await writeFileAtomic(join(job.run_dir, 'angle.csv'), angleCsv);
    await sleep(delayMs / 4, signal);
    await writeFileAtomic(join(job.run_dir, 'track.json'), JSON.stringify({ fake: true, run: job.run }));
    await writeFileAtomic(join(job.run_dir, 'fit.json'), JSON.stringify(fit));
    await writeFileAtomic(join(job.run_dir, 'rate.csv'), `t_s,rate_deg_s\n0,${rate}\n`);
    await writeFileAtomic(join(job.run_dir, 'preview.png'), new Uint8Array([137, 80, 78, 71]));
    const finished = new Date();
    return runRecordFor(job, {
      status: 'ok', error: null, fit, lost_share: 0, warnings: [],
      started_at: started.toISOString(), finished_at: finished.toISOString(), elapsed_s: (finished - started) / 1000,
      outputs: ['angle.csv', 'track.json', 'fit.json', 'rate.csv', 'preview.png'],
    });
  };
}
