/**
 * TAI − UTC through the leap-second table, 1972 onward (UTC with whole-second steps only).
 *
 * Source: IERS Bulletin C (the table of TAI − UTC steps is repeated in every issue), typed from memory.
 * The table is known valid to LEAP_TABLE_VALID_UNTIL_UTC: Bulletin C 70 (July 2025, from memory)
 * announced no leap second at the end of December 2025, so TAI − UTC = 37 s holds through
 * 2026-06-30T23:59:59 UTC. (Bulletin C 68 of July 2024 — no leap second at the end of 2024 — is confirmed
 * by a stored copy; C 69 and C 70 are from memory.) The next possible step is at the end of June 2026; its announcement is not
 * known here, so UTC epochs from 2026-06-30T23:59:60 on throw OutOfSpanError. Extend the table (and the
 * date) when a newer Bulletin C is at hand.
 */
import { OutOfSpanError } from '../../contract/errors.ts';
import { calendarSecondsFromJ2000, civilFromDays, daysFromCivil } from './calendar.ts';

/** [year, month (1-12), TAI − UTC in s from 00:00:00 UTC on the 1st of that month]. */
const LEAP_STEPS: ReadonlyArray<readonly [number, number, number]> = [
  [1972, 1, 10], [1972, 7, 11], [1973, 1, 12], [1974, 1, 13], [1975, 1, 14], [1976, 1, 15],
  [1977, 1, 16], [1978, 1, 17], [1979, 1, 18], [1980, 1, 19], [1981, 7, 20], [1982, 7, 21],
  [1983, 7, 22], [1985, 7, 23], [1988, 1, 24], [1990, 1, 25], [1991, 1, 26], [1992, 7, 27],
  [1993, 7, 28], [1994, 7, 29], [1996, 1, 30], [1997, 7, 31], [1999, 1, 32], [2006, 1, 33],
  [2009, 1, 34], [2012, 7, 35], [2015, 7, 36], [2017, 1, 37],
];

/** First UTC instant the table does NOT cover, as an ISO string (the table is valid strictly before). */
export const LEAP_TABLE_VALID_UNTIL_UTC = '2026-07-01T00:00:00';
/** Source of the table's end date, for reports. */
export const LEAP_TABLE_SOURCE = 'IERS Bulletin C 70 (July 2025; from memory): no leap second at end of 2025';
/** First UTC instant the table covers. */
export const LEAP_TABLE_VALID_FROM_UTC = '1972-01-01T00:00:00';

/** UTC day (from 2000-01-01) each step starts on, and the TAI − UTC from then on. */
const STEP_DAYS = LEAP_STEPS.map(([y, m]) => daysFromCivil(y, m, 1));
const STEP_OFFSETS_S = LEAP_STEPS.map(([, , s]) => s);
const FIRST_DAY = STEP_DAYS[0];
const END_DAY = daysFromCivil(2026, 7, 1);
/** TAI seconds from J2000 at which each step starts (calendar seconds of its 00:00 UTC + new offset). */
const STEP_TAI_S = STEP_DAYS.map((d, i) => d * 86400 - 43200 + STEP_OFFSETS_S[i]);
const FIRST_TAI_S = STEP_TAI_S[0];
/** TAI seconds of the end instant (no step there is known; the last offset applies up to it). */
const END_TAI_S = END_DAY * 86400 - 43200 + STEP_OFFSETS_S[STEP_OFFSETS_S.length - 1];

function outOfSpan(field: string, what: string): OutOfSpanError {
  return new OutOfSpanError(field, `${what} is outside the leap-second table's span `
    + `[${LEAP_TABLE_VALID_FROM_UTC}, ${LEAP_TABLE_VALID_UNTIL_UTC}) UTC (${LEAP_TABLE_SOURCE})`);
}

/**
 * TAI − UTC in seconds on a UTC calendar day (days from 2000-01-01). A leap second 23:59:60 belongs to
 * the day it ends, so it takes that day's offset. Throws OutOfSpanError outside
 * [1972-01-01, 2026-07-01) UTC.
 */
export function taiMinusUtcOnUtcDayS(utcDay: number, field = 'epoch'): number {
  if (utcDay < FIRST_DAY || utcDay >= END_DAY) {
    const { year, month, day } = civilFromDays(utcDay);
    const date = `${year}-${String(month).padStart(2, '0')}-${String(day).padStart(2, '0')}`;
    throw outOfSpan(field, `UTC date ${date}`);
  }
  let i = STEP_DAYS.length - 1;
  while (STEP_DAYS[i] > utcDay) i--;
  return STEP_OFFSETS_S[i];
}

/**
 * TAI − UTC (s) at a UTC date. Accepts an ISO-8601 date or date-time string read as UTC (`2017-01-01`,
 * `2016-12-31T23:59:60`, a trailing `Z` allowed) or a JS Date (UTC milliseconds; cannot name a leap
 * second). Valid range [1972-01-01, 2026-07-01) UTC; OutOfSpanError outside.
 */
export function taiMinusUtcS(utc: string | Date): number {
  if (utc instanceof Date) {
    const ms = utc.getTime();
    if (!Number.isFinite(ms)) throw new OutOfSpanError('utc', 'invalid Date');
    return taiMinusUtcOnUtcDayS(Math.floor(ms / 86400000) - 10957, 'utc');
  }
  const match = /^(\d{4})-(\d{2})-(\d{2})/.exec(utc.trim());
  if (!match) throw new OutOfSpanError('utc', `cannot read a date from '${utc}'`);
  return taiMinusUtcOnUtcDayS(daysFromCivil(Number(match[1]), Number(match[2]), Number(match[3])), 'utc');
}

/**
 * TAI seconds from J2000 of a UTC calendar date-time. `second` may be in [60, 61) only on the last day
 * before a step (a leap second). Throws OutOfSpanError outside the table's span.
 */
export function taiSecondsFromUtcCalendar(
  year: number, month: number, day: number, hour: number, minute: number, second: number, field = 'epoch',
): number {
  const offset = taiMinusUtcOnUtcDayS(daysFromCivil(year, month, day), field);
  return calendarSecondsFromJ2000(year, month, day, hour, minute, second) + offset;
}

/** Is the end of this UTC day (days from 2000-01-01) followed by a positive leap second? */
export function isLeapSecondDay(utcDay: number): boolean {
  return STEP_DAYS.includes(utcDay + 1) && utcDay + 1 !== FIRST_DAY;
}

/**
 * UTC reading of a TAI instant (TAI seconds from J2000): UTC calendar seconds from 2000-01-01T12:00:00
 * ignoring leap seconds, plus `inLeapSecond` when the instant lies inside an inserted second 23:59:60
 * (then `utcCalendarS` is the seconds into that leap second added to the start of the next day, i.e.
 * the caller must print the previous day 23:59:60+). Throws OutOfSpanError outside the span.
 */
export function utcFromTaiS(taiS: number, field = 'epoch'): { utcCalendarS: number; leapSecondFractionS: number; inLeapSecond: boolean } {
  if (!(taiS >= FIRST_TAI_S) || !(taiS < END_TAI_S)) {
    throw outOfSpan(field, `TAI ${taiS} s from J2000`);
  }
  let i = STEP_TAI_S.length - 1;
  while (STEP_TAI_S[i] > taiS) i--;
  // Inside the inserted second just before step i+1: TAI in [start_{i+1} - 1, start_{i+1}).
  if (i + 1 < STEP_TAI_S.length && taiS >= STEP_TAI_S[i + 1] - 1) {
    const nextDayStart = STEP_DAYS[i + 1] * 86400 - 43200;
    return { utcCalendarS: nextDayStart, leapSecondFractionS: taiS - (STEP_TAI_S[i + 1] - 1), inLeapSecond: true };
  }
  return { utcCalendarS: taiS - STEP_OFFSETS_S[i], leapSecondFractionS: 0, inLeapSecond: false };
}
