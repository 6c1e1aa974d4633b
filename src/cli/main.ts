import { Command, CommanderError } from 'commander';
import { RevtraceError } from '../errors.js';
import { VERSION } from '../version.js';
import { commands } from './commands.js';

/** Builds the revtrace program: global options, then one sub-command per file in cli/. */
export function buildProgram(): Command {
  const program = new Command('revtrace')
    .description('Rotation angle and rate from camera footage of rotating apparatus.')
    .version(VERSION)
    .option('--debug', 'print stack traces for errors')
    .option('--ffmpeg <path>', 'ffmpeg executable to use (else REVTRACE_FFMPEG, bundled, PATH)')
    .option('--ffprobe <path>', 'ffprobe executable to use (else REVTRACE_FFPROBE, bundled, PATH)')
    // commander's own parse errors become one line in revtrace's form, with where to find the usage
    .configureOutput({ outputError: (text, write) => write(`${text.trim().replace(/^error: /, 'revtrace: ')} (run revtrace --help for usage)\n`) })
    .exitOverride();
  for (const register of commands) register(program);
  return program;
}

/** Runs the CLI and returns the exit code: 0 ok, 1 a run failed, 2 bad input. Errors become one line. */
export async function main(argv: string[]): Promise<number> {
  const program = buildProgram();
  try {
    await program.parseAsync(argv);
    return typeof process.exitCode === 'number' ? process.exitCode : 0;
  } catch (err) {
    if (err instanceof CommanderError) {
      // commander already printed its message (or help / version)
      return err.exitCode === 0 ? 0 : 2;
    }
    const debug = program.opts<{ debug?: boolean }>().debug || process.argv.includes('--debug');
    if (err instanceof RevtraceError) {
      process.stderr.write(`revtrace: ${err.message}\n`);
      if (debug && err.stack) process.stderr.write(`${err.stack}\n`);
      return err.exitCode;
    }
    const message = err instanceof Error ? err.message : String(err);
    process.stderr.write(`revtrace: internal error: ${message} (run again with --debug for details)\n`);
    if (debug && err instanceof Error && err.stack) process.stderr.write(`${err.stack}\n`);
    return 1;
  }
}
