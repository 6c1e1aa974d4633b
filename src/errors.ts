/** Base class of every error revtrace reports to a person: `message` is one sentence, `exitCode` what the CLI returns. */
export class RevtraceError extends Error {
  readonly exitCode: number;
  constructor(message: string, exitCode = 1, options?: { cause?: unknown }) {
    super(message, options);
    this.name = new.target.name;
    this.exitCode = exitCode;
  }
}

/** Bad input from the user (an option, a file, a manifest): the CLI exits 2. */
export class InputError extends RevtraceError {
  constructor(message: string, options?: { cause?: unknown }) {
    super(message, 2, options);
  }
}

/** The person stopped the command (Ctrl-C, SIGTERM): the CLI exits 130, as shells do for SIGINT. */
export class InterruptedError extends RevtraceError {
  constructor(message: string) {
    super(message, 130);
  }
}
