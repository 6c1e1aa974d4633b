import { RevtraceError } from '../errors.js';

/** Fields that describe a failed ffmpeg/ffprobe run. */
export interface FfmpegErrorDetails {
  /** The video (or output) file the tool was working on, if any. */
  file?: string;
  /** The tool's exit code; null when it was killed by a signal or never started. */
  exitCode: number | null;
  /** The last few KB of the tool's stderr (progress and per-frame lines removed). */
  stderrTail: string;
  cause?: unknown;
}

/** An ffmpeg or ffprobe process failed, hung or could not start: the run fails (exit code 1). */
export class FfmpegError extends RevtraceError {
  readonly file: string | undefined;
  readonly toolExitCode: number | null;
  readonly stderrTail: string;
  constructor(message: string, details: FfmpegErrorDetails) {
    super(message, 1, { cause: details.cause });
    this.file = details.file;
    this.toolExitCode = details.exitCode;
    this.stderrTail = details.stderrTail;
  }
}
