import type { Estimate } from '../fit/FitReport.js';

/** A point in full-frame pixels of the displayed video (x right, y down). */
export interface PointPx {
  x_px: number;
  y_px: number;
}

/** The contents of track.json: settings as used, the geometry found, and what went wrong. */
export interface TrackSummary {
  software: { name: 'revtrace'; version: string };
  input: { path: string; size_bytes: number; sha256: string; width: number; height: number; frame_count: number; nominal_fps: number; variable_frame_rate: boolean };
  /** Every option as actually used (defaults filled in). */
  settings: Record<string, unknown>;
  centre: { x_px: Estimate; y_px: Estimate; source: 'given' | 'ellipse-fit' };
  /** The marker path as an ellipse (semi-axes in px, angle of the major axis in deg, counterclockwise from +x as displayed). */
  view: {
    semi_major_px: number;
    semi_minor_px: number;
    major_axis_deg: number;
    axis_ratio: number;
    tilt_deg: Estimate;
    /** Largest difference between corrected and uncorrected angle over the run, deg. */
    max_correction_deg: number;
    corrected: boolean;
  } | null;
  camera_motion: { anchor: [number, number, number, number] | null; max_shift_px: number; max_rotation_deg: number; rms_shift_px: number } | null;
  frames: { decoded: number; lost: number; lost_by_reason: Record<string, number> };
  /** Where a gap was too long to unwrap safely: the series is split, angles after it restart their count. */
  splits: { after_frame: number; t_s: number; gap_s: number }[];
  /** How well the marker path fits the ellipse: RMS distance of kept points, px, and points rejected as off the path (absent when no fit was made). */
  path_fit?: { rms_px: number; rejected: number };
  /**
   * Only with several markers (--markers n > 1): frames in which each was found, how many frames had all of
   * them, the first such frame, each marker's angle relative to the first marker in the rotor plane (deg,
   * averaged over the frames with all found) and the semi-major axis of each marker's path (px).
   */
  markers?: {
    count: number;
    found_frames: number[];
    all_found_frames: number;
    first_all_found_frame: number;
    phase_offset_deg: number[];
    semi_major_px: number[];
  };
  /** Marker path samples for the report (thinned; with several markers, each marker's in turn), full-frame px. */
  path_sample: PointPx[];
  warnings: string[];
}
