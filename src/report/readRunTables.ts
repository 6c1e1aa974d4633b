import { parse } from 'csv-parse/sync';
import type { AngleTable, RateTable } from './ReportData.js';

/** Thrown for a table that does not have the columns the report needs. */
export class TableFormatError extends Error {}

/**
 * Reads the wanted columns of a CSV text. Files without any quote character (what revtrace writes for its
 * numeric tables) take a fast scan that cuts only the wanted fields out of each line; anything quoted goes
 * through csv-parse. Returns the header and, per wanted column, its fields in row order.
 */
function readColumns(text: string, wanted: readonly string[], file: string): string[][] {
  if (text.includes('"')) {
    const rows = parse(text, { skip_empty_lines: true, relax_column_count: true }) as string[][];
    const col = columnIndex((rows[0] ?? []).map(cleanHeader), wanted, file);
    return wanted.map((name) => rows.slice(1).map((r) => r[col[name]!] ?? ''));
  }
  let lineEnd = text.indexOf('\n');
  if (lineEnd < 0) lineEnd = text.length;
  const col = columnIndex(text.slice(0, lineEnd).replace(/\r$/, '').split(',').map(cleanHeader), wanted, file);
  const indices = wanted.map((name) => col[name]!);
  const maxIndex = Math.max(...indices);
  const out: string[][] = wanted.map(() => []);
  const fields: string[] = new Array(maxIndex + 1);
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
        fields[f] = from <= stop ? text.slice(from, comma) : '';
        from = comma + 1;
      }
      for (let w = 0; w < indices.length; w++) out[w]!.push(fields[indices[w]!]!);
    }
    start = end + 1;
  }
  return out;
}

function cleanHeader(h: string): string {
  return h.trim().replace(/^\uFEFF/, '');
}

/** Parses angle.csv (`frame,t_s,x_px,y_px,angle_deg,quality,flag`; empty or NaN angle = lost frame). */
export function parseAngleCsv(text: string): AngleTable {
  const [tCol, aCol, qCol, fCol] = readColumns(text, ['t_s', 'angle_deg', 'quality', 'flag'], 'angle.csv') as [string[], string[], string[], string[]];
  const n = tCol.length;
  const t_s = new Float64Array(n);
  const angle_deg = new Float64Array(n);
  const quality = new Float64Array(n);
  const flagged = new Uint8Array(n);
  const flag_counts: Record<string, number> = {};
  for (let i = 0; i < n; i++) {
    t_s[i] = toNumber(tCol[i]);
    angle_deg[i] = toNumber(aCol[i]);
    quality[i] = toNumber(qCol[i]);
    const flag = fCol[i]!.trim();
    if (flag !== '') {
      flagged[i] = 1;
      flag_counts[flag] = (flag_counts[flag] ?? 0) + 1;
    }
  }
  return { t_s, angle_deg, quality, flagged, flag_counts };
}

/** Parses rate.csv (`t_s,rate_deg_s,lo_deg_s,hi_deg_s`). */
export function parseRateCsv(text: string): RateTable {
  const cols = readColumns(text, ['t_s', 'rate_deg_s', 'lo_deg_s', 'hi_deg_s'], 'rate.csv');
  const [t_s, rate_deg_s, lo_deg_s, hi_deg_s] = cols.map((c) => Float64Array.from(c, toNumber)) as [Float64Array, Float64Array, Float64Array, Float64Array];
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
