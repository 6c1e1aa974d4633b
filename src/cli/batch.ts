import type { Command } from 'commander';
import type { DisplayMode } from '../batch/batchDisplay.js';
import { parseShard } from '../batch/shard.js';
import { globalOptions } from './globalOptions.js';
import { parseJobs } from './parseJobs.js';

interface BatchCliOptions {
  out?: string;
  jobs?: string;
  shard?: string;
  defaults?: string;
  force?: boolean;
  quiet?: boolean;
  json?: boolean;
}

/** `revtrace batch <manifest.csv>`: every run of a manifest, then summary.csv, batch.json and the report. */
export function registerBatch(program: Command): void {
  program
    .command('batch')
    .description('track and fit every run listed in a manifest (CSV), then write summary.csv, batch.json and report.html')
    .argument('<manifest>', 'CSV with columns video, run, direction and optional setting, setting_unit, group, notes and per-run settings')
    .option('--out <dir>', 'output folder (default: reports/<manifest name>/)')
    .option('--jobs <n>', 'runs processed at once (default: one per core)')
    .option('--shard <i/n>', 'process only part i of n of the manifest (for job arrays); merge with `revtrace report <dir>`')
    .option('--defaults <file>', 'settings shared by all rows (default: <manifest name>.defaults.json beside the manifest)')
    .option('--force', 'redo runs even when their input and settings are unchanged')
    .option('--quiet', 'print only failures and the final line')
    .option('--json', 'print one JSON object per event on stdout')
    .action(async (manifest: string, o: BatchCliOptions, command: Command) => {
      const [{ runBatch }, { writeReport }, { createBatchDisplay }] = await Promise.all([import('../batch/runBatch.js'), import('../report/writeReport.js'), import('../batch/batchDisplay.js')]);
      const g = globalOptions(command);
      const jobs = parseJobs(o.jobs);
      const shard = o.shard !== undefined ? parseShard(o.shard) : null;
      const mode: DisplayMode = o.json ? 'json' : o.quiet ? 'quiet' : process.stderr.isTTY ? 'bars' : 'lines';
      const display = createBatchDisplay(mode, process.stderr);

      const controller = new AbortController();
      let interrupts = 0;
      const onSignal = () => {
        interrupts++;
        if (interrupts > 1) process.exit(130);
        controller.abort(new Error('interrupted'));
      };
      // the reader of our output went away (`revtrace batch … --json | head -1`): stop as on Ctrl-C, without a stack trace
      let outputClosed = false;
      const onOutputError = (err: NodeJS.ErrnoException) => {
        if (err.code !== 'EPIPE') throw err;
        outputClosed = true;
        controller.abort(new Error('the output was closed'));
      };
      process.stdout.on('error', onOutputError);
      process.stderr.on('error', onOutputError);
      process.on('SIGINT', onSignal);
      process.on('SIGTERM', onSignal);
      let outcome;
      try {
        outcome = await runBatch(manifest, { out: o.out, jobs, shard, force: Boolean(o.force), defaultsPath: o.defaults, tools: { ffmpeg: g.ffmpeg, ffprobe: g.ffprobe }, signal: controller.signal, onEvent: (e) => display.onEvent(e) });
      } finally {
        process.off('SIGINT', onSignal);
        process.off('SIGTERM', onSignal);
        display.stop();
      }
      if (outcome.interrupted) {
        if (outputClosed && !process.stderr.destroyed) {
          process.stderr.write('revtrace: the output pipe was closed, so the batch stopped; runs finished so far are kept, run the same command again to finish the rest\n');
        }
        process.exitCode = 130;
        return;
      }
      let reportFailed = false;
      if (outcome.summary_written) {
        try {
          const reportPath = await writeReport(outcome.out_dir, { title: outcome.manifest.name, only: new Set(outcome.manifest.runs.map((r) => r.run)) });
          display.note(`report: ${reportPath}`, { report: reportPath });
        } catch (err) {
          reportFailed = true;
          display.note(`report: not written: ${err instanceof Error ? err.message : String(err)} (summary.csv and batch.json are written; retry with revtrace report ${outcome.out_dir})`, { report: null });
        }
      } else if (shard) {
        display.note(`shard ${shard.index}/${shard.count} done; when every shard has finished, run: revtrace report ${outcome.out_dir}`, { merge: `revtrace report ${outcome.out_dir}` });
      }
      const n = outcome.records.length;
      const failed = outcome.failed.length;
      const line = `${n} run${n === 1 ? '' : 's'}: ${outcome.processed - failed} done, ${outcome.cached} unchanged, ${failed} failed${failed > 0 ? ` (${outcome.failed.map((f) => f.run).join(', ')})` : ''}`;
      display.note(line, { event: 'finished', runs: n, done: outcome.processed - failed, cached: outcome.cached, failed: outcome.failed, out_dir: outcome.out_dir });
      process.exitCode = failed > 0 || reportFailed ? 1 : 0;
    });
}
