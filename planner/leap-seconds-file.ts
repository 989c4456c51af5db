/**
 * A leap-seconds.list as a table, from the file's bytes (the doors read the file; this only hashes and
 * parses): the table records the path as given and the SHA-256 of the bytes, which the plan shows.
 */
import { createHash } from 'node:crypto';
import { InvalidInputError, type LeapSecondTable, parseLeapSecondsList } from '../propagator/index.ts';

/** Checks and parses the bytes of the leap-seconds.list at `path` (errors name `path` and the line). */
export function leapSecondsFromFileBytes(bytes: Uint8Array, path: string): LeapSecondTable {
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new InvalidInputError(path, 'is not a text file (not UTF-8): expected a leap-seconds.list', 'LEAP_SECONDS_FORMAT');
  }
  return parseLeapSecondsList(text, path, createHash('sha256').update(bytes).digest('hex'));
}
