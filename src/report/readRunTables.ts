import { parse } from 'csv-parse/sync';
import type { AngleTable, RateTable } from './ReportData.js';
import { parseDecimal } from './parseDecimal.js';

/** Thrown for a table that does not have the columns the report needs. */
export class TableFormatError extends Error {}

/**
 * Reads the wanted columns of a CSV text, each either as numbers (empty or unparsable = NaN) or as text.
 * Files without any quote character (what revtrace writes for its numeric tables) take a fast scan that
 * converts only the wanted fields of each line; anything quoted goes through csv-parse.
 */
function readColumns(text: string, wanted: readonly { name: string; text?: boolean }[], file: string): (Float64Array | string[])[] {
  if (text.includes('"')) {
    const rows = parse(text, { skip_empty_lines: true, relax_column_count: true }) as string[][];
    const col = columnIndex((rows[0] ?? []).map(cleanHeader), wanted.map((w) => w.name), file);
    return wanted.map((w) => {
      const fields = rows.slice(1).map((r) => r[col[w.name]!] ?? '');
      return w.text ? fields : Float64Array.from(fields, toNumber);
    });
  }
  let lineEnd = text.indexOf('\n');
  if (lineEnd < 0) lineEnd = text.length;
  const col = columnIndex(text.slice(0, lineEnd).replace(/\r$/, '').split(',').map(cleanHeader), wanted.map((w) => w.name), file);
  let lines = 0;
  for (let i = text.indexOf('\n', lineEnd + 1); i >= 0; i = text.indexOf('\n', i + 1)) lines++;
  lines++;
  // target[f]: which wanted column field f feeds, or -1
  const maxIndex = Math.max(...wanted.map((w) => col[w.name]!));
  const target = new Int32Array(maxIndex + 1).fill(-1);
  wanted.forEach((w, k) => (target[col[w.name]!] = k));
  const numeric = wanted.map((w) => (w.text ? null : new Float64Array(lines)));
  const texts = wanted.map((w) => (w.text ? ([] as string[]) : null));
  let row = 0;
  let start = lineEnd + 1;
  while (start < text.length) {
    let end = text.indexOf('\n', start);
    if (end < 0) end = text.length;
    let stop = end;
    if (stop > start && text.charCodeAt(stop - 1) === 13) stop--;
    if (stop > start) {
      let from = start;
      for (let f = 0; f <= maxIndex; f++) {
        let comma = from <= stop ? text.indexOf(',', from) : -1;
        if (comma < 0 || comma > stop) comma = stop;
        const k = target[f]!;
        if (k >= 0) {
          const num = numeric[k];
          if (num) num[row] = parseDecimal(text, from, comma);
          else texts[k]!.push(from < comma ? text.slice(from, comma) : '');
        }
        from = comma + 1;
      }
      row++;
    }
    start = end + 1;
  }
  return wanted.map((_, k) => numeric[k]?.slice(0, row) ?? texts[k]!);
}

function cleanHeader(h: string): string {
  return h.trim().replace(/^\uFEFF/, '');
}

/** Parses angle.csv (`frame,t_s,x_px,y_px,angle_deg,quality,flag`; empty or NaN angle = lost frame). */
export function parseAngleCsv(text: string): AngleTable {
  const [t_s, angle_deg, quality, flags] = readColumns(text, [{ name: 't_s' }, { name: 'angle_deg' }, { name: 'quality' }, { name: 'flag', text: true }], 'angle.csv') as [Float64Array, Float64Array, Float64Array, string[]];
  const n = t_s.length;
  const flagged = new Uint8Array(n);
  const flag_counts: Record<string, number> = {};
  for (let i = 0; i < n; i++) {
    const flag = flags[i]!.trim();
    if (flag !== '') {
      flagged[i] = 1;
      flag_counts[flag] = (flag_counts[flag] ?? 0) + 1;
    }
  }
  return { t_s, angle_deg, quality, flagged, flag_counts };
}

/** Parses rate.csv (`t_s,rate_deg_s,lo_deg_s,hi_deg_s`). */
export function parseRateCsv(text: string): RateTable {
  const [t_s, rate_deg_s, lo_deg_s, hi_deg_s] = readColumns(text, [{ name: 't_s' }, { name: 'rate_deg_s' }, { name: 'lo_deg_s' }, { name: 'hi_deg_s' }], 'rate.csv') as [Float64Array, Float64Array, Float64Array, Float64Array];
  return { t_s, rate_deg_s, lo_deg_s, hi_deg_s };
}

function columnIndex(header: string[], names: readonly string[], file: string): Record<string, number> {
  const index: Record<string, number> = {};
  for (const name of names) {
    const i = header.indexOf(name);
    if (i < 0) throw new TableFormatError(`${file} has no ${name} column`);
    index[name] = i;
  }
  return index;
}

function toNumber(s: string | undefined): number {
  if (s === undefined || s === '') return Number.NaN;
  const v = Number(s);
  return Number.isFinite(v) ? v : Number.NaN;
}
