import type { Command } from 'commander';

/** Every sub-command registers itself from its own file in cli/; add yours here. */
export const commands: Array<(program: Command) => void> = [];
