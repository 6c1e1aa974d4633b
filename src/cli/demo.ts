import type { Command } from 'commander';
import { globalOptions } from './globalOptions.js';
import { parseJobs } from './parseJobs.js';

/** `revtrace demo`: renders an invented day of footage, runs the batch and the report, prints a summary. */
export function registerDemo(program: Command): void {
  program
    .command('demo')
    .description('show the whole job on a synthetic day of runs (rendered once, then reused)')
    .option('--out <dir>', 'folder for the clips, manifest, results and report', 'reports/demo')
    .option('--quick', 'a reduced day: fewer, shorter, smaller clips')
    .option('--jobs <n>', 'runs processed at once (default: one per core)')
    .action(async (o: { out: string; quick?: boolean; jobs?: string }, command: Command) => {
      const [{ runDemo }, { demoSummaryTable }, { createBatchDisplay }] = await Promise.all([import('../demo/runDemo.js'), import('../demo/demoSummaryTable.js'), import('../batch/batchDisplay.js')]);
      const g = globalOptions(command);
      const jobs = parseJobs(o.jobs);
      const started = Date.now();
      const display = createBatchDisplay(process.stderr.isTTY ? 'bars' : 'lines', process.stderr);
      // the demo keeps what it finished (clips, committed runs) and tidies the rest on its next start: stop at once
      const onSignal = () => {
        display.stop();
        process.stderr.write('revtrace: interrupted; run revtrace demo again to pick up where it stopped\n');
        process.exit(130);
      };
      process.once('SIGINT', onSignal);
      process.once('SIGTERM', onSignal);
      let outcome;
      try {
        outcome = await runDemo({ out: o.out, quick: o.quick, jobs, tools: { ffmpeg: g.ffmpeg, ffprobe: g.ffprobe }, onLog: (line) => display.note(line, {}), onEvent: (e) => display.onEvent(e) });
      } finally {
        process.off('SIGINT', onSignal);
        process.off('SIGTERM', onSignal);
        display.stop();
      }
      const elapsed_s = (Date.now() - started) / 1000;
      const failed = outcome.batch.failed.map((f) => f.run);
      process.stdout.write(`\n${demoSummaryTable(outcome.runs, outcome.batch.records)}\n\n`);
      process.stdout.write(`clips: ${outcome.rendered} rendered, ${outcome.reused} reused; runs: ${outcome.batch.processed} processed, ${outcome.batch.cached} unchanged; ${elapsed_s.toFixed(1)} s\n`);
      process.stdout.write(`manifest: ${outcome.manifest_path}\ntruth:    ${outcome.truth_path}\nreport:   ${outcome.report_path}\n`);
      const unexpected = failed.filter((run) => !outcome.runs.find((r) => r.run === run)?.spoiled);
      if (unexpected.length > 0) process.stdout.write(`unexpected failures: ${unexpected.join(', ')}\n`);
      process.exitCode = unexpected.length > 0 ? 1 : 0;
    });
}
