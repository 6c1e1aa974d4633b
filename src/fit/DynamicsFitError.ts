import { RevtraceError } from '../errors.js';

/** A spin-up or coast-down model that cannot describe the window (e.g. its parameters are not identifiable there); exit code 1. */
export class DynamicsFitError extends RevtraceError {
  constructor(message: string) {
    super(message, 1);
  }
}
