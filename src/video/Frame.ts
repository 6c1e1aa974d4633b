/** One decoded video frame, in the displayed orientation (rotation tag applied). */
export interface Frame {
  /** 0-based index among the frames actually decoded from the file (after any `from` seek). */
  index: number;
  /** The frame's own presentation time, seconds from the start of the stream. */
  t_s: number;
  width: number;
  height: number;
  /** 1 = gray (one byte per pixel), 3 = RGB (three bytes per pixel, row-major). */
  channels: 1 | 3;
  data: Uint8Array;
}
