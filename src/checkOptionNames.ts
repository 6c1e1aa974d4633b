import { InputError } from './errors.js';

/**
 * Throws an InputError naming the first option a library function does not know (for callers from plain
 * JavaScript, where types do not check it, a misspelt option would otherwise be ignored without a word).
 * @param spellings names people reach for, and the option meant
 */
export function checkOptionNames(fn: string, options: object, names: readonly string[], spellings: Record<string, string>): void {
  for (const name of Object.keys(options)) {
    if (names.includes(name)) continue;
    const meant = spellings[name];
    throw new InputError(`${fn} has no option '${name}'${meant ? `; did you mean '${meant}'?` : `; the options are ${names.join(', ')}`}`);
  }
}
