/**
 * `--ephemeris FILE` (repeatable) of `veer plan` and `veer propagate`: each CCSDS OEM (KVN or XML, one or
 * more segments, one or more bodies told apart by OBJECT_NAME) replaces the built-in series for the bodies
 * it tabulates. Read here (bytes, SHA-256, the CCSDS reader), checked against the problem's span by the
 * planner (ephemerisWithFiles). Every error names the file, and for its content the line and keyword.
 */
import { createHash } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import { basename } from 'node:path';
import { CcsdsFormatError, oemToEphemeris, readOem, type Oem } from '../ccsds/index.ts';
import type { EphemerisFileTable } from '../planner/index.ts';
import { BUILTIN_LEAP_SECONDS, InvalidInputError, type LeapSecondTable } from '../propagator/index.ts';

/** Usage text shared by the commands that take ephemeris files. */
export const EPHEMERIS_USAGE = `  --ephemeris FILE.oem  take the bodies this CCSDS OEM tabulates (by OBJECT_NAME, e.g. MARS relative
               to SUN) from it instead of the built-in series; repeat for more files. Its span must cover
               the problem's (never extrapolated); the plan records the file's name, SHA-256 and span`;

/** The file's text as one OEM per body (segments grouped by OBJECT_NAME, in file order). */
function byObject(oem: Oem): Oem[] {
  const names = [...new Set(oem.segments.map((s) => s.metadata.objectName))];
  return names.map((name) => ({ header: oem.header, segments: oem.segments.filter((s) => s.metadata.objectName === name) }));
}

/** Re-throws an InvalidInputError of `path`'s content with the file named (line and keyword kept). */
function naming<T>(path: string, read: () => T): T {
  try {
    return read();
  } catch (error) {
    if (error instanceof CcsdsFormatError) {
      throw new CcsdsFormatError(error.field, error.line, `${path}: ${error.message.replace(/^[^:]*: (line \d+|end of file): /, '')}`);
    }
    if (error instanceof InvalidInputError) throw new InvalidInputError('--ephemeris', `${path}: ${error.message}`);
    throw error;
  }
}

/** Loads every file given with --ephemeris; one table per body, its name unique by the file's SHA-256. An OEM
 * written in UTC is read through `leapSeconds` (the command's table). */
export async function loadEphemerisFiles(paths: readonly string[], leapSeconds: LeapSecondTable = BUILTIN_LEAP_SECONDS): Promise<EphemerisFileTable[]> {
  const tables: EphemerisFileTable[] = [];
  for (const path of paths) {
    let bytes: Buffer;
    try {
      bytes = await readFile(path);
    } catch (error) {
      throw new InvalidInputError('--ephemeris', `cannot read '${path}': ${(error as NodeJS.ErrnoException).code ?? (error as Error).message}`);
    }
    const sha256 = createHash('sha256').update(bytes).digest('hex');
    const oem = naming(path, () => readOem(bytes.toString('utf8'), leapSeconds));
    for (const one of byObject(oem)) {
      const objectName = one.segments[0].metadata.objectName;
      const table = naming(path, () => oemToEphemeris(one, { name: `OEM ${objectName} from ${basename(path)} (sha256 ${sha256.slice(0, 12)})` }));
      tables.push({ table, file: basename(path), sha256 });
    }
  }
  return tables;
}
