/**
 * A leap-second table as plain JSON (the contract's PlanLeapSeconds, kept in plans and jobs) and back, so a
 * plan can be re-read — Monte Carlo children, CCSDS export — with exactly the table it was made with.
 */
import type { PlanLeapSeconds } from '../../contract/plan-types.ts';
import { daysFromCivil } from './calendar.ts';
import {
  BUILTIN_LEAP_SECONDS, buildLeapSecondTable, lastTaiMinusUtcS, type LeapSecondTable, utcDateText,
} from './leap-second-table.ts';

/** The JSON record of a table (steps as [`YYYY-MM-DD`, TAI − UTC s]). */
export function planLeapSeconds(table: LeapSecondTable): PlanLeapSeconds {
  return {
    source: table.origin, path: table.path, sha256: table.sha256, expiresUtc: table.expiresUtc,
    updatedUtc: table.updatedUtc, taiMinusUtcAfterExpiryS: lastTaiMinusUtcS(table), description: table.description,
    steps: table.steps.map((s) => [utcDateText(s.utcDay), s.taiMinusUtcS]),
  };
}

const dayOf = (date: string): number => daysFromCivil(Number(date.slice(0, 4)), Number(date.slice(5, 7)), Number(date.slice(8, 10)));

/** The table a record describes, checked again (steps increasing by exactly 1 s, expiry after them); the
 * built-in table for a plan made before the table was recorded (`undefined`). */
export function leapSecondTableOfPlan(record: PlanLeapSeconds | undefined): LeapSecondTable {
  if (record === undefined) return BUILTIN_LEAP_SECONDS;
  return buildLeapSecondTable({
    steps: record.steps.map(([date, offset]) => ({ utcDay: dayOf(date), taiMinusUtcS: offset })),
    expiresUtcDay: dayOf(record.expiresUtc),
    updatedUtcDay: record.updatedUtc === null ? null : dayOf(record.updatedUtc),
    origin: record.source, description: record.description, path: record.path, sha256: record.sha256,
  }, 'plan.leapSeconds');
}
