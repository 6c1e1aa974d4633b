import { RevtraceError } from '../errors.js';

/** A tracking run that failed on valid input (exit 1): `file` is the video. */
export class TrackingError extends RevtraceError {
  readonly file: string;
  constructor(message: string, file: string, options?: { cause?: unknown }) {
    super(message, 1, options);
    this.file = file;
  }
}
