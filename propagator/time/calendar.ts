/**
 * Proleptic Gregorian calendar arithmetic on whole days, independent of any time scale.
 * Days are counted from 2000-01-01 (day 0); the J2000.0 epoch is day 0 at 12:00.
 */

/** Days from 2000-01-01 to the given Gregorian date (negative before). Valid for any year in
 * [-10000, 10000]; uses the days-from-civil method (H. Hinnant, "chrono-Compatible Low-Level Date
 * Algorithms"), exact in integer arithmetic. */
export function daysFromCivil(year: number, month: number, day: number): number {
  const y = month <= 2 ? year - 1 : year;
  const era = Math.floor(y / 400);
  const yoe = y - era * 400;
  const mp = (month + 9) % 12;
  const doy = Math.floor((153 * mp + 2) / 5) + day - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 730425; // 730425 = days from 0000-03-01 to 2000-01-01
}

/** Inverse of {@link daysFromCivil}: the Gregorian date of a day count from 2000-01-01. */
export function civilFromDays(days: number): { year: number; month: number; day: number } {
  const z = days + 730425;
  const era = Math.floor(z / 146097);
  const doe = z - era * 146097;
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36524) - Math.floor(doe / 146096)) / 365);
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100));
  const mp = Math.floor((5 * doy + 2) / 153);
  const day = doy - Math.floor((153 * mp + 2) / 5) + 1;
  const month = mp < 10 ? mp + 3 : mp - 9;
  return { year: era * 400 + yoe + (month <= 2 ? 1 : 0), month, day };
}

/** Days in a month of the proleptic Gregorian calendar. */
export function daysInMonth(year: number, month: number): number {
  return daysFromCivil(month === 12 ? year + 1 : year, month === 12 ? 1 : month + 1, 1)
    - daysFromCivil(year, month, 1);
}

/** Seconds of a calendar date-time in any uniform scale counted from that scale's 2000-01-01T12:00:00,
 * ignoring leap seconds (the caller adds them for UTC). */
export function calendarSecondsFromJ2000(
  year: number, month: number, day: number, hour: number, minute: number, second: number,
): number {
  return (daysFromCivil(year, month, day) * 86400 - 43200) + hour * 3600 + minute * 60 + second;
}
