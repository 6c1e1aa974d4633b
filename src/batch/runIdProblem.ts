/** Names Windows refuses as file names whatever the extension (common practice, no source). */
const RESERVED = /^(con|prn|aux|nul|com[0-9]|lpt[0-9])(\..*)?$/i;

/**
 * Why a run id cannot be used as a folder name under runs/, or null when it is safe: 1–64 characters
 * of letters, digits, '.', '_' and '-', starting with a letter or digit, not ending with '.', not a
 * name reserved on Windows. This keeps every run inside the output folder on every file system.
 */
export function runIdProblem(run: string): string | null {
  if (run === '') return 'the run id is empty; give each row a short unique name such as fwd-01';
  if (run.length > 64) return `the run id "${run.slice(0, 20)}…" is longer than 64 characters; shorten it`;
  if (run.includes('/') || run.includes('\\') || run === '.' || run === '..') {
    return `the run id "${run}" would leave the output folder (it contains a path separator or is "." or ".."); use letters, digits, ".", "_" and "-" only`;
  }
  if (!/^[A-Za-z0-9][A-Za-z0-9._-]*$/.test(run)) {
    return `the run id "${run}" is not safe as a folder name; use letters, digits, ".", "_" and "-" only, starting with a letter or digit`;
  }
  if (run.endsWith('.')) return `the run id "${run}" ends with "."; remove the trailing dot`;
  if (RESERVED.test(run)) return `the run id "${run}" is a reserved device name on Windows; choose another`;
  return null;
}
