/** The part of a plan's leap-second record the problem hash covers. */
import type { PlanLeapSeconds } from '../contract/plan-types.ts';

/** Which data (source, file SHA-256, expiry) — not where the file lay on one machine. */
export function leapSecondsIdentity(record: Pick<PlanLeapSeconds, 'source' | 'sha256' | 'expiresUtc'>): Record<string, unknown> {
  return { source: record.source, sha256: record.sha256, expiresUtc: record.expiresUtc };
}
