/**
 * Plans and the leap-second table: a UTC problem dated past the table's expiry plans with a caveat and UTC
 * burn epochs; a leap-seconds.list with an extra, INVENTED leap second (test/fixtures/leap-seconds, see its
 * README) moves UTC-written epochs after it by exactly 1 s, and the plan names the file and its SHA-256.
 */
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { beforeAll, describe, expect, it } from 'vitest';
import { leapSecondsFromFileBytes, parseProblem, planLeapSeconds, planManeuvers, problemHash } from '../../planner/index.ts';
import type { ManeuverPlan } from '../../planner/index.ts';
import { BUILTIN_LEAP_SECONDS, formatEpoch, parseEpoch } from '../../propagator/index.ts';
import { twoBodyProblemInUtc as utcProblem } from './two-body-fixture.ts';

const INVENTED_PATH = 'test/fixtures/leap-seconds/invented-2027.list';
const INVENTED_BYTES = readFileSync(INVENTED_PATH);
const INVENTED = leapSecondsFromFileBytes(INVENTED_BYTES, INVENTED_PATH);

describe('plans and the leap-second table', () => {
  describe('when a UTC problem is dated after the built-in table\'s expiry (2026-06-28)', () => {
    let plan: ManeuverPlan;
    beforeAll(async () => {
      plan = await planManeuvers(parseProblem(utcProblem('2027-08-11T00:00:00Z')));
    });
    it('should plan, not refuse, and print its UTC burn epochs', () => {
      expect(plan.status).toBe('converged');
      expect(plan.burns[0].epoch.utc).toBe('2027-08-11T00:10:00.000 UTC');
      expect(plan.createdFrom.initialEpoch.utc).toBe('2027-08-11T00:00:00.000 UTC');
    });
    it('should carry the caveat naming the expiry, the assumed offset and VEER_LEAP_SECONDS', () => {
      const c = plan.caveats.find((x) => x.code === 'UTC_LEAP_SECONDS_ASSUMED');
      expect(c?.severity).toBe('warning');
      expect(c?.text).toContain('expiry 2026-06-28');
      expect(c?.text).toContain('TAI − UTC = 37 s is assumed');
      expect(c?.text).toContain('shift every UTC time from its date on by 1 s');
      expect(c?.text).toContain('VEER_LEAP_SECONDS');
    });
    it('should record the built-in source and its expiry', () => {
      expect(plan.leapSeconds).toMatchObject({ source: 'built-in', path: null, sha256: null, expiresUtc: '2026-06-28', taiMinusUtcAfterExpiryS: 37 });
    });
  });

  describe('when the problem lies inside the table', () => {
    it('should carry no leap-second caveat', async () => {
      const plan = await planManeuvers(parseProblem(utcProblem('2026-01-01T00:00:00Z')));
      expect(plan.caveats.map((c) => c.code)).not.toContain('UTC_LEAP_SECONDS_ASSUMED');
    });
  });

  describe('when a leap-seconds.list with an INVENTED leap second at the end of 2026 is given', () => {
    it('should move UTC epochs after it by exactly 1 s in TDB and leave earlier ones', () => {
      const after = '2027-08-11T00:00:00Z';
      expect(parseEpoch(after, undefined, 'e', INVENTED) - parseEpoch(after, undefined, 'e', BUILTIN_LEAP_SECONDS)).toBeCloseTo(1, 9);
      const before = '2026-12-31T23:59:59Z';
      expect(parseEpoch(before, undefined, 'e', INVENTED)).toBe(parseEpoch(before, undefined, 'e', BUILTIN_LEAP_SECONDS));
      expect(formatEpoch(parseEpoch('2026-12-31T23:59:60.5Z', undefined, 'e', INVENTED), 'UTC', 1, INVENTED)).toBe('2026-12-31T23:59:60.5 UTC');
    });
    it('should plan with it, show the file\'s SHA-256, and hash the problem differently', async () => {
      const problem = parseProblem(utcProblem('2027-08-11T00:00:00Z'), INVENTED);
      const plan = await planManeuvers(problem); // planned with the table it was checked with
      const builtin = await planManeuvers(parseProblem(utcProblem('2027-08-11T00:00:00Z')));
      expect(plan.leapSeconds).toMatchObject({
        source: 'file', path: INVENTED_PATH, sha256: createHash('sha256').update(INVENTED_BYTES).digest('hex'), expiresUtc: '2027-12-28',
      });
      expect(plan.createdFrom.initialEpoch.tdbS - builtin.createdFrom.initialEpoch.tdbS).toBeCloseTo(1, 9);
      expect(plan.burns[0].epoch.utc).toBe('2027-08-11T00:10:00.000 UTC');
      expect(plan.caveats.map((c) => c.code)).not.toContain('UTC_LEAP_SECONDS_ASSUMED');
      expect(plan.problemHash).toBe(problemHash(problem, planLeapSeconds(INVENTED)));
      expect(plan.problemHash).not.toBe(builtin.problemHash);
    });
  });
});
