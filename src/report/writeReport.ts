import { dirname, join, resolve } from 'node:path';
import { writeFileAtomic } from '../writeFileAtomic.js';
import { loadReportData } from './loadReportData.js';
import { renderReport } from './renderReport.js';

export interface WriteReportOptions {
  /** Output file; default `<outDir>/report.html`. */
  out?: string;
  /** Report title. */
  title?: string;
  /** Equivalence margin, deg/s (default: the margin the runs were fitted with). */
  margin_deg_s?: number | null;
  /** Run ids to report (a batch's manifest); other run folders are named as left out. Default: every run folder. */
  only?: ReadonlySet<string>;
}

/** Reads a batch folder, renders the report and writes it atomically; returns the path written. */
export async function writeReport(outDir: string, options: WriteReportOptions = {}): Promise<string> {
  const data = await loadReportData(outDir, options.only);
  const target = resolve(options.out ?? join(outDir, 'report.html'));
  const htmlText = await renderReport(data, { title: options.title, report_dir: dirname(target), margin_deg_s: options.margin_deg_s });
  await writeFileAtomic(target, htmlText);
  return target;
}
