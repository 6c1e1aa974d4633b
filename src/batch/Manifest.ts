import type { RunIdentity } from './RunRecord.js';
import type { RunSettings } from './RunSettings.js';

/** One validated manifest row: a run to process. */
export interface ManifestRun extends RunIdentity {
  /** Data row, 1 = first row under the header; orders the summary. */
  row: number;
  /** Line of the manifest file the row starts on (1 = header). */
  line: number;
  /** Effective settings: built-in defaults, then the defaults file, then the row's own columns. */
  settings: RunSettings;
}

/** A manifest that passed validation. */
export interface Manifest {
  /** Absolute path of the manifest file. */
  path: string;
  /** File name without extension: names the default output folder. */
  name: string;
  sha256: string;
  /** Absolute path of the defaults file used, or null. */
  defaults_path: string | null;
  runs: ManifestRun[];
}
