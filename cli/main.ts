/** `veer` command dispatcher: finds the subcommand and hands it the rest of the arguments. */
import { COMMANDS } from './commands/index.ts';

function overview(): string {
  const lines = COMMANDS.map((c) => `  ${c.name.padEnd(12)} ${c.summary}`);
  return ['usage: veer <command> [options]', '', 'commands:', ...lines, '',
    'Run `veer <command> --help` for a command\'s options.',
    'Every plan veer prints is a proposal: it must be reviewed and approved by qualified flight-dynamics staff,',
    'verified independently, and handled under the mission\'s own procedures before any commanding.'].join('\n');
}

/** Runs the CLI with `args` (process.argv without node and script); resolves to the exit code. */
export async function main(args: string[]): Promise<number> {
  const [name, ...rest] = args;
  if (name === undefined || name === '--help' || name === '-h' || name === 'help') {
    process.stdout.write(overview() + '\n');
    return name === undefined ? 2 : 0;
  }
  const entry = COMMANDS.find((c) => c.name === name);
  if (!entry) {
    process.stderr.write(`veer: unknown command '${name}'\n\n${overview()}\n`);
    return 2;
  }
  const command = await entry.load();
  if (rest.includes('--help') || rest.includes('-h')) {
    process.stdout.write(command.usage + '\n');
    return 0;
  }
  try {
    return await command.run(rest);
  } catch (error) {
    const err = error as Error;
    const field = (err as { field?: string }).field;
    process.stderr.write(`veer ${name}: ${err.name}: ${err.message}${field && !err.message.startsWith(field) ? ` (field ${field})` : ''}\n`);
    return err.name === 'InvalidInputError' || err.name === 'OutOfSpanError' ? 2 : 1;
  }
}
