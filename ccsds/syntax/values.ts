/**
 * Value syntax of the Orbit Data Messages: numbers (502.0-B 7.5), epochs (7.5.10) and time systems,
 * converted with the propagator's time scales. Every function names the keyword and line on failure.
 */
import {
  BUILTIN_LEAP_SECONDS, civilFromDays, daysFromCivil, formatEpoch, type LeapSecondTable, parseEpoch, type TimeScale,
} from '../../propagator/index.ts';
import { CcsdsFormatError, withLine } from '../errors.ts';

/** Time systems this module converts (the standard lists more: GPS, TCB, UT1, MET... are refused). */
export const SUPPORTED_TIME_SYSTEMS: readonly TimeScale[] = ['UTC', 'TAI', 'TT', 'TDB'];

/** Decimal or exponent notation; no NaN, Infinity, hex or thousands separators. */
const NUMBER = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
/** `YYYY-MM-DDThh:mm:ss[.d…][Z]` or `YYYY-DDDThh:mm:ss[.d…][Z]`. */
const EPOCH = /^(\d{4})-(?:(\d{2})-(\d{2})|(\d{3}))T(\d{2}:\d{2}:\d{2}(?:\.\d+)?)(Z?)$/;

/** Parses a real number written as the standard allows; throws CcsdsFormatError naming keyword and line. */
export function parseNumber(keyword: string, line: number, text: string): number {
  if (!NUMBER.test(text)) throw new CcsdsFormatError(keyword, line, `'${text}' is not a number`);
  const value = Number(text);
  if (!Number.isFinite(value)) throw new CcsdsFormatError(keyword, line, `'${text}' is out of double range`);
  return value;
}

/** Parses a time-system name; only UTC, TAI, TT and TDB are converted here. */
export function parseTimeSystem(line: number, text: string): TimeScale {
  if ((SUPPORTED_TIME_SYSTEMS as readonly string[]).includes(text)) return text as TimeScale;
  throw new CcsdsFormatError('TIME_SYSTEM', line, `time system '${text}' is not supported `
    + `(supported: ${SUPPORTED_TIME_SYSTEMS.join(', ')})`);
}

/**
 * Rewrites a CCSDS epoch (calendar or day-of-year form) as ISO calendar text `YYYY-MM-DDThh:mm:ss[.d…]`,
 * checking the day-of-year range. A trailing `Z` is allowed only when the time system is UTC.
 */
export function normaliseEpochText(keyword: string, line: number, text: string, scale: TimeScale | 'UTC'): string {
  const m = EPOCH.exec(text);
  if (!m) {
    throw new CcsdsFormatError(keyword, line, `'${text}' is not a CCSDS epoch `
      + '(YYYY-MM-DDThh:mm:ss[.d...] or YYYY-DDDThh:mm:ss[.d...])');
  }
  const [, year, month, day, dayOfYear, time, zulu] = m;
  if (zulu && scale !== 'UTC') {
    throw new CcsdsFormatError(keyword, line, `'${text}' ends in Z (UTC) but the time system is ${scale}`);
  }
  if (dayOfYear === undefined) return `${year}-${month}-${day}T${time}`;
  const y = Number(year);
  const doy = Number(dayOfYear);
  const yearLength = daysFromCivil(y + 1, 1, 1) - daysFromCivil(y, 1, 1);
  if (doy < 1 || doy > yearLength) {
    throw new CcsdsFormatError(keyword, line, `day of year ${dayOfYear} outside 001-${yearLength} in ${year}`);
  }
  const date = civilFromDays(daysFromCivil(y, 1, 1) + doy - 1);
  return `${year}-${String(date.month).padStart(2, '0')}-${String(date.day).padStart(2, '0')}T${time}`;
}

/** Parses an epoch in the message's time system to TDB seconds from J2000. Valid range: years
 * [1000, 9999]; UTC from 1972 on through `leapSeconds` (an error with the line before 1972). */
export function parseCcsdsEpoch(keyword: string, line: number, text: string, scale: TimeScale,
  leapSeconds: LeapSecondTable = BUILTIN_LEAP_SECONDS): number {
  const iso = normaliseEpochText(keyword, line, text, scale);
  return withLine(keyword, line, () => parseEpoch(`${iso} ${scale}`, undefined, keyword, leapSeconds));
}

/** Checks a UTC date-time written for information only (CREATION_DATE): calendar validity, no leap-table
 * span check (a file may be created after the table's end). Returns the text unchanged. */
export function checkCreationDate(line: number, text: string): string {
  const iso = normaliseEpochText('CREATION_DATE', line, text, 'UTC');
  // Checked as TAI so that a date past the leap-second table still passes; calendar rules are the same.
  withLine('CREATION_DATE', line, () => parseEpoch(`${iso.replace(/T23:59:60/, 'T23:59:59')} TAI`));
  return text;
}

/** Writes TDB seconds from J2000 as a CCSDS epoch `YYYY-MM-DDThh:mm:ss.ffffff` in `scale` (no suffix),
 * with `fractionDigits` in [0, 6]; UTC through `leapSeconds` (a plan's own table when writing a plan). */
export function formatCcsdsEpoch(epochTdbS: number, scale: TimeScale, fractionDigits = 6,
  leapSeconds: LeapSecondTable = BUILTIN_LEAP_SECONDS): string {
  return formatEpoch(epochTdbS, scale, fractionDigits, leapSeconds).replace(/ (UTC|TAI|TT|TDB)$/, '');
}

/** Writes a number with `decimals` digits after the point (fixed notation). */
export function formatFixed(value: number, decimals: number): string {
  const text = value.toFixed(decimals);
  return text === `-${(0).toFixed(decimals)}` ? text.slice(1) : text;
}

/** Writes a number in exponent notation with `significantDigits` digits, e.g. `1.234567890E-05`. */
export function formatExponent(value: number, significantDigits: number): string {
  const [mantissa, exponent] = value.toExponential(significantDigits - 1).split('e');
  const e = Number(exponent);
  return `${mantissa}E${e < 0 ? '-' : '+'}${String(Math.abs(e)).padStart(2, '0')}`;
}
