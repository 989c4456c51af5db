/**
 * The plan's record of its leap-second table, and back: a plan names the table it used (built-in with its
 * expiry, or file path + SHA-256 + expiry) and carries its steps, so anything that later reads the plan's
 * epochs (Monte Carlo children, CCSDS export) uses exactly the same table, with no process-wide state.
 */
import {
  buildLeapSecondTable, daysFromCivil, lastTaiMinusUtcS, type LeapSecondTable, utcDateText,
} from '../propagator/index.ts';
import type { PlanLeapSeconds } from '../contract/plan-types.ts';

/** The plan record of a table. */
export function planLeapSeconds(table: LeapSecondTable): PlanLeapSeconds {
  return {
    source: table.origin, path: table.path, sha256: table.sha256, expiresUtc: table.expiresUtc,
    updatedUtc: table.updatedUtc, taiMinusUtcAfterExpiryS: lastTaiMinusUtcS(table), description: table.description,
    steps: table.steps.map((s) => [utcDateText(s.utcDay), s.taiMinusUtcS]),
  };
}

const dayOf = (date: string): number => daysFromCivil(Number(date.slice(0, 4)), Number(date.slice(5, 7)), Number(date.slice(8, 10)));

/** The table a plan record describes (checked again: steps increasing by exactly 1 s, expiry after them). */
export function leapSecondTableOfPlan(record: PlanLeapSeconds): LeapSecondTable {
  return buildLeapSecondTable({
    steps: record.steps.map(([date, offset]) => ({ utcDay: dayOf(date), taiMinusUtcS: offset })),
    expiresUtcDay: dayOf(record.expiresUtc),
    updatedUtcDay: record.updatedUtc === null ? null : dayOf(record.updatedUtc),
    origin: record.source, description: record.description, path: record.path, sha256: record.sha256,
  }, 'plan.leapSeconds');
}

/** The part of the record the problem hash covers: which data (not where the file lay on one machine). */
export function leapSecondsIdentity(record: Pick<PlanLeapSeconds, 'source' | 'sha256' | 'expiresUtc'>): Record<string, unknown> {
  return { source: record.source, sha256: record.sha256, expiresUtc: record.expiresUtc };
}
