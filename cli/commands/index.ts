/**
 * The registry of `veer` subcommands: name and one-line summary here, the command itself loaded only when it
 * runs, so `veer --help` and each command start without loading the others' dependencies (numerics, HTTP,
 * SQLite). Add one line per command file.
 */
import type { CliCommand } from '../command.ts';

export interface CliCommandEntry {
  /** The word after `veer`, e.g. `propagate`. */
  name: string;
  /** One line for `veer --help`. */
  summary: string;
  /** Loads the command's module. */
  load(): Promise<CliCommand>;
}

export const COMMANDS: readonly CliCommandEntry[] = [
  { name: 'plan', summary: 'plan correction burns for a problem file (in-process) and print the proposed plan', load: async () => (await import('./plan.ts')).planCommand },
  { name: 'propagate', summary: 'propagate a state under a force model (burns, samples, STM) and print the final state', load: async () => (await import('./propagate.ts')).propagateCommand },
  { name: 'tokens', summary: 'Add, list or revoke API tokens in the local store', load: async () => (await import('./tokens.ts')).tokensCommand },
  { name: 'review', summary: 'Show a plan\'s caveats, or approve / reject it (reviewer)', load: async () => (await import('./review.ts')).reviewCommand },
  { name: 'history', summary: 'Show a plan\'s archive history', load: async () => (await import('./history.ts')).historyCommand },
  { name: 'export', summary: 'Export a plan bundle (JSON) for audit or exchange', load: async () => (await import('./export.ts')).exportCommand },
  { name: 'verify', summary: 'Verify the archive hash chain (API, local store, or an exported bundle)', load: async () => (await import('./verify.ts')).verifyCommand },
  { name: 'submit', summary: 'Submit a retargeting problem to the service as a job (--watch to follow it)', load: async () => (await import('./submit.ts')).submitCommand },
  { name: 'status', summary: 'Show a job\'s state, progress and outcome', load: async () => (await import('./status.ts')).statusCommand },
  { name: 'watch', summary: 'Follow a job\'s progress until it ends (exit code tells the outcome)', load: async () => (await import('./watch.ts')).watchCommand },
  { name: 'cancel', summary: 'Cancel a waiting or running job', load: async () => (await import('./cancel.ts')).cancelCommand },
  { name: 'budget', summary: 'statistical Δv budget of a correction-burn sequence (in-process study, never a plan)', load: async () => (await import('./budget.ts')).budgetCommand },
];
