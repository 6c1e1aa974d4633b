import type { Command } from 'commander';
import { stat } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import { ensureWritableFolder } from '../ensureWritableFolder.js';
import { InputError } from '../errors.js';

interface ReportCliOptions {
  out?: string;
  title?: string;
  margin?: string;
}

/** `revtrace report <dir>`: merge the run folders of a batch (shards too) and write the HTML report. */
export function registerReport(program: Command): void {
  program
    .command('report')
    .description('rebuild summary.csv and batch.json from the run folders of a batch output folder (merging shards), then write one self-contained HTML report')
    .argument('<dir>', 'batch output folder (the one holding runs/)')
    .option('--out <file>', 'HTML file to write (default: <dir>/report.html)')
    .option('--title <text>', 'report title (default names the manifest)')
    .option('--margin <deg_s>', 'equivalence margin in deg/s for "the reverse direction does not turn" (default: the margin the runs were fitted with)')
    .action(async (dir: string, o: ReportCliOptions) => {
      const [{ rebuildSummary }, { writeReport }, { currentManifestRuns }, { leftOutWords }] = await Promise.all([
        import('../batch/rebuildSummary.js'), import('../report/writeReport.js'), import('../batch/currentManifestRuns.js'), import('../batch/leftOutWords.js'),
      ]);
      let isDir = false;
      try {
        isDir = (await stat(join(dir, 'runs'))).isDirectory();
      } catch {
        isDir = false;
      }
      if (!isDir) throw new InputError(`${dir} has no runs/ folder; give the output folder of a batch (the one holding runs/).`);
      let margin: number | undefined;
      if (o.margin !== undefined) {
        margin = Number(o.margin);
        if (!Number.isFinite(margin) || margin <= 0) throw new InputError(`--margin "${o.margin}" is not a positive rate; give the margin in deg/s, e.g. --margin 0.5`);
      }
      if (o.out !== undefined && !/\.html?$/i.test(o.out)) throw new InputError(`--out "${o.out}" does not end in .html; give an HTML file name such as report.html`);
      await ensureWritableFolder(o.out !== undefined ? dirname(o.out) : dir, o.out !== undefined ? 'the folder of --out' : 'the batch folder');
      const current = await currentManifestRuns(dir);
      const { records } = await rebuildSummary(dir, current.only);
      const path = await writeReport(dir, { out: o.out, title: o.title, margin_deg_s: margin, only: current.only });
      process.stdout.write(`report: ${path} (${records.length} run${records.length === 1 ? '' : 's'})\n`);
      if (current.left_out.length > 0) {
        process.stderr.write(`note: runs/ also holds ${leftOutWords(current.left_out)} that the manifest no longer lists; they are left out of the summary and the report (delete them if they are stale)\n`);
      }
    });
}
