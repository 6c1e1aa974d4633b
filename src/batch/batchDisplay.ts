import cliProgress from 'cli-progress';
import type { BatchEvent } from './BatchEvent.js';
import { leftOutWords } from './leftOutWords.js';
import { decimalsToShow } from '../decimalsToShow.js';

/** How a batch shows what it does: live bars on a terminal, plain lines, only problems, or JSON lines. */
export type DisplayMode = 'bars' | 'lines' | 'quiet' | 'json';

export interface BatchDisplay {
  onEvent(event: BatchEvent): void;
  /** A line for a person (or, in json mode, an event object) outside the batch events. */
  note(text: string, json?: Record<string, unknown>): void;
  stop(): void;
}

function fmt(x: number | null, digits = 4): string {
  return x === null || !Number.isFinite(x) ? '?' : String(Number(x.toPrecision(digits)));
}

function seconds(s: number): string {
  if (!Number.isFinite(s) || s < 0) return '?';
  if (s < 90) return `${Math.round(s)} s`;
  return `${Math.floor(s / 60)} min ${String(Math.round(s % 60)).padStart(2, '0')} s`;
}

/** One sentence per event, as printed in lines mode (and above the bars). Null: nothing to print. */
export function describeEvent(e: BatchEvent): string | null {
  switch (e.type) {
    case 'plan': {
      const runs = `${e.runs} run${e.runs === 1 ? '' : 's'}`;
      const part = e.shard ? `shard ${e.shard.index}/${e.shard.count}: ${runs} of ${e.runs_in_manifest}` : runs;
      return `batch: ${part} → ${e.out_dir}, ${e.jobs} at a time`;
    }
    case 'cleaned': return `removed ${e.files.length} temporary file${e.files.length === 1 ? '' : 's'} left by an interrupted batch`;
    case 'stray': return `note: runs/ also holds ${leftOutWords(e.runs)}, not in this manifest; they are left out of the summary and the report (delete them if they are stale)`;
    case 'cached': return `${e.run}: unchanged since the last batch, kept (--force redoes it)`;
    case 'start': return `${e.run}: started`;
    case 'progress': return null;
    case 'done': {
      const d = decimalsToShow(e.se_deg_s ?? Number.NaN, 12, 3); // two significant digits of the standard error, as the report shows it
      const fixed = (x: number | null) => (x === null || !Number.isFinite(x) ? '?' : x.toFixed(d));
      const rate = e.rate_deg_s === null ? '' : `: ${e.model}, ${fixed(e.rate_deg_s)} deg/s (${fixed(e.lo_deg_s)} to ${fixed(e.hi_deg_s)})`;
      return `${e.run}: done in ${seconds(e.elapsed_s)}${rate}`;
    }
    case 'failed': return `${e.run}: FAILED: ${e.error}`;
    case 'summary': return `summary of ${e.runs} run${e.runs === 1 ? '' : 's'}: ${e.summary_csv}`;
    case 'interrupted': return `interrupted; ${e.unfinished.length} run${e.unfinished.length === 1 ? '' : 's'} not finished (run the same command again to resume)`;
  }
}

/** A display writing to `stream` (stderr for people, stdout for json). */
export function createBatchDisplay(mode: DisplayMode, stream: NodeJS.WritableStream, jsonStream: NodeJS.WritableStream = process.stdout): BatchDisplay {
  if (mode === 'json') {
    return {
      onEvent: (e) => jsonStream.write(`${JSON.stringify({ event: e.type, ...e, type: undefined, time: new Date().toISOString() })}\n`),
      note: (text, json) => jsonStream.write(`${JSON.stringify({ event: 'note', ...json, message: text, time: new Date().toISOString() })}\n`),
      stop: () => {},
    };
  }
  if (mode === 'lines' || mode === 'quiet') {
    const wanted = (e: BatchEvent) => mode === 'lines' || e.type === 'failed' || e.type === 'interrupted';
    return {
      onEvent: (e) => {
        const line = wanted(e) ? describeEvent(e) : null;
        if (line) stream.write(`${line}\n`);
      },
      note: (text) => stream.write(`${text}\n`),
      stop: () => {},
    };
  }
  const multi = new cliProgress.MultiBar(
    {
      stream,
      format: ' {name} |{bar}| {percentage}% | {detail}',
      hideCursor: true,
      clearOnComplete: false,
      barsize: 24,
      fps: 5,
    },
    cliProgress.Presets.shades_classic,
  );
  let overall: cliProgress.SingleBar | null = null;
  let stopped = false;
  let total = 0;
  let finished = 0;
  const active = new Map<string, { bar: cliProgress.SingleBar; started_ms: number }>();
  const name = (s: string) => (s.length > 16 ? `${s.slice(0, 15)}…` : s.padEnd(16));
  const endRun = (run: string) => {
    const a = active.get(run);
    if (a) {
      multi.remove(a.bar);
      active.delete(run);
    }
    finished++;
    overall?.update(finished, { detail: `${finished}/${total} runs` });
  };
  return {
    onEvent: (e) => {
      if (e.type === 'plan') {
        total = e.runs;
        overall = multi.create(Math.max(1, total), 0, { name: name('all runs'), detail: `0/${total} runs` });
      } else if (e.type === 'start') {
        const bar = multi.create(100, 0, { name: name(e.run), detail: 'starting' });
        active.set(e.run, { bar, started_ms: Date.now() });
      } else if (e.type === 'progress') {
        const a = active.get(e.run);
        if (!a) return;
        const elapsed_s = (Date.now() - a.started_ms) / 1000;
        const share = e.duration_s > 0 ? Math.min(1, e.t_s / e.duration_s) : 0;
        const fps = elapsed_s > 0 ? e.frames / elapsed_s : 0;
        const left_s = share > 0 ? (elapsed_s * (1 - share)) / share : NaN;
        a.bar.update(Math.round(share * 100), { detail: `${fmt(fps, 3)} frames/s, ${seconds(left_s)} left` });
      } else if (e.type === 'cached') {
        finished++;
        overall?.update(finished, { detail: `${finished}/${total} runs` });
      } else if (e.type === 'done' || e.type === 'failed') {
        endRun(e.run);
        const line = describeEvent(e);
        if (line) multi.log(`${line}\n`);
      } else {
        const line = describeEvent(e);
        if (line) multi.log(`${line}\n`);
      }
    },
    note: (text) => (stopped ? stream.write(`${text}\n`) : multi.log(`${text}\n`)),
    stop: () => {
      if (!stopped) multi.stop();
      stopped = true;
    },
  };
}
