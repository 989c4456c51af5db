/**
 * ISO-8601 epoch text ↔ TDB seconds from J2000, with the time scale named.
 *
 * Accepted forms: `YYYY-MM-DDThh:mm:ss[.fff…]` followed by `Z` (UTC) or a space and one of
 * `UTC|TAI|TT|TDB`; with neither, `defaultScale` applies (an error if none is given). `T` may be a space.
 * Leap seconds (`23:59:60.x` UTC) are accepted on days the table says end in one. UTC goes through the
 * leap-second table the caller passes (the built-in one by default); past its expiry the last TAI − UTC is
 * assumed, and the caller must say so where the epoch is shown (see isUtcPastLeapSecondExpiry).
 */
import { InvalidInputError } from '../../contract/errors.ts';
import { calendarSecondsFromJ2000, civilFromDays, daysFromCivil, daysInMonth } from './calendar.ts';
import {
  BUILTIN_LEAP_SECONDS, isLeapSecondDay, isPastExpiry, type LeapSecondTable, taiMinusUtcOnUtcDayS, utcDateText, utcFromTaiS,
} from './leap-second-table.ts';
import { taiSecondsFromUtcCalendar } from './leap-seconds.ts';
import { tdbFromTai, tdbFromTt, ttFromTdb, TT_MINUS_TAI_S } from './tdb.ts';

/** Time scales epochs can be written in. */
export type TimeScale = 'UTC' | 'TAI' | 'TT' | 'TDB';
export const TIME_SCALES: readonly TimeScale[] = ['UTC', 'TAI', 'TT', 'TDB'];

const EPOCH_PATTERN =
  /^(-?\d{4})-(\d{2})-(\d{2})[T ](\d{2}):(\d{2}):(\d{2})(\.\d+)?(?:(Z)|\s+(UTC|TAI|TT|TDB))?$/;

/**
 * Parses an epoch written in ISO-8601 with a named scale and returns TDB seconds from J2000.
 * Example: `2026-03-14T05:06:07.123Z`, `2026-03-14T05:06:07.123 TDB`. Valid years [1000, 9999] for TAI,
 * TT and TDB; UTC from the table's first step (1972-01-01) on, OutOfSpanError before. Throws
 * InvalidInputError naming `field` for malformed text or impossible dates.
 */
export function parseEpoch(
  text: string, defaultScale?: TimeScale, field = 'epoch', leapSeconds: LeapSecondTable = BUILTIN_LEAP_SECONDS,
): number {
  if (typeof text !== 'string') throw new InvalidInputError(field, 'epoch must be a string');
  const m = EPOCH_PATTERN.exec(text.trim());
  if (!m) {
    throw new InvalidInputError(field, `'${text}' is not an ISO-8601 epoch like `
      + `'2026-03-14T05:06:07.123Z' or '2026-03-14T05:06:07.123 TDB' (scale UTC, TAI, TT or TDB)`);
  }
  const scale: TimeScale | undefined = m[8] ? 'UTC' : (m[9] as TimeScale | undefined) ?? defaultScale;
  if (!scale) throw new InvalidInputError(field, `'${text}' names no time scale: add 'Z' or ' UTC|TAI|TT|TDB'`);
  if (!TIME_SCALES.includes(scale)) throw new InvalidInputError(field, `unknown time scale '${scale}'`);
  const [year, month, day, hour, minute, whole] = [m[1], m[2], m[3], m[4], m[5], m[6]].map(Number);
  const fraction = m[7] ? Number(`0${m[7]}`) : 0;
  if (year < 1000 || year > 9999) throw new InvalidInputError(field, `year ${year} outside [1000, 9999]`);
  if (month < 1 || month > 12) throw new InvalidInputError(field, `month ${m[2]} outside 01-12`);
  if (day < 1 || day > daysInMonth(year, month)) {
    throw new InvalidInputError(field, `day ${m[3]} does not exist in ${m[1]}-${m[2]}`);
  }
  if (hour > 23) throw new InvalidInputError(field, `hour ${m[4]} outside 00-23`);
  if (minute > 59) throw new InvalidInputError(field, `minute ${m[5]} outside 00-59`);
  if (whole > 60 || (whole === 60 && !(scale === 'UTC' && hour === 23 && minute === 59))) {
    throw new InvalidInputError(field, `second ${m[6]} outside 00-59 (60 only for a UTC leap second at 23:59)`);
  }
  const utcDay = daysFromCivil(year, month, day);
  if (whole === 60 && !isLeapSecondDay(leapSeconds, utcDay)) {
    taiMinusUtcOnUtcDayS(leapSeconds, utcDay, field); // before 1972: the span, not the text, is wrong
    const past = isPastExpiry(leapSeconds, utcDay + 1)
      ? ` (the leap-second table expires ${leapSeconds.expiresUtc}: give a newer leap-seconds.list through VEER_LEAP_SECONDS)` : '';
    throw new InvalidInputError(field, `no leap second is known at the end of ${utcDateText(utcDay)} UTC${past}`);
  }
  // Whole seconds first, fraction last: keeps the float64 sum within one rounding of the text.
  switch (scale) {
    case 'UTC':
      return tdbFromTai(taiSecondsFromUtcCalendar(leapSeconds, year, month, day, hour, minute, whole, field)) + fraction;
    case 'TAI':
      return tdbFromTai(calendarSecondsFromJ2000(year, month, day, hour, minute, whole)) + fraction;
    case 'TT':
      return tdbFromTt(calendarSecondsFromJ2000(year, month, day, hour, minute, whole)) + fraction;
    case 'TDB':
      return calendarSecondsFromJ2000(year, month, day, hour, minute, whole) + fraction;
  }
}

function pad(n: number, width: number): string {
  return String(n).padStart(width, '0');
}

/** Writes calendar seconds (from 12:00 on 2000-01-01 of some scale) rounded to `digits`. `leapUnits`
 * marks a UTC leap second: then `units` counts fraction units into 23:59:60 of the day before `dayStart`. */
function writeCalendar(units: bigint, digits: number, scale: TimeScale): string {
  const perSecond = 10n ** BigInt(digits);
  const perDay = 86400n * perSecond;
  let days = units / perDay;
  let rest = units % perDay;
  if (rest < 0n) { rest += perDay; days -= 1n; }
  const { year, month, day } = civilFromDays(Number(days));
  const secondsOfDay = Number(rest / perSecond);
  const frac = rest % perSecond;
  const fracText = digits > 0 ? `.${frac.toString().padStart(digits, '0')}` : '';
  return `${pad(year, 4)}-${pad(month, 2)}-${pad(day, 2)}T${pad(Math.floor(secondsOfDay / 3600), 2)}:`
    + `${pad(Math.floor(secondsOfDay / 60) % 60, 2)}:${pad(secondsOfDay % 60, 2)}${fracText} ${scale}`;
}

/** Rounds seconds from midnight 2000-01-01 (i.e. calendar seconds + 43200) to integer fraction units. */
function toUnits(secondsFromMidnight: number, digits: number): bigint {
  const whole = Math.floor(secondsFromMidnight);
  const perSecond = 10 ** digits;
  return BigInt(whole) * BigInt(perSecond) + BigInt(Math.round((secondsFromMidnight - whole) * perSecond));
}

/**
 * Formats a TDB epoch (TDB seconds from J2000) as `YYYY-MM-DDThh:mm:ss.fff SCALE` in the given scale,
 * rounded to `fractionDigits` in [0, 6] (float64 resolves ~1e-7 s near 2030). UTC goes through `leapSeconds`
 * (built-in by default), shows leap seconds as 23:59:60, assumes the last TAI − UTC past the table's expiry
 * and throws OutOfSpanError before its first step (1972).
 */
export function formatEpoch(
  tdbS: number, scale: TimeScale, fractionDigits = 3, leapSeconds: LeapSecondTable = BUILTIN_LEAP_SECONDS,
): string {
  if (!Number.isFinite(tdbS)) throw new InvalidInputError('tdbS', `epoch ${tdbS} is not finite`);
  if (!Number.isInteger(fractionDigits) || fractionDigits < 0 || fractionDigits > 6) {
    throw new InvalidInputError('fractionDigits', `${fractionDigits} is not an integer in [0, 6]`);
  }
  if (!TIME_SCALES.includes(scale)) throw new InvalidInputError('scale', `unknown time scale '${scale}'`);
  if (scale === 'TDB') return writeCalendar(toUnits(tdbS + 43200, fractionDigits), fractionDigits, scale);
  const tt = ttFromTdb(tdbS);
  if (scale === 'TT') return writeCalendar(toUnits(tt + 43200, fractionDigits), fractionDigits, scale);
  const tai = tt - TT_MINUS_TAI_S;
  if (scale === 'TAI') return writeCalendar(toUnits(tai + 43200, fractionDigits), fractionDigits, scale);
  const utc = utcFromTaiS(leapSeconds, tai, 'tdbS');
  const perSecond = 10n ** BigInt(fractionDigits);
  if (utc.inLeapSecond) {
    const into = BigInt(Math.round(utc.leapSecondFractionS * 10 ** fractionDigits));
    const nextDayUnits = toUnits(utc.utcCalendarS + 43200, 0) * perSecond;
    // Rounded up to the end of the leap second: that is 00:00:00 of the next day.
    if (into >= perSecond) return writeCalendar(nextDayUnits, fractionDigits, scale);
    return writeCalendar(nextDayUnits - perSecond + into, fractionDigits, scale).replace(/T23:59:59/, 'T23:59:60');
  }
  const units = toUnits(utc.utcCalendarS + 43200, fractionDigits);
  // Rounded up onto midnight that follows a leap second: the honest reading is 23:59:60.000.
  const perDay = 86400n * perSecond;
  if (units % perDay === 0n && utc.utcCalendarS + 43200 < Number(units / perSecond)
    && isLeapSecondDay(leapSeconds, Number(units / perDay) - 1)) {
    return writeCalendar(units - perSecond, fractionDigits, scale).replace(/T23:59:59/, 'T23:59:60');
  }
  return writeCalendar(units, fractionDigits, scale);
}

/**
 * UTC text of an epoch (TDB s from J2000) through `leapSeconds`, or null before the table's first step
 * (1972), where UTC has no whole-second offset from TAI. Past the table's expiry the last TAI − UTC is
 * assumed (check isUtcPastLeapSecondExpiry to say so).
 */
export function utcTextOrNull(tdbS: number, leapSeconds: LeapSecondTable, fractionDigits = 3): string | null {
  try {
    return formatEpoch(tdbS, 'UTC', fractionDigits, leapSeconds);
  } catch (error) {
    if (error instanceof Error && error.name === 'OutOfSpanError') return null;
    throw error;
  }
}
