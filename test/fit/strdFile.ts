// Reader for the NIST StRD file format (Statistical Reference Datasets, https://www.itl.nist.gov/div898/strd/).
// The files live outside the repository, in ../shared/reference/strd/ (relative to the repo root),
// byte-for-byte as distributed (CRLF line endings); see SOURCES.md there.
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { resolve } from 'node:path';

/** One certified parameter: its name as printed (B0, b1, …), the certified estimate and its standard deviation. */
export interface StrdCertified {
  name: string;
  value: number;
  sd: number;
}

/** A parsed StRD file. */
export interface StrdFile {
  /** Certified parameters in file order. */
  certified: StrdCertified[];
  /** Certified residual standard deviation, when printed. */
  residualSd?: number;
  /** Certified residual sum of squares (nonlinear files print it; linear files print it in the ANOVA table). */
  residualSumSquares?: number;
  /** x[i] = predictor values of observation i (one entry per predictor, in file column order). */
  x: number[][];
  /** y[i] = response of observation i (the first data column). */
  y: number[];
  /** Nonlinear files only: starts[k] = the k-th starting vector (Start 1, Start 2), one value per parameter. */
  starts?: number[][];
}

/** Repository root (two folders above this file). */
const repoRoot = fileURLToPath(new URL('../../', import.meta.url));

/** Folder of the shared StRD files, relative to the repository root. */
export const strdFolder = resolve(repoRoot, '../shared/reference/strd');

/** Line range "(lines A to B)" printed in the header for a section, 1-based inclusive. */
function sectionLines(lines: string[], section: string): [number, number] | undefined {
  for (const line of lines.slice(0, 12)) {
    const m = new RegExp(`${section}\\s*\\(lines\\s+(\\d+)\\s+to\\s+(\\d+)\\)`).exec(line);
    if (m) return [Number(m[1]), Number(m[2])];
  }
  return undefined;
}

/** Reads and parses one StRD file by dataset name ('Norris' or 'Norris.dat'). */
export function readStrd(name: string): StrdFile {
  const file = resolve(strdFolder, name.endsWith('.dat') ? name : `${name}.dat`);
  const lines = readFileSync(file, 'latin1').split(/\r?\n/);
  const certRange = sectionLines(lines, 'Certified Values');
  const dataRange = sectionLines(lines, 'Data');
  if (!certRange || !dataRange) throw new Error(`${file}: no "Certified Values"/"Data" line ranges in the header`);
  const nonlinear = sectionLines(lines, 'Starting Values') !== undefined;

  const certified: StrdCertified[] = [];
  const starts: number[][] = [];
  let residualSd: number | undefined;
  let residualSumSquares: number | undefined;
  const num = String.raw`[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?`;
  for (let i = certRange[0] - 1; i < certRange[1] && i < lines.length; i++) {
    const line = lines[i]!;
    if (nonlinear) {
      // "  b1 =   500         250           2.3894212918E+02  2.7070075241E+00"
      const m = new RegExp(`^\\s*(b\\d+)\\s*=\\s*(${num})\\s+(${num})\\s+(${num})\\s+(${num})\\s*$`).exec(line);
      if (m) {
        certified.push({ name: m[1]!, value: Number(m[4]), sd: Number(m[5]) });
        starts[0] ??= [];
        starts[1] ??= [];
        starts[0].push(Number(m[2]));
        starts[1].push(Number(m[3]));
      }
    } else {
      // "        B0        -0.262323073774029     0.232818234301152"
      const m = new RegExp(`^\\s*(B\\d+)\\s+(${num})\\s+(${num})\\s*$`).exec(line);
      if (m) certified.push({ name: m[1]!, value: Number(m[2]), sd: Number(m[3]) });
    }
    const sdMatch = new RegExp(`Standard Deviation:?\\s+(${num})\\s*$`).exec(line);
    if (sdMatch && !/Parameter|Estimate/.test(line)) residualSd = Number(sdMatch[1]);
    const rssMatch = new RegExp(`Residual Sum of Squares:\\s+(${num})`).exec(line);
    if (rssMatch) residualSumSquares = Number(rssMatch[1]);
  }
  // Linear files: the ANOVA table's "Residual  df  SS  MS" line.
  if (residualSumSquares === undefined) {
    for (let i = certRange[0] - 1; i < dataRange[0] - 1 && i < lines.length; i++) {
      const m = new RegExp(`^Residual\\s+(\\d+)\\s+(${num})\\s+(${num})`).exec(lines[i]!);
      if (m) residualSumSquares = Number(m[2]);
    }
  }

  const x: number[][] = [];
  const y: number[] = [];
  for (let i = dataRange[0] - 1; i < dataRange[1] && i < lines.length; i++) {
    const cells = lines[i]!.trim().split(/\s+/).filter((c) => c !== '');
    if (cells.length < 2) continue;
    const values = cells.map(Number);
    if (values.some((v) => !Number.isFinite(v))) throw new Error(`${file}: line ${i + 1} is not numeric: ${lines[i]}`);
    y.push(values[0]!);
    x.push(values.slice(1));
  }
  const parsed: StrdFile = { certified, x, y };
  if (residualSd !== undefined) parsed.residualSd = residualSd;
  if (residualSumSquares !== undefined) parsed.residualSumSquares = residualSumSquares;
  if (nonlinear) parsed.starts = starts;
  return parsed;
}
