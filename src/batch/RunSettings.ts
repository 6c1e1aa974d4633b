import type { RegionPx } from '../track/TrackOptions.js';

export type { RegionPx };

/** Track settings of one run after defaults and per-row overrides; null means "the tracker's default". */
export interface TrackSettings {
  roi: RegionPx | null;
  centre: { x_px: number; y_px: number } | null;
  /** 'bright' | 'dark' | 'color:#rrggbb' | 'texture', or null for the tracker's default. */
  marker: string | null;
  anchor: RegionPx | null;
  from_s: number | null;
  to_s: number | null;
  tilt_deg: number | null;
  /** Marker spots on the hub followed together (bright, dark, colour markers), or null for one. */
  markers: number | null;
}

export type FitModelChoice = 'steady' | 'spinup' | 'spindown' | 'auto';

/** Fit settings of one run after defaults and per-row overrides. */
export interface FitSettings {
  model: FitModelChoice;
  /** Confidence level of every interval, e.g. 0.95. */
  level: number;
  /** Equivalence margin for "turns at all?", deg/s, or null for none. */
  margin_deg_s: number | null;
  /** Seed of any randomised step, fixed so a rerun gives identical numbers. */
  seed: number;
}

/** The effective settings of one run: what the cache key covers and run.json records. */
export interface RunSettings {
  track: TrackSettings;
  fit: FitSettings;
}

/** Settings used when neither the defaults file nor the row says otherwise. */
export const DEFAULT_RUN_SETTINGS: RunSettings = {
  track: { roi: null, centre: null, marker: null, anchor: null, from_s: null, to_s: null, tilt_deg: null, markers: null },
  fit: { model: 'auto', level: 0.95, margin_deg_s: null, seed: 1 },
};
