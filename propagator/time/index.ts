/** Time scales (UTC, TAI, TT, TDB), leap seconds, epoch text and Julian dates. */
export { parseEpoch, formatEpoch, TIME_SCALES } from './epoch-text.ts';
export type { TimeScale } from './epoch-text.ts';
export {
  tdbMinusTtS, tdbFromTt, ttFromTdb, tdbFromTai, taiFromTdb, TT_MINUS_TAI_S,
  tdbSecondsToJulianDateTdb, julianDateTdbToSeconds,
} from './tdb.ts';
export {
  taiMinusUtcS, LEAP_TABLE_VALID_FROM_UTC, LEAP_TABLE_VALID_UNTIL_UTC, LEAP_TABLE_SOURCE,
} from './leap-seconds.ts';
export { daysFromCivil, civilFromDays } from './calendar.ts';
