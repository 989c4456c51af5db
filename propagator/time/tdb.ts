/**
 * TT ↔ TDB and TT ↔ TAI, and Julian dates, on the internal epoch representation.
 *
 * Representation: one float64 of TDB seconds from J2000.0 (2000-01-01T12:00:00 TDB, JD 2451545.0 TDB);
 * TT and TAI values below are likewise seconds from 2000-01-01T12:00:00 of their own scale.
 */
import { J2000_JULIAN_DATE, SECONDS_PER_DAY } from '../constants.ts';

/** TT − TAI in seconds, exact by definition (IAU 1991 Resolution A4). */
export const TT_MINUS_TAI_S = 32.184;

const SECONDS_PER_JULIAN_CENTURY = 36525 * 86400;

/**
 * TDB − TT in seconds at a TT epoch (s from J2000 TT): the truncated Fairhead & Bretagnon (1990)
 * series as printed in USNO Circular 179 (Kaplan 2005), eq. 2.6 (coefficients typed from memory, then
 * checked against several public copies of eq. 2.6), with
 * T in Julian centuries of TT from J2000. Geocentric (no topocentric terms). Stated accuracy about
 * 10 µs over 1600–2200; |TDB − TT| < 1.7 ms always. Periodic, so valid for any finite epoch, but only
 * meaningful over a few centuries either side of 2000.
 */
export function tdbMinusTtS(ttS: number): number {
  const t = ttS / SECONDS_PER_JULIAN_CENTURY;
  return 0.001657 * Math.sin(628.3076 * t + 6.2401)
    + 0.000022 * Math.sin(575.3385 * t + 4.2970)
    + 0.000014 * Math.sin(1256.6152 * t + 6.1969)
    + 0.000005 * Math.sin(606.9777 * t + 4.0212)
    + 0.000005 * Math.sin(52.9691 * t + 0.4444)
    + 0.000002 * Math.sin(21.3299 * t + 5.5431)
    + 0.000010 * t * Math.sin(628.3076 * t + 4.2490);
}

/** TDB seconds from J2000 of a TT epoch (TT seconds from J2000). Range as {@link tdbMinusTtS}. */
export function tdbFromTt(ttS: number): number {
  return ttS + tdbMinusTtS(ttS);
}

/**
 * TT seconds from J2000 of a TDB epoch (TDB seconds from J2000): inverts {@link tdbFromTt} by fixed-point
 * iteration (the series' slope is < 4e-10, so two passes reach float64 round-off).
 */
export function ttFromTdb(tdbS: number): number {
  let tt = tdbS - tdbMinusTtS(tdbS);
  tt = tdbS - tdbMinusTtS(tt);
  return tt;
}

/** TDB seconds from J2000 of a TAI epoch (TAI seconds from 2000-01-01T12:00:00 TAI). */
export function tdbFromTai(taiS: number): number {
  return tdbFromTt(taiS + TT_MINUS_TAI_S);
}

/** TAI seconds from 2000-01-01T12:00:00 TAI of a TDB epoch (TDB seconds from J2000). */
export function taiFromTdb(tdbS: number): number {
  return ttFromTdb(tdbS) - TT_MINUS_TAI_S;
}

/** Julian date in TDB of a TDB epoch (s from J2000). One float64 JD resolves ~40 µs near 2030; keep
 * seconds internally and use this only for display or for libraries that want a JD. */
export function tdbSecondsToJulianDateTdb(tdbS: number): number {
  return J2000_JULIAN_DATE + tdbS / SECONDS_PER_DAY;
}

/** TDB seconds from J2000 of a Julian date in TDB. */
export function julianDateTdbToSeconds(julianDateTdb: number): number {
  return (julianDateTdb - J2000_JULIAN_DATE) * SECONDS_PER_DAY;
}
