import { dirname, join } from 'node:path';
import { writeFileAtomic } from '../writeFileAtomic.js';
import type { FitResult } from './fitAngleSeries.js';
import { RevtraceError } from '../errors.js';

/** Replacer that refuses NaN and ±Infinity, so a non-finite number never reaches fit.json. */
function finiteOnly(key: string, value: unknown): unknown {
  if (typeof value === 'number' && !Number.isFinite(value)) {
    throw new RevtraceError(`fit.json would contain a non-finite value at "${key}"; this is a bug, please report it with the input file`);
  }
  return value;
}

/** Formats a number for rate.csv: up to 9 significant digits, no exponent for ordinary magnitudes. */
function cell(v: number): string {
  return Number.isFinite(v) ? String(Number(v.toPrecision(9))) : '';
}

/**
 * Writes fit.json (the FitReport, 2-space JSON) and rate.csv in the same folder
 * (columns t_s,rate_deg_s,lo_deg_s,hi_deg_s), each atomically (temporary file, then rename).
 * rate.csv is written first, so a present fit.json always has its rate.csv.
 */
export async function writeFitOutputs(fitJsonPath: string, result: FitResult): Promise<void> {
  const json = JSON.stringify(result.report, finiteOnly, 2) + '\n';
  const r = result.rate;
  const lines = ['t_s,rate_deg_s,lo_deg_s,hi_deg_s'];
  for (let i = 0; i < r.t_s.length; i++) lines.push(`${cell(r.t_s[i]!)},${cell(r.rate_deg_s[i]!)},${cell(r.lo_deg_s[i]!)},${cell(r.hi_deg_s[i]!)}`);
  await writeFileAtomic(join(dirname(fitJsonPath), 'rate.csv'), lines.join('\n') + '\n');
  await writeFileAtomic(fitJsonPath, json);
}
