/** The registry of `veer` subcommands. Add one line per command file. */
import type { CliCommand } from '../command.ts';
import { planCommand } from './plan.ts';

export const COMMANDS: CliCommand[] = [planCommand];
