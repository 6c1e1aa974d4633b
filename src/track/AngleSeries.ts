/**
 * The tracked angle, one entry per decoded frame (the rows of angle.csv).
 * Angles: degrees, unwrapped and cumulative, counterclockwise positive as seen in the displayed
 * video, in the rotor's own plane. A lost frame has NaN in x_px, y_px and angle_deg and a reason in flag.
 */
export interface AngleSeries {
  frame: Int32Array;
  t_s: Float64Array;
  x_px: Float64Array;
  y_px: Float64Array;
  angle_deg: Float64Array;
  /** 0 (no confidence) to 1. */
  quality: Float64Array;
  /** '' for a good frame; otherwise a short reason such as 'lost:gate' or 'lost:no-blob'. */
  flag: string[];
}
