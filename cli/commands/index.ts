/** The registry of `veer` subcommands. Add one line per command file. */
import type { CliCommand } from '../command.ts';
import { planCommand } from './plan.ts';
import { exportCommand } from './export.ts';
import { historyCommand } from './history.ts';
import { reviewCommand } from './review.ts';
import { tokensCommand } from './tokens.ts';
import { verifyCommand } from './verify.ts';
import { propagateCommand } from './propagate.ts';
import { submitCommand } from './submit.ts';
import { statusCommand } from './status.ts';
import { watchCommand } from './watch.ts';
import { cancelCommand } from './cancel.ts';

export const COMMANDS: CliCommand[] = [planCommand, propagateCommand, tokensCommand, reviewCommand, historyCommand, exportCommand, verifyCommand,
  submitCommand, statusCommand, watchCommand, cancelCommand];
