/**
 * The SHA-256 problem hash over the contract's canonical JSON (contract/canonical-json.ts). Hashing the
 * validated problem (defaults filled in) makes a problem written with and without its defaults hash alike.
 */
import { hash } from 'node:crypto';
import { canonicalJson } from '../contract/canonical-json.ts';
import type { PlanEphemerisSource, PlanLeapSeconds } from '../contract/plan-types.ts';
import { ephemerisIdentity } from './ephemeris-files.ts';
import type { PlanningProblem } from '../contract/problem-schema.ts';

/** The part of a plan's leap-second record the problem hash covers: which data (source, file SHA-256,
 * expiry), not where the file lay on one machine. */
function leapSecondsIdentity(record: Pick<PlanLeapSeconds, 'source' | 'sha256' | 'expiresUtc'>): Record<string, unknown> {
  return { source: record.source, sha256: record.sha256, expiresUtc: record.expiresUtc };
}

/** SHA-256 (lower-case hex) of the UTF-8 bytes of `value`'s canonical JSON (contract/canonical-json.ts): the
 * planner's one content hash. The archive keeps its own (archive/chain.ts), since neither room may import the
 * other and the contract room has no synchronous digest (no Node API there). */
export function canonicalSha256(value: unknown): string {
  return hash('sha256', canonicalJson(value), 'hex'); // one-shot: about half the CPU of createHash() per call
}

/**
 * SHA-256 (hex, 64 characters) of the canonical JSON of a validated problem together with the identity of
 * the leap-second table its UTC epochs are read with (source, file SHA-256, expiry — not the path): the
 * same problem re-planned with a newer table hashes differently, because its UTC epochs may mean other
 * instants. `leapSeconds` is a plan's record (planLeapSeconds of the table the door loaded). `ephemeris`: the
 * plan's ephemeris sources; any OEM file's body, SHA-256 and span are covered (a problem planned on the
 * built-in series alone hashes as it did before files could be given).
 */
export function problemHash(problem: PlanningProblem, leapSeconds: Pick<PlanLeapSeconds, 'source' | 'sha256' | 'expiresUtc'>,
  ephemeris?: readonly PlanEphemerisSource[]): string {
  const files = ephemerisIdentity(ephemeris);
  const hashed = files === null ? { leapSeconds: leapSecondsIdentity(leapSeconds), problem }
    : { ephemerisFiles: files, leapSeconds: leapSecondsIdentity(leapSeconds), problem };
  return canonicalSha256(hashed);
}

/** Stable key naming the spacecraft and its target set (not the burns or the state): a newer plan with the
 * same key supersedes an older proposed one. */
export function targetSetKey(problem: PlanningProblem): string {
  const digest = canonicalSha256(problem.targets).slice(0, 16);
  return `${problem.spacecraft.name}/${digest}`;
}
