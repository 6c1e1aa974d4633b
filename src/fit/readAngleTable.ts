import { readFile } from 'node:fs/promises';
import { parse } from 'csv-parse/sync';
import { InputError } from '../errors.js';

/** An angle table read from CSV: all rows' times, angles (NaN for lost frames) and the lost share. */
export interface AngleTableRows {
  /** Frame times, s, strictly increasing (every row). */
  t_s: Float64Array;
  /** Unwrapped angle, deg; NaN where the frame was lost. */
  angle_deg: Float64Array;
  /** Lost rows / all rows. */
  lost_share: number;
  rows: number;
  lost_rows: number;
}

const LOST_CELLS = new Set(['', 'nan', 'NaN', 'NAN', 'na', 'NA']);

/**
 * Reads an angle table (angle.csv as written by `revtrace track`, or any CSV with a header holding the
 * columns t_s and angle_deg; other columns are ignored, lines starting with # are comments; files with quoted
 * cells go through csv-parse, plain ones are split directly, which is several times faster). An empty or
 * NaN angle marks a lost frame. Checks: both columns present, every cell numeric, times strictly
 * increasing, at least 10 valid rows — otherwise an InputError with one sentence.
 */
export async function readAngleTable(path: string): Promise<AngleTableRows> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    throw new InputError(code === 'ENOENT' ? `angle table ${path} does not exist; give the path of an angle.csv` : code === 'EISDIR' ? `angle table ${path} is a folder; give the path of the angle.csv inside it` : `cannot read angle table ${path} (${code ?? String(err)}); check the path and its permissions`, { cause: err });
  }
  let records: string[][];
  if (!text.includes('"')) {
    // fast path for the common unquoted numeric table (what `revtrace track` writes): split lines and commas
    records = [];
    for (const raw of text.replace(/^\uFEFF/, '').split(/\r?\n/)) {
      const line = raw.trim();
      if (line === '' || line.startsWith('#')) continue;
      records.push(line.split(',').map((c) => c.trim()));
    }
  } else {
    try {
      records = parse(text, { comment: '#', skip_empty_lines: true, trim: true, relax_column_count: true, bom: true }) as string[][];
    } catch (err) {
      throw new InputError(`${path} is not a readable CSV file (${err instanceof Error ? err.message : String(err)})`, { cause: err });
    }
  }
  if (records.length === 0) throw new InputError(`${path} is empty; it needs a header with t_s and angle_deg and one row per frame`);
  const header = records[0]!;
  const ti = header.indexOf('t_s');
  const ai = header.indexOf('angle_deg');
  const missing = [ti < 0 ? 't_s' : '', ai < 0 ? 'angle_deg' : ''].filter(Boolean);
  if (missing.length > 0) {
    throw new InputError(`${path} has no ${missing.join(' or ')} column (found: ${header.join(', ') || 'nothing'}); give a CSV with a header naming t_s and angle_deg`);
  }
  const rows = records.length - 1;
  const t = new Float64Array(rows);
  const a = new Float64Array(rows);
  let lost = 0;
  for (let r = 0; r < rows; r++) {
    const rec = records[r + 1]!;
    const line = r + 2;
    const tCell = rec[ti] ?? '';
    const tv = tCell === '' ? Number.NaN : Number(tCell);
    if (!Number.isFinite(tv)) throw new InputError(`${path} line ${line}: t_s "${tCell}" is not a number; every row needs a time in seconds`);
    if (r > 0 && !(tv > t[r - 1]!)) {
      throw new InputError(
        tv === t[r - 1]
          ? `${path} line ${line}: time ${tv} s repeats the previous row; each frame needs its own time`
          : `${path} line ${line}: time ${tv} s comes after ${t[r - 1]} s; the rows must be sorted by increasing time`,
      );
    }
    t[r] = tv;
    const aCell = rec[ai] ?? '';
    if (LOST_CELLS.has(aCell)) {
      a[r] = Number.NaN;
      lost++;
      continue;
    }
    const av = Number(aCell);
    if (!Number.isFinite(av)) throw new InputError(`${path} line ${line}: angle_deg "${aCell}" is not a number; leave the cell empty for a lost frame`);
    a[r] = av;
  }
  if (rows - lost < 10) throw new InputError(`${path} has ${rows - lost} valid rows but a fit needs at least 10; track a longer stretch of video`);
  return { t_s: t, angle_deg: a, lost_share: rows > 0 ? lost / rows : 0, rows, lost_rows: lost };
}
