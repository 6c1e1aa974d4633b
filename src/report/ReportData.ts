import type { RunRecord } from '../batch/RunRecord.js';
import type { FitReport } from '../fit/FitReport.js';
import type { TrackSummary } from '../track/TrackSummary.js';

/** angle.csv as the report needs it: times, angle (NaN when lost), quality, and counts of each flag. */
export interface AngleTable {
  t_s: Float64Array;
  angle_deg: Float64Array;
  quality: Float64Array;
  /** 1 where the frame carries a flag (lost or doubtful), else 0. */
  flagged: Uint8Array;
  /** How many frames carry each flag text. */
  flag_counts: Record<string, number>;
}

/** rate.csv: smoothed rate with its pointwise interval, deg/s. */
export interface RateTable {
  t_s: Float64Array;
  rate_deg_s: Float64Array;
  lo_deg_s: Float64Array;
  hi_deg_s: Float64Array;
}

/** Everything the report shows about one run folder. */
export interface RunData {
  record: RunRecord;
  /** Absolute path of runs/<run>/. */
  dir: string;
  /** Files present in the run folder that the report links to. */
  files: string[];
  track: TrackSummary | null;
  /** fit.json when present, else the copy in run.json. */
  fit: FitReport | null;
  angle: AngleTable | null;
  rate: RateTable | null;
  preview_png: Uint8Array | null;
  /** Files that were missing or unreadable, one sentence each. */
  problems: string[];
}

/** The contents of a batch output folder, read once. */
export interface ReportData {
  /** Absolute path of the batch output folder. */
  out_dir: string;
  /** ISO 8601 time the data was read. */
  generated_at: string;
  software: { name: 'revtrace'; version: string };
  manifests: { path: string; sha256: string }[];
  runs: RunData[];
  /** Run folders whose run.json could not be read. */
  unreadable: { run: string; reason: string }[];
  /** Run folders under runs/ left out because they are not in the batch's manifest. */
  left_out: string[];
}
