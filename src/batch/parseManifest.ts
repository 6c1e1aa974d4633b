import { readFile, stat } from 'node:fs/promises';
import { basename, dirname, extname, isAbsolute, join, resolve } from 'node:path';
import { createHash } from 'node:crypto';
import { parse } from 'csv-parse/sync';
import { InputError } from '../errors.js';
import type { Manifest, ManifestRun } from './Manifest.js';
import { ManifestError, type ManifestProblem } from './ManifestError.js';
import { DEFAULT_RUN_SETTINGS, type RunSettings } from './RunSettings.js';
import { COLUMN_ALIASES, SETTING_COLUMNS, crossSettingProblems, parseDecimal } from './settingColumns.js';
import { runIdProblem } from './runIdProblem.js';

/** How a manifest is read as CSV: a spreadsheet's byte-order mark, ragged rows, blank lines and # comment lines allowed. */
export const MANIFEST_CSV = { bom: true, relax_column_count: true, skip_empty_lines: true, comment: '#', comment_no_infix: true } as const;

export interface ParseManifestOptions {
  /** Defaults file; default: `<manifest name>.defaults.json` beside the manifest, when it exists. */
  defaultsPath?: string;
}

const REQUIRED = ['video', 'run', 'direction'] as const;
const DESCRIPTIVE = ['setting', 'setting_unit', 'group', 'notes'] as const;
/** Keys a defaults file may set: the descriptive columns shared by all rows, and every setting column. */
const DEFAULTS_KEYS = ['setting_unit', 'group', ...Object.keys(SETTING_COLUMNS)];

/** The path of the defaults file that belongs to a manifest: `day3.csv` → `day3.defaults.json`. */
export function defaultsPathFor(manifestPath: string): string {
  const abs = resolve(manifestPath);
  return join(dirname(abs), `${basename(abs, extname(abs))}.defaults.json`);
}

async function isFile(path: string): Promise<boolean> {
  try {
    return (await stat(path)).isFile();
  } catch {
    return false;
  }
}

/** Reads and validates the defaults file: settings shared by all rows, as JSON of strings or numbers. */
async function readDefaults(path: string, problems: ManifestProblem[]): Promise<{ settings: RunSettings; shared: Record<string, string> }> {
  const settings = structuredClone(DEFAULT_RUN_SETTINGS);
  const shared: Record<string, string> = {};
  const file = basename(path);
  const problem = (key: string | null, message: string) => problems.push({ file, line: null, column: null, column_name: key, message });
  let data: unknown;
  try {
    data = JSON.parse((await readFile(path, 'utf8')).replace(/^\uFEFF/, '')); // a byte-order mark, as some editors save
  } catch (err) {
    problem(null, `cannot be read as JSON (${(err as Error).message}); write an object such as {"marker": "bright", "model": "steady"}`);
    return { settings, shared };
  }
  if (typeof data !== 'object' || data === null || Array.isArray(data)) {
    problem(null, 'is not a JSON object; write an object such as {"marker": "bright", "model": "steady"}');
    return { settings, shared };
  }
  for (const [rawKey, raw] of Object.entries(data as Record<string, unknown>)) {
    const key = COLUMN_ALIASES[rawKey] ?? rawKey;
    if (!DEFAULTS_KEYS.includes(key)) {
      problem(rawKey, `is not a key a defaults file may set; use ${DEFAULTS_KEYS.join(', ')}`);
      continue;
    }
    if (typeof raw !== 'string' && typeof raw !== 'number') {
      problem(rawKey, 'must be a string or a number, written as in a manifest cell');
      continue;
    }
    const text = String(raw).trim();
    if (key === 'setting_unit' || key === 'group') {
      shared[key] = text;
      continue;
    }
    if (text === '') continue;
    const parsed = SETTING_COLUMNS[key]!.parse(text);
    if (parsed.ok) SETTING_COLUMNS[key]!.apply(settings, parsed.value);
    else problem(rawKey, parsed.problem);
  }
  return { settings, shared };
}

/**
 * Reads a run manifest (CSV with a header; paths relative to the manifest) and its defaults file, and
 * checks everything before any work: throws a ManifestError listing every problem with line and column.
 */
export async function parseManifest(manifestPath: string, options: ParseManifestOptions = {}): Promise<Manifest> {
  const path = resolve(manifestPath);
  const file = basename(path);
  let bytes: Buffer;
  try {
    bytes = await readFile(path);
  } catch {
    throw new InputError(`cannot read the manifest ${manifestPath}; check the path`);
  }
  const problems: ManifestProblem[] = [];

  const defaultsPath = options.defaultsPath !== undefined ? resolve(options.defaultsPath) : defaultsPathFor(path);
  let defaults = { settings: structuredClone(DEFAULT_RUN_SETTINGS), shared: {} as Record<string, string> };
  let defaultsUsed: string | null = null;
  if (await isFile(defaultsPath)) {
    defaults = await readDefaults(defaultsPath, problems);
    defaultsUsed = defaultsPath;
  } else if (options.defaultsPath !== undefined) {
    throw new InputError(`cannot find the defaults file ${options.defaultsPath}; check the path`);
  }

  let records: { record: string[]; info: { lines: number } }[];
  try {
    records = parse(bytes, { ...MANIFEST_CSV, info: true }) as unknown as typeof records;
  } catch (err) {
    const e = err as { message: string; lines?: number };
    throw new ManifestError(file, [{ line: e.lines ?? null, column: null, column_name: null, message: `is not valid CSV (${e.message}); check quotes and separators` }]);
  }
  if (records.length === 0) {
    throw new ManifestError(file, [{ line: null, column: null, column_name: null, message: 'is empty; write a header line "video,run,direction" and one row per run' }]);
  }

  // Header
  const headerLine = records[0]!.info.lines;
  const header = records[0]!.record.map((h) => h.trim().toLowerCase());
  const separator = header.length === 1 ? [';', '\t'].find((c) => header[0]!.includes(c)) : undefined;
  if (separator) {
    const words = separator === ';' ? 'semicolons (as spreadsheets set to a language with decimal commas save CSV)' : 'tabs';
    throw new ManifestError(file, [{ line: headerLine, column: null, column_name: null, message: `separates its columns with ${words}; save it with commas, e.g. video,run,direction` }]);
  }
  const index = new Map<string, number>();
  /** Columns without a name (a spreadsheet's trailing empty columns): ignored while their cells are empty. */
  const unnamed: number[] = [];
  header.forEach((raw, i) => {
    if (raw === '') {
      unnamed.push(i);
      return;
    }
    const name = COLUMN_ALIASES[raw] ?? raw;
    const known = (REQUIRED as readonly string[]).includes(name) || (DESCRIPTIVE as readonly string[]).includes(name) || name in SETTING_COLUMNS;
    if (!known) {
      const all = [...REQUIRED, ...DESCRIPTIVE, ...Object.keys(SETTING_COLUMNS)].join(', ');
      problems.push({ line: headerLine, column: i + 1, column_name: records[0]!.record[i]!, message: `is not a known column; the columns are ${all}` });
    } else if (index.has(name)) {
      problems.push({ line: headerLine, column: i + 1, column_name: records[0]!.record[i]!, message: `repeats column ${index.get(name)! + 1}; keep one column of each name` });
    } else {
      index.set(name, i);
    }
  });
  for (const name of REQUIRED) {
    if (!index.has(name)) problems.push({ line: headerLine, column: null, column_name: name, message: `the required column "${name}" is missing from the header; the header needs video, run and direction` });
  }
  if (records.length === 1) problems.push({ line: null, column: null, column_name: null, message: 'has a header but no runs; add one row per run' });
  if (problems.length > 0 && REQUIRED.some((n) => !index.has(n))) throw new ManifestError(file, problems);

  // Rows
  const runs: ManifestRun[] = [];
  const seen = new Map<string, number>();
  const base = dirname(path);
  for (let r = 1; r < records.length; r++) {
    const { record, info } = records[r]!;
    const line = info.lines;
    if (record.length !== header.length) {
      problems.push({ line, column: null, column_name: null, message: `has ${record.length} fields but the header has ${header.length}; quote cells that contain commas, e.g. "100,50,400,400"` });
      continue;
    }
    const cell = (name: string) => (index.has(name) ? record[index.get(name)!]!.trim() : '');
    const at = (name: string, message: string) => problems.push({ line, column: index.get(name)! + 1, column_name: name, message });
    const before = problems.length;
    for (const i of unnamed) {
      const text = record[i]!.trim();
      if (text !== '') problems.push({ line, column: i + 1, column_name: null, message: `holds "${text}" but the column has no name in the header; name the column or delete the value` });
    }

    const run = cell('run');
    const idProblem = runIdProblem(run);
    if (idProblem) at('run', idProblem);
    else if (seen.has(run.toLowerCase())) at('run', `the run id "${run}" repeats line ${seen.get(run.toLowerCase())} (run ids must differ, also in upper/lower case); give each run its own id`);
    else seen.set(run.toLowerCase(), line);

    const video = cell('video');
    const videoAbs = isAbsolute(video) ? video : resolve(base, video);
    if (video === '') at('video', 'the video path is empty; give the clip file, relative to the manifest');
    else if (!(await isFile(videoAbs))) {
      const hint = video.includes('\\') ? ' (write / between folders, not \\)' : '';
      at('video', `the video file ${video} does not exist (looked for ${videoAbs}); check the path, relative to the manifest${hint}`);
    }

    const directionText = cell('direction').toLowerCase();
    if (directionText !== 'forward' && directionText !== 'reverse') at('direction', `the direction "${cell('direction')}" is unknown; write forward or reverse`);

    const settingText = cell('setting');
    let setting: number | null = null;
    if (settingText !== '') {
      setting = parseDecimal(settingText);
      if (!Number.isFinite(setting)) at('setting', `the setting "${settingText}" is not a number; write the value alone (e.g. 1.5) and its unit in setting_unit`);
    }

    const settings = structuredClone(defaults.settings);
    const unreadable = new Set<string>();
    for (const name of Object.keys(SETTING_COLUMNS)) {
      const text = cell(name);
      if (text === '') continue;
      const parsed = SETTING_COLUMNS[name]!.parse(text);
      if (parsed.ok) SETTING_COLUMNS[name]!.apply(settings, parsed.value);
      else {
        at(name, parsed.problem);
        unreadable.add(name);
      }
    }
    // the window check needs both of its cells readable; other problems in the row do not hide it
    if (!unreadable.has('from') && !unreadable.has('to')) {
      for (const p of crossSettingProblems(settings)) {
        if (index.has(p.column)) at(p.column, p.message);
        else problems.push({ line, column: null, column_name: null, message: p.message });
      }
    }
    if (problems.length !== before) continue;
    const twin = runs.find((earlier) => earlier.video_abs === videoAbs && JSON.stringify(earlier.settings) === JSON.stringify(settings));
    if (twin) {
      at('video', `the video ${video} is also run on line ${twin.line} with the same settings, so one clip would count as two replicates; remove one row, or give each its own window (from, to)`);
      continue;
    }
    runs.push({
      row: r,
      line,
      run,
      video,
      video_abs: videoAbs,
      direction: directionText as 'forward' | 'reverse',
      setting,
      setting_unit: cell('setting_unit') || defaults.shared.setting_unit || '',
      group: cell('group') || defaults.shared.group || '',
      notes: cell('notes'),
      settings,
    });
  }
  if (problems.length > 0) throw new ManifestError(file, problems);
  return {
    path,
    name: basename(path, extname(path)),
    sha256: createHash('sha256').update(bytes).digest('hex'),
    defaults_path: defaultsUsed,
    runs,
  };
}
