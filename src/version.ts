import { readFileSync } from 'node:fs';

/** The installed revtrace version, read from package.json once. */
export const VERSION: string = (JSON.parse(readFileSync(new URL('../package.json', import.meta.url), 'utf8')) as { version: string }).version;

/** The `software` block every output file carries. */
export const SOFTWARE = { name: 'revtrace', version: VERSION } as const;
