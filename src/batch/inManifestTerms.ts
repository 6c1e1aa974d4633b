/** Command-line options of track and fit that a manifest sets through a column of the same name (centre is the column center). */
const OPTION_TO_COLUMN = /--(roi|anchor|center|centre|markers|marker|from|to|tilt|model|margin|level)\b/g;

/**
 * A message from the track or fit stage, reworded for a batch run whose settings come from manifest
 * columns (or the defaults file) rather than command-line options: "give --center x,y" becomes
 * "give column center x,y". Other text is left as it is.
 */
export function inManifestTerms(message: string): string {
  return message.replace(OPTION_TO_COLUMN, (_m, name: string) => `column ${name === 'centre' ? 'center' : name}`);
}
