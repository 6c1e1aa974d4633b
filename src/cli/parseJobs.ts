import { InputError } from '../errors.js';

/** Reads a --jobs value: a whole number of runs processed at once (≥ 1), or undefined for the default. */
export function parseJobs(value: string | undefined): number | undefined {
  if (value === undefined) return undefined;
  const jobs = /^\d+$/.test(value.trim()) ? Number(value) : NaN;
  if (!Number.isInteger(jobs) || jobs < 1) throw new InputError(`--jobs "${value}" is not a number of parallel runs; give a whole number of 1 or more`);
  return jobs;
}
