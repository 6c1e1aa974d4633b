import type { Command } from 'commander';
import type { FitModelOption } from '../fit/fitAngleSeries.js';
import type { Estimate, FitReport } from '../fit/FitReport.js';
import { dirname } from 'node:path';
import { ensureWritableFolder } from '../ensureWritableFolder.js';
import { InputError } from '../errors.js';
import { checkFitOutputPaths } from './fitOutputPaths.js';
import { decimalsToShow } from '../decimalsToShow.js';
import { formatP } from '../report/formatQuantity.js';

interface FitCliOptions {
  out: string;
  model: string;
  from?: string;
  to?: string;
  level: string;
  margin?: string;
  seed: string;
}

/** Parses a numeric option; InputError naming the option otherwise. */
function numberOption(name: string, text: string | undefined): number | undefined {
  if (text === undefined) return undefined;
  const v = Number(text);
  if (text.trim() === '' || !Number.isFinite(v)) throw new InputError(`${name} must be a number, got "${text}"`);
  return v;
}

/** An estimate with its interval, to as many decimals as two significant digits of its standard error need (as the report shows it). */
function show(e: Estimate, unit: string): string {
  const decimals = decimalsToShow(e.se, 12, 4);
  const p = (v: number): string => v.toFixed(decimals);
  return `${p(e.value)} ${unit} (${Math.round(e.level * 100)}% CI ${p(e.ci[0])} to ${p(e.ci[1])})`;
}

/** "p = 0.034" or "p < 0.001", the same way on every line (and as the report shows it). */
function pText(p: number): string {
  const shown = formatP(p);
  return shown.startsWith('<') ? `p ${shown}` : `p = ${shown}`;
}

/** A few lines for a person: the chosen model's headline numbers and any warnings. */
export function fitSummaryText(report: FitReport, outPath: string): string {
  const lines = [`model ${report.model}${report.selection?.ambiguous ? ' (ambiguous choice)' : ''}, ${report.n} frames, ${Number(report.window_s[0].toPrecision(10))}–${Number(report.window_s[1].toPrecision(10))} s`];
  const s = report.steady;
  if (s && report.model === 'steady') {
    lines.push(`rate ${show(s.rate_deg_s, 'deg/s')} = ${show(s.rate_rpm, 'rpm')}`);
    lines.push(`differs from zero: ${pText(s.zero_test.p_value)}; smallest detectable rate ${s.min_detectable_deg_s.toPrecision(3)} deg/s`);
    const w = s.wander_allowance;
    if (w && w.hidden_walk_bound_deg_per_sqrt_s !== null) {
      lines.push(`allowing for rate wander up to ${w.hidden_walk_bound_deg_per_sqrt_s.toPrecision(2)} deg/√s (too small to detect here): ${show(w.rate_deg_s, 'deg/s')}, differs from zero: ${pText(w.zero_test.p_value)}`);
    }
    if (s.zero_test.margin_deg_s !== undefined) {
      lines.push(`within ±${s.zero_test.margin_deg_s} deg/s of zero: ${s.zero_test.equivalent_to_zero ? 'yes' : 'not established'} (TOST ${pText(s.zero_test.equivalence_p_value!)})`);
    }
  }
  const up = report.model === 'spinup' ? report.spinup : undefined;
  if (up) lines.push(`terminal rate ${show(up.terminal_rate_deg_s, 'deg/s')}, tau ${show(up.tau_s, 's')}`, `onset ${show(up.onset_s, 's')}`);
  const down = report.model === 'spindown' ? report.spindown : undefined;
  if (down) {
    lines.push(`initial rate ${show(down.initial_rate_deg_s, 'deg/s')}`);
    lines.push(`Coulomb friction ${show(down.coulomb_deg_s2, 'deg/s²')}, viscous ${show(down.viscous_per_s, '1/s')}${down.stop_s !== null ? `; stops at ${Number(down.stop_s.toPrecision(4))} s` : ''}`);
  }
  for (const w of report.diagnostics.warnings) lines.push(`warning: ${w}`);
  lines.push(`wrote ${outPath} and rate.csv beside it`);
  return lines.join('\n') + '\n';
}

/** `revtrace fit <angle.csv> --out <fit.json>`: fits a rotation model to an angle table. */
export function registerFit(program: Command): void {
  program
    .command('fit')
    .description('fit the rotation rate (steady, spin-up, coast-down or auto) to an angle table; writes fit.json and rate.csv')
    .argument('<angle.csv>', 'angle table with columns t_s and angle_deg (empty angle = lost frame)')
    .requiredOption('--out <fit.json>', 'where to write fit.json (rate.csv goes beside it)')
    .option('--model <name>', 'steady | spinup | spindown | auto', 'steady')
    .option('--from <s>', 'window start, seconds')
    .option('--to <s>', 'window end, seconds')
    .option('--level <p>', 'confidence level of the intervals', '0.95')
    .option('--margin <deg_s>', 'equivalence margin for the zero test, deg/s (adds a TOST equivalence test)')
    .option('--seed <n>', 'seed of the nonlinear fits\' bootstrap', '1')
    .action(async (anglePath: string, o: FitCliOptions) => {
      const [{ readAngleTable }, { fitAngleSeries }, { writeFitOutputs }] = await Promise.all([import('../fit/readAngleTable.js'), import('../fit/fitAngleSeries.js'), import('../fit/writeFitOutputs.js')]);
      if (!['steady', 'spinup', 'spindown', 'auto'].includes(o.model)) {
        throw new InputError(`--model must be steady, spinup, spindown or auto, got "${o.model}"`);
      }
      const level = numberOption('--level', o.level)!;
      if (!(level > 0 && level < 1)) throw new InputError(`--level must lie between 0 and 1 (e.g. 0.95), got ${o.level}`);
      const margin = numberOption('--margin', o.margin);
      if (margin !== undefined && !(margin > 0)) throw new InputError(`--margin must be a positive rate in deg/s, got ${o.margin}`);
      const seed = numberOption('--seed', o.seed)!;
      const from = numberOption('--from', o.from);
      const to = numberOption('--to', o.to);
      await checkFitOutputPaths(anglePath, o.out);
      await ensureWritableFolder(dirname(o.out), 'the folder of --out');
      const table = await readAngleTable(anglePath);
      const result = fitAngleSeries(
        { t_s: table.t_s, angle_deg: table.angle_deg, lost_share: table.lost_share },
        {
          model: o.model as FitModelOption,
          level,
          seed,
          ...(from !== undefined ? { from_s: from } : {}),
          ...(to !== undefined ? { to_s: to } : {}),
          ...(margin !== undefined ? { margin_deg_s: margin } : {}),
        },
      );
      await writeFitOutputs(o.out, result);
      process.stdout.write(fitSummaryText(result.report, o.out));
      const [first, last] = [table.t_s[0]!, table.t_s[table.t_s.length - 1]!];
      if (from !== undefined && from < first) process.stderr.write(`note: --from ${from} s is before the first row (${first} s); the window starts there\n`);
      if (to !== undefined && to > last) process.stderr.write(`note: --to ${to} s is past the last row (${last} s); the window ends there\n`);
    });
}
