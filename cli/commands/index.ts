/** The registry of `veer` subcommands. Add one line per command file. */
import type { CliCommand } from '../command.ts';

export const COMMANDS: CliCommand[] = [];
