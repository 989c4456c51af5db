/** Arguments of the in-process file commands (`veer plan`, `veer budget`): one input file, `--json`,
 * `--out FILE`, and any further options that take a value. */

export interface FileCommandArgs {
  file: string;
  json: boolean;
  /** Value of each option that takes one (e.g. `--out`, `--state`), when given. */
  values: Record<string, string | undefined>;
  /** Every value of each option, in order (for options that may repeat, e.g. `--ephemeris`). */
  all: Record<string, string[]>;
}

/**
 * Parses `args` for the command `name`; on bad usage writes the reason and the usage to stderr and returns
 * null (the command exits 2). `valueOptions` maps each option taking a value to what it names (for the error).
 */
export function parseFileCommandArgs(args: string[], name: string, usage: string, valueOptions: Record<string, string>): FileCommandArgs | null {
  const fail = (why: string): null => {
    process.stderr.write(`veer ${name}: ${why}\n\n${usage}\n`);
    return null;
  };
  let json = false;
  const values: Record<string, string | undefined> = {};
  const all: Record<string, string[]> = {};
  const files: string[] = [];
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    if (a === '--json') json = true;
    else if (a in valueOptions) {
      const v = args[++i];
      if (!v) return fail(`${a} needs ${valueOptions[a]}`);
      values[a] = v;
      all[a] = [...(all[a] ?? []), v];
    } else if (a.startsWith('-')) return fail(`unknown option '${a}'`);
    else files.push(a);
  }
  if (files.length !== 1) return fail(`give exactly one ${name === 'budget' ? 'request' : 'problem'} file`);
  return { file: files[0], json, values, all };
}
