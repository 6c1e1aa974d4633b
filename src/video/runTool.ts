import { spawn } from 'node:child_process';
import { FfmpegError } from './FfmpegError.js';

/** How one ffmpeg/ffprobe process is run. */
export interface RunToolOptions {
  /** Name used in messages ("ffmpeg", "ffprobe"); default: the executable's base name. */
  tool?: string;
  /** The file the tool works on, for error messages and FfmpegError.file. */
  file?: string;
  /** Bytes to write to the tool's stdin (written with backpressure); stdin is closed when it ends. */
  stdin?: Iterable<Uint8Array> | AsyncIterable<Uint8Array>;
  /** Called for each stderr line; return true when the line was consumed (it then stays out of the error tail). */
  onStderrLine?: (line: string) => boolean | void;
  /** Called once when stderr has closed (no more lines will come). */
  onStderrEnd?: () => void;
  /** Stops the tool (the child is killed and the iteration throws the signal's reason). */
  signal?: AbortSignal;
  /** Kills the tool and fails after this many milliseconds (default: no limit). */
  timeout_ms?: number;
  /** Bytes of stderr kept for the error message (default 4096). */
  stderrTailBytes?: number;
}

/** Default number of stderr bytes kept for error messages. */
const STDERR_TAIL_BYTES = 4096;

/** The last meaningful stderr line, for a one-sentence message. */
export function lastStderrLine(tail: string): string {
  const lines = tail.split(/\r?\n|\r/).map((s) => s.trim()).filter((s) => s.length > 0);
  return lines.length > 0 ? lines[lines.length - 1]! : '';
}

/**
 * Runs an external tool with an argument array (never a shell) and yields its stdout chunks as the
 * consumer pulls them (backpressure reaches the tool through the pipe). Feeds `stdin` with
 * backpressure, keeps the last few KB of stderr, and kills the child in `finally` when the consumer
 * stops early, the signal aborts or the timeout passes, so no process is left behind.
 * Throws FfmpegError when the tool cannot start, exits non-zero or is killed by a signal.
 */
export async function* runTool(path: string, args: string[], options: RunToolOptions = {}): AsyncGenerator<Buffer, void, undefined> {
  const tool = options.tool ?? path.split(/[\\/]/).pop() ?? path;
  const tailBytes = options.stderrTailBytes ?? STDERR_TAIL_BYTES;
  const timeoutSignal = options.timeout_ms !== undefined ? AbortSignal.timeout(options.timeout_ms) : undefined;
  const signals = [options.signal, timeoutSignal].filter((s): s is AbortSignal => s !== undefined);
  const signal = signals.length === 0 ? undefined : signals.length === 1 ? signals[0] : AbortSignal.any(signals);
  signal?.throwIfAborted();

  const child = spawn(path, args, { stdio: [options.stdin ? 'pipe' : 'ignore', 'pipe', 'pipe'], windowsHide: true });
  let spawnError: Error | undefined;
  let stdinError: unknown;
  let tail = '';
  let partial = '';
  const keepLine = (line: string): void => {
    if (options.onStderrLine?.(line) === true) return;
    tail += `${line}\n`;
    if (tail.length > tailBytes) tail = tail.slice(tail.length - tailBytes);
  };
  const stderr = child.stderr!;
  const stdout = child.stdout!;
  stderr.setEncoding('utf8');
  stderr.on('data', (text: string) => {
    partial += text;
    const pieces = partial.split(/\r?\n|\r/);
    partial = pieces.pop() ?? '';
    for (const line of pieces) keepLine(line);
    if (partial.length > 65536) { keepLine(partial); partial = ''; }
  });
  stderr.once('close', () => {
    if (partial.length > 0) { keepLine(partial); partial = ''; }
    options.onStderrEnd?.();
  });
  const closed = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) => {
    child.once('close', (code, sig) => resolve({ code, signal: sig }));
    child.once('error', (err) => { spawnError = err; resolve({ code: null, signal: null }); });
  });
  const kill = (): void => { if (child.exitCode === null && child.signalCode === null) child.kill('SIGKILL'); };
  const onAbort = (): void => kill();
  signal?.addEventListener('abort', onAbort, { once: true });

  const stdinDone = options.stdin && child.stdin ? feedStdin(child.stdin, options.stdin).catch((err: unknown) => {
    stdinError = err;
    kill();
  }) : Promise.resolve();

  let finished = false;
  try {
    for await (const chunk of stdout) {
      yield chunk as Buffer;
    }
    await stdinDone;
    const exit = await closed;
    finished = true;
    if (stdinError !== undefined) throw stdinError;
    if (signal?.aborted) {
      if (timeoutSignal?.aborted && !options.signal?.aborted) {
        throw new FfmpegError(`${tool} did not finish within ${((options.timeout_ms ?? 0) / 1000).toFixed(1)} s${options.file ? ` on ${options.file}` : ''} and was stopped.`, { file: options.file, exitCode: exit.code, stderrTail: tail });
      }
      throw signal.reason instanceof Error ? signal.reason : new Error(String(signal.reason));
    }
    if (spawnError) {
      const code = (spawnError as NodeJS.ErrnoException).code ?? spawnError.message;
      throw new FfmpegError(`Could not start ${tool} at ${path} (${code}); check the path or pass --${tool} <path>.`, { file: options.file, exitCode: null, stderrTail: tail, cause: spawnError });
    }
    if (exit.code !== 0) {
      const why = lastStderrLine(tail);
      const how = exit.code === null ? `was killed by ${exit.signal ?? 'a signal'}` : `exited with code ${exit.code}`;
      throw new FfmpegError(`${tool} ${how}${options.file ? ` on ${options.file}` : ''}${why ? `: ${why}` : ''}.`.replace(/\.\.$/, '.'), { file: options.file, exitCode: exit.code, stderrTail: tail });
    }
  } finally {
    signal?.removeEventListener('abort', onAbort);
    if (!finished) {
      kill();
      await closed;
      await stdinDone;
    }
  }
}

/** Runs a tool to the end and returns all of its stdout (for short outputs such as ffprobe JSON). */
export async function runToolToEnd(path: string, args: string[], options: RunToolOptions = {}): Promise<Buffer> {
  const chunks: Buffer[] = [];
  for await (const chunk of runTool(path, args, options)) chunks.push(chunk);
  return Buffer.concat(chunks);
}

/** Writes chunks to a child's stdin, waiting for 'drain' when the pipe is full; ends the pipe at the end. */
async function feedStdin(stdin: NodeJS.WritableStream & { destroyed?: boolean }, source: Iterable<Uint8Array> | AsyncIterable<Uint8Array>): Promise<void> {
  let broken = false;
  const gone = new Promise<void>((resolve) => {
    const stop = (): void => { broken = true; resolve(); };
    stdin.on('error', stop); // EPIPE when the tool exits early: its exit code tells the story
    stdin.once('close', stop);
  });
  for await (const chunk of source) {
    if (broken) return;
    if (!stdin.write(chunk)) {
      await Promise.race([new Promise<void>((resolve) => stdin.once('drain', () => resolve())), gone]);
    }
  }
  if (!broken) stdin.end();
}
