/**
 * The service's leap-second table (API and worker alike): the leap-seconds.list named by VEER_LEAP_SECONDS,
 * else the built-in table. Read once at start-up; a file that cannot be read or fails its checks stops the
 * start with a ConfigError naming the variable and the line. Also the start-up log line and the expiry test.
 */
import { readFile } from 'node:fs/promises';
import type { Logger } from 'pino';
import { ConfigError } from '../../contract/env-config.ts';
import { leapSecondsFromFileBytes } from '../../planner/index.ts';
import { BUILTIN_LEAP_SECONDS, type LeapSecondTable } from '../../propagator/index.ts';

/** Loads the table named by `path` (the VEER_LEAP_SECONDS value), or the built-in one when unset. */
export async function loadServiceLeapSeconds(path: string | undefined): Promise<LeapSecondTable> {
  if (path === undefined) return BUILTIN_LEAP_SECONDS;
  let bytes: Uint8Array;
  try {
    bytes = await readFile(path);
  } catch (error) {
    throw new ConfigError([`VEER_LEAP_SECONDS: cannot read '${path}' (${(error as NodeJS.ErrnoException).code ?? (error as Error).message})`]);
  }
  try {
    return leapSecondsFromFileBytes(bytes, path);
  } catch (error) {
    throw new ConfigError([`VEER_LEAP_SECONDS: ${(error as Error).message}`]);
  }
}

/** Unix milliseconds of 00:00 UTC on the table's expiry day. */
export function leapSecondsExpiryMs(table: LeapSecondTable): number {
  return Date.parse(`${table.expiresUtc}T00:00:00Z`);
}

/** Has the table expired at `now` (UTC epochs from its expiry on get an assumed TAI − UTC and a caveat)? */
export function leapSecondsExpired(table: LeapSecondTable, now: Date): boolean {
  return now.getTime() >= leapSecondsExpiryMs(table);
}

/** The start-up log line: the table in use at info, and a warning when it has expired at `now`. */
export function logLeapSecondsAtStart(table: LeapSecondTable, logger: Logger, now: Date): void {
  const fields = { leapSeconds: { source: table.origin, path: table.path, sha256: table.sha256, expiresUtc: table.expiresUtc } };
  if (leapSecondsExpired(table, now)) {
    logger.warn(fields, `leap-second table expired on ${table.expiresUtc}: UTC epochs from then on assume no new leap second `
      + '(plans carry the UTC_LEAP_SECONDS_ASSUMED caveat); set VEER_LEAP_SECONDS to a current leap-seconds.list');
  } else {
    logger.info(fields, `leap-second table: ${table.description}`);
  }
}
