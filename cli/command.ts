/** What a `veer` subcommand provides (its one-line summary sits in the registry, cli/commands/index.ts). Commands write reports to stdout, progress to stderr. */
export interface CliCommand {
  /** The word after `veer`, e.g. `propagate`. */
  name: string;
  /** Full usage text for `veer <name> --help`. */
  usage: string;
  /** Runs the command; resolves to the process exit code (0 success, 1 failure, 2 bad usage or input). */
  run(args: string[]): Promise<number>;
}
