/** Time scales (UTC, TAI, TT, TDB), leap seconds, epoch text and Julian dates. */
export { parseEpoch, formatEpoch, utcTextOrNull, TIME_SCALES } from './epoch-text.ts';
export type { TimeScale } from './epoch-text.ts';
export {
  tdbMinusTtS, tdbFromTt, ttFromTdb, tdbFromTai, taiFromTdb, TT_MINUS_TAI_S,
  tdbSecondsToJulianDateTdb, julianDateTdbToSeconds,
} from './tdb.ts';
export { taiMinusUtcS, isUtcPastLeapSecondExpiry } from './leap-seconds.ts';
export { BUILTIN_LEAP_SECONDS, buildLeapSecondTable, lastTaiMinusUtcS, utcDateText } from './leap-second-table.ts';
export type { LeapSecondTable, LeapSecondStep, LeapSecondOrigin, LeapSecondTableInput } from './leap-second-table.ts';
export { parseLeapSecondsList } from './leap-seconds-list.ts';
export { planLeapSeconds, leapSecondTableOfPlan } from './leap-second-record.ts';
export { daysFromCivil, civilFromDays } from './calendar.ts';
