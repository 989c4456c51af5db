/**
 * `--ephemeris FILE` (repeatable) of `veer plan` and `veer propagate`: each CCSDS OEM (KVN or XML, one or
 * more segments, one or more bodies told apart by OBJECT_NAME) replaces the built-in series for the bodies
 * it tabulates. Read by ccsds/ (loadEphemerisFiles: bytes, SHA-256, the CCSDS reader), checked against the
 * problem's span by the planner (ephemerisWithFiles). Every error names the file, and for its content the
 * line and keyword.
 */
import type { EphemerisFileTable, LeapSecondTable } from '../propagator/index.ts';

/** ccsds/'s loadEphemerisFiles, loaded when a command is given files: the CCSDS readers (tens of kB of code) are
 * compiled only then, not at every `veer plan` start. */
export async function loadEphemerisFiles(paths: readonly string[], leapSeconds?: LeapSecondTable, field?: string,
  expectedSha256?: readonly string[]): Promise<EphemerisFileTable[]> {
  if (paths.length === 0) return [];
  return (await import('../ccsds/index.ts')).loadEphemerisFiles(paths, leapSeconds, field, expectedSha256);
}

/** Usage text shared by the commands that take ephemeris files. */
export const EPHEMERIS_USAGE = `  --ephemeris FILE.oem  take the bodies this CCSDS OEM tabulates (by OBJECT_NAME, e.g. MARS relative
               to SUN) from it instead of the built-in series; repeat for more files. Its span must cover
               the problem's (never extrapolated); the plan records the file's name, SHA-256 and span`;
