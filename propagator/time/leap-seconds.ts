/**
 * UTC ↔ TAI through a leap-second table passed by the caller (see leap-second-table.ts for the table,
 * its expiry rule and the built-in default; leap-seconds-list.ts reads the IERS/tz file format).
 */
import { OutOfSpanError } from '../../contract/errors.ts';
import { calendarSecondsFromJ2000, daysFromCivil } from './calendar.ts';
import {
  BUILTIN_LEAP_SECONDS, isPastExpiry, type LeapSecondTable, stepStartTaiS, taiMinusUtcOnUtcDayS, utcDayOfTaiS,
} from './leap-second-table.ts';
import { taiFromTdb } from './tdb.ts';

/**
 * TAI − UTC (s) at a UTC date. Accepts an ISO-8601 date or date-time string read as UTC (`2017-01-01`,
 * `2016-12-31T23:59:60`, a trailing `Z` allowed) or a JS Date (UTC milliseconds; cannot name a leap
 * second). From the table's first step (1972-01-01) on; past its expiry the last offset (OutOfSpanError
 * before 1972).
 */
export function taiMinusUtcS(utc: string | Date, table: LeapSecondTable = BUILTIN_LEAP_SECONDS): number {
  if (utc instanceof Date) {
    const ms = utc.getTime();
    if (!Number.isFinite(ms)) throw new OutOfSpanError('utc', 'invalid Date');
    return taiMinusUtcOnUtcDayS(table, Math.floor(ms / 86400000) - 10957, 'utc');
  }
  const match = /^(\d{4})-(\d{2})-(\d{2})/.exec(utc.trim());
  if (!match) throw new OutOfSpanError('utc', `cannot read a date from '${utc}'`);
  return taiMinusUtcOnUtcDayS(table, daysFromCivil(Number(match[1]), Number(match[2]), Number(match[3])), 'utc');
}

/**
 * TAI seconds from J2000 of a UTC calendar date-time. `second` may be in [60, 61) only on a day the table
 * ends in a leap second (the caller checks). OutOfSpanError before the table's first step.
 */
export function taiSecondsFromUtcCalendar(
  table: LeapSecondTable, year: number, month: number, day: number, hour: number, minute: number, second: number,
  field = 'epoch',
): number {
  const offset = taiMinusUtcOnUtcDayS(table, daysFromCivil(year, month, day), field);
  return calendarSecondsFromJ2000(year, month, day, hour, minute, second) + offset;
}

/**
 * Is the UTC reading of this epoch (TDB s from J2000) on or after the table's expiry, where TAI − UTC is
 * assumed, not known? False before 1972 (no UTC reading there at all).
 */
export function isUtcPastLeapSecondExpiry(tdbS: number, table: LeapSecondTable): boolean {
  const taiS = taiFromTdb(tdbS);
  if (!(taiS >= stepStartTaiS(table.steps[0]))) return false;
  return isPastExpiry(table, utcDayOfTaiS(table, taiS));
}
