/**
 * A leap-second table as data: the steps of TAI − UTC (whole seconds, 1972 onward) and the date up to which
 * its publisher vouches for it. Tables are immutable values passed to every UTC conversion explicitly — there
 * is no process-wide table. The built-in one is the default; a `leap-seconds.list` file gives another
 * (see leap-seconds-list.ts).
 *
 * Past the expiry a table is still used: TAI − UTC keeps its last value (no leap second is assumed), and
 * callers that show or read UTC there must say so (the planner's caveat). Before the first step (1972-01-01)
 * UTC had fractional offsets and a drifting rate; that is refused (OutOfSpanError).
 */
import { InvalidInputError, OutOfSpanError } from '../../contract/errors.ts';
import { civilFromDays, daysFromCivil } from './calendar.ts';

/** One step: from 00:00:00 UTC of `utcDay` (days from 2000-01-01) on, TAI − UTC = `taiMinusUtcS`. */
export interface LeapSecondStep {
  readonly utcDay: number;
  readonly taiMinusUtcS: number;
}

/** Where a table came from, for reports and plans. */
export type LeapSecondOrigin = 'built-in' | 'file';

export interface LeapSecondTable {
  /** Steps in increasing date, each one second more than the one before. */
  readonly steps: readonly LeapSecondStep[];
  /** First UTC day (from 2000-01-01) the publisher no longer vouches for; the `#@` line of a file. */
  readonly expiresUtcDay: number;
  /** The same as a date, `YYYY-MM-DD` (UTC). */
  readonly expiresUtc: string;
  /** Date of the publisher's last update (`#$` line), `YYYY-MM-DD` UTC, or null when not stated. */
  readonly updatedUtc: string | null;
  readonly origin: LeapSecondOrigin;
  /** Plain description of the source, e.g. "built-in (IERS Bulletin C 70, from memory)". */
  readonly description: string;
  /** The file it was read from, as given (null for the built-in table). */
  readonly path: string | null;
  /** SHA-256 (hex) of the file's bytes, when the reader computed it (null for the built-in table). */
  readonly sha256: string | null;
}

/** What {@link buildLeapSecondTable} needs; `line` (of a file) only sharpens error messages. */
export interface LeapSecondTableInput {
  steps: readonly (LeapSecondStep & { line?: number })[];
  expiresUtcDay: number;
  updatedUtcDay: number | null;
  origin: LeapSecondOrigin;
  description: string;
  path: string | null;
  sha256: string | null;
}

/** `YYYY-MM-DD` of a UTC day counted from 2000-01-01. */
export function utcDateText(utcDay: number): string {
  const { year, month, day } = civilFromDays(utcDay);
  return `${String(year).padStart(4, '0')}-${String(month).padStart(2, '0')}-${String(day).padStart(2, '0')}`;
}

/**
 * The built-in table. Source: IERS Bulletin C (the table of TAI − UTC steps repeated in every issue) and the
 * IERS `leap-seconds.list` that followed Bulletin C 70 (July 2025: no leap second at the end of December
 * 2025), typed from memory; its `#@` expiry is 28 June 2026. test/reference/leap-seconds.test.ts checks it
 * step by step against a stored copy of that list (public domain, as shipped in tzdata 2025b).
 * [year, month, TAI − UTC in s from 00:00 UTC on the 1st of that month].
 */
const BUILTIN_STEPS: ReadonlyArray<readonly [number, number, number]> = [
  [1972, 1, 10], [1972, 7, 11], [1973, 1, 12], [1974, 1, 13], [1975, 1, 14], [1976, 1, 15],
  [1977, 1, 16], [1978, 1, 17], [1979, 1, 18], [1980, 1, 19], [1981, 7, 20], [1982, 7, 21],
  [1983, 7, 22], [1985, 7, 23], [1988, 1, 24], [1990, 1, 25], [1991, 1, 26], [1992, 7, 27],
  [1993, 7, 28], [1994, 7, 29], [1996, 1, 30], [1997, 7, 31], [1999, 1, 32], [2006, 1, 33],
  [2009, 1, 34], [2012, 7, 35], [2015, 7, 36], [2017, 1, 37],
];

const where = (step: { line?: number }, index: number): string => (step.line === undefined ? `step ${index}` : `line ${step.line}`);

/**
 * Checks and freezes a table: at least one step, dates increasing, TAI − UTC growing by exactly 1 s at each
 * step (only positive leap seconds have ever been inserted; a negative one would be refused here), and an
 * expiry after the last step. Throws InvalidInputError (field `source`, code LEAP_SECONDS_FORMAT) naming
 * the line (or step index) at fault.
 */
export function buildLeapSecondTable(input: LeapSecondTableInput, source = 'leapSeconds'): LeapSecondTable {
  const fail = (message: string): InvalidInputError => new InvalidInputError(source, message, 'LEAP_SECONDS_FORMAT');
  const steps = input.steps;
  if (steps.length === 0) throw fail('no leap-second lines (<NTP seconds> <TAI − UTC>) found');
  steps.forEach((step, i) => {
    if (!Number.isInteger(step.utcDay) || !Number.isInteger(step.taiMinusUtcS)) {
      throw fail(`${where(step, i)}: the date and TAI − UTC must be whole days and whole seconds`);
    }
    if (i === 0) return;
    const before = steps[i - 1];
    if (step.utcDay <= before.utcDay) {
      throw fail(`${where(step, i)}: epoch ${utcDateText(step.utcDay)} does not come after ${utcDateText(before.utcDay)} of ${where(before, i - 1)}`);
    }
    if (step.taiMinusUtcS !== before.taiMinusUtcS + 1) {
      throw fail(`${where(step, i)}: TAI − UTC ${step.taiMinusUtcS} s at ${utcDateText(step.utcDay)} is not exactly 1 s more `
        + `than ${before.taiMinusUtcS} s of ${where(before, i - 1)}`);
    }
  });
  const last = steps[steps.length - 1];
  if (!Number.isInteger(input.expiresUtcDay) || input.expiresUtcDay <= last.utcDay) {
    throw fail(`expiry ${utcDateText(input.expiresUtcDay)} is not after the last leap second (${utcDateText(last.utcDay)}, ${where(last, steps.length - 1)})`);
  }
  return Object.freeze({
    steps: Object.freeze(steps.map((s) => Object.freeze({ utcDay: s.utcDay, taiMinusUtcS: s.taiMinusUtcS }))),
    expiresUtcDay: input.expiresUtcDay,
    expiresUtc: utcDateText(input.expiresUtcDay),
    updatedUtc: input.updatedUtcDay === null ? null : utcDateText(input.updatedUtcDay),
    origin: input.origin,
    description: input.description,
    path: input.path,
    sha256: input.sha256,
  });
}

/** The built-in table (expiry 2026-06-28, from memory; see the source note above). Frozen. */
export const BUILTIN_LEAP_SECONDS: LeapSecondTable = buildLeapSecondTable({
  steps: BUILTIN_STEPS.map(([y, m, s]) => ({ utcDay: daysFromCivil(y, m, 1), taiMinusUtcS: s })),
  expiresUtcDay: daysFromCivil(2026, 6, 28),
  updatedUtcDay: daysFromCivil(2025, 7, 7),
  origin: 'built-in',
  description: 'built-in (IERS Bulletin C 70 and the leap-seconds.list of July 2025, from memory)',
  path: null,
  sha256: null,
}, 'built-in leap-second table');

function beforeFirstStep(table: LeapSecondTable, field: string, what: string): OutOfSpanError {
  return new OutOfSpanError(field, `${what} is before ${utcDateText(table.steps[0].utcDay)} UTC, where the `
    + 'leap-second table starts (UTC before 1972 had no whole-second offset from TAI); give the epoch in TAI, TT or TDB');
}

/**
 * TAI − UTC in seconds on a UTC day (days from 2000-01-01). A leap second 23:59:60 belongs to the day it
 * ends, so it takes that day's offset. Past the table's expiry the last offset is returned (no refusal; see
 * {@link isPastExpiry}). Throws OutOfSpanError before the first step.
 */
export function taiMinusUtcOnUtcDayS(table: LeapSecondTable, utcDay: number, field = 'epoch'): number {
  const steps = table.steps;
  if (utcDay < steps[0].utcDay) throw beforeFirstStep(table, field, `UTC date ${utcDateText(utcDay)}`);
  let i = steps.length - 1;
  while (steps[i].utcDay > utcDay) i--;
  return steps[i].taiMinusUtcS;
}

/** Does the end of this UTC day (days from 2000-01-01) hold a positive leap second, per the table? */
export function isLeapSecondDay(table: LeapSecondTable, utcDay: number): boolean {
  return table.steps.some((s, i) => i > 0 && s.utcDay === utcDay + 1);
}

/** Is this UTC day (days from 2000-01-01) on or after the table's expiry? */
export function isPastExpiry(table: LeapSecondTable, utcDay: number): boolean {
  return utcDay >= table.expiresUtcDay;
}

/** TAI seconds from J2000 at which a step starts (calendar seconds of its 00:00 UTC + its offset). */
export function stepStartTaiS(step: LeapSecondStep): number {
  return step.utcDay * 86400 - 43200 + step.taiMinusUtcS;
}

/**
 * UTC reading of a TAI instant (TAI seconds from J2000): UTC calendar seconds from 2000-01-01T12:00:00
 * ignoring leap seconds, plus `inLeapSecond` when the instant lies inside an inserted second 23:59:60
 * (then `utcCalendarS` is the start of the next day and `leapSecondFractionS` the seconds into the leap
 * second). Past the expiry the last offset applies. Throws OutOfSpanError before the table's first step.
 */
export function utcFromTaiS(table: LeapSecondTable, taiS: number, field = 'epoch'):
{ utcCalendarS: number; leapSecondFractionS: number; inLeapSecond: boolean } {
  const steps = table.steps;
  if (!(taiS >= stepStartTaiS(steps[0]))) throw beforeFirstStep(table, field, `TAI ${taiS} s from J2000`);
  let i = steps.length - 1;
  while (stepStartTaiS(steps[i]) > taiS) i--;
  // Inside the inserted second just before step i+1: TAI in [start_{i+1} - 1, start_{i+1}).
  if (i + 1 < steps.length && taiS >= stepStartTaiS(steps[i + 1]) - 1) {
    const start = stepStartTaiS(steps[i + 1]);
    return { utcCalendarS: steps[i + 1].utcDay * 86400 - 43200, leapSecondFractionS: taiS - (start - 1), inLeapSecond: true };
  }
  return { utcCalendarS: taiS - steps[i].taiMinusUtcS, leapSecondFractionS: 0, inLeapSecond: false };
}

/** UTC day (from 2000-01-01) of a TAI instant (TAI s from J2000); a leap second counts to the day it ends. */
export function utcDayOfTaiS(table: LeapSecondTable, taiS: number, field = 'epoch'): number {
  const u = utcFromTaiS(table, taiS, field);
  return Math.floor((u.utcCalendarS + 43200) / 86400) - (u.inLeapSecond ? 1 : 0);
}

/** TAI − UTC (s) that applies past the table's expiry: its last step's offset. */
export function lastTaiMinusUtcS(table: LeapSecondTable): number {
  return table.steps[table.steps.length - 1].taiMinusUtcS;
}
