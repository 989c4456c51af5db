/**
 * The leap-second table of a CLI command: `--leap-seconds FILE`, else the file named by VEER_LEAP_SECONDS,
 * else the built-in table. The file is read here and checked by the planner's leapSecondsFromFileBytes.
 */
import { readFile } from 'node:fs/promises';
import { leapSecondsFromFileBytes } from '../planner/index.ts';
import { BUILTIN_LEAP_SECONDS, InvalidInputError, type LeapSecondTable } from '../propagator/index.ts';

/** Usage text shared by the commands that read epochs. */
export const LEAP_SECONDS_USAGE = `  --leap-seconds FILE  read UTC through this leap-seconds.list (IERS / tz format; its #h hash is checked)
               instead of VEER_LEAP_SECONDS or the built-in table`;

/** Loads the table the command uses; InvalidInputError names the option or variable and the line at fault. */
export async function loadCliLeapSeconds(option: string | undefined, env: NodeJS.ProcessEnv = process.env): Promise<LeapSecondTable> {
  const field = option !== undefined ? '--leap-seconds' : 'VEER_LEAP_SECONDS';
  const path = option ?? (env.VEER_LEAP_SECONDS || undefined);
  if (path === undefined) return BUILTIN_LEAP_SECONDS;
  let bytes: Uint8Array;
  try {
    bytes = await readFile(path);
  } catch (error) {
    throw new InvalidInputError(field, `cannot read the leap-seconds list '${path}': ${(error as NodeJS.ErrnoException).code ?? (error as Error).message}`);
  }
  return leapSecondsFromFileBytes(bytes, path);
}
