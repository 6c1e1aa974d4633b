import type { Command } from 'commander';

/** Options every command may read: those given before or after the sub-command name. */
export interface GlobalOptions {
  debug: boolean;
  ffmpeg?: string;
  ffprobe?: string;
}

/** Reads the global options from a sub-command's action context. */
export function globalOptions(command: Command): GlobalOptions {
  const o = command.optsWithGlobals<{ debug?: boolean; ffmpeg?: string; ffprobe?: string }>();
  return { debug: Boolean(o.debug), ffmpeg: o.ffmpeg, ffprobe: o.ffprobe };
}
