import { InputError } from '../errors.js';

/** One problem found in a manifest or its defaults file, located by line and column. */
export interface ManifestProblem {
  /** The file the problem is in, when not the manifest itself (the defaults file). */
  file?: string;
  /** Line of the file, 1 = the header line; null when the problem concerns the whole file. */
  line: number | null;
  /** 1-based column position, or null when the problem concerns a whole row or file. */
  column: number | null;
  /** Column name as written in the header, or null. */
  column_name: string | null;
  message: string;
}

/** Formats one problem as `file, line 4, column 3 "direction": message`. */
export function formatManifestProblem(file: string, p: ManifestProblem): string {
  const where = [p.file ?? file];
  if (p.line !== null) where.push(`line ${p.line}`);
  if (p.column !== null) where.push(`column ${p.column}${p.column_name ? ` "${p.column_name}"` : ''}`);
  else if (p.column_name) where.push(`"${p.column_name}"`);
  return `${where.join(', ')}: ${p.message}`;
}

/** Every problem found while validating a manifest (exit 2; nothing was run or written). */
export class ManifestError extends InputError {
  readonly file: string;
  readonly problems: ManifestProblem[];
  constructor(file: string, problems: ManifestProblem[]) {
    const n = problems.length;
    const lines = problems.map((p) => `  ${formatManifestProblem(file, p)}`);
    const files = [...new Set(problems.map((p) => p.file ?? file))];
    const where = files.length === 1 ? `the ${files[0] === file ? 'manifest' : 'defaults file'} ${files[0]} has` : `the manifest ${file} and its defaults file have`;
    super(`${where} ${n} problem${n === 1 ? '' : 's'}; fix ${n === 1 ? 'it' : 'them'} and run again (nothing was run):\n${lines.join('\n')}`);
    this.file = file;
    this.problems = problems;
  }
}
