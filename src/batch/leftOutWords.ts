/** Names left-out run folders: all of them up to eight, else the first eight and how many more. */
export function leftOutWords(runs: string[]): string {
  const shown = runs.slice(0, 8).join(', ');
  const more = runs.length > 8 ? ` and ${runs.length - 8} more` : '';
  return `${runs.length} run folder${runs.length === 1 ? '' : 's'} (${shown}${more})`;
}
