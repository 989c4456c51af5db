/**
 * CCSDS exports of plans with UTC epochs: UTC beside TDB in the comments, the plan's own leap-second table
 * for UTC time systems, and the UTC_LEAP_SECONDS_ASSUMED caveat in the header past the built-in table's
 * expiry (2026-06-28). The INVENTED list is described in test/fixtures/leap-seconds/README.md.
 */
import { readFileSync } from 'node:fs';
import { beforeAll, describe, expect, it } from 'vitest';
import { exportPlanAsCcsds, readOem } from '../../ccsds/index.ts';
import { leapSecondsFromFileBytes, parseProblem, planManeuvers } from '../../planner/index.ts';
import type { CheckedProblem, ManeuverPlan } from '../../planner/index.ts';
import { twoBodyProblemInUtc } from '../planner/two-body-fixture.ts';

const INVENTED_PATH = 'test/fixtures/leap-seconds/invented-2027.list';
const INVENTED = leapSecondsFromFileBytes(readFileSync(INVENTED_PATH), INVENTED_PATH);
const CREATED = '2026-12-03T10:00:00';
/** The header comments as one text (the writer wraps long comments over several COMMENT lines). */
const commentText = (text: string): string => text.split('\n').filter((l) => l.startsWith('COMMENT ')).map((l) => l.slice(8)).join(' ');

let builtinProblem: CheckedProblem;
let builtinPlan: ManeuverPlan;
let fileProblem: CheckedProblem;
let filePlan: ManeuverPlan;
beforeAll(async () => {
  builtinProblem = parseProblem(twoBodyProblemInUtc('2027-08-11T00:00:00Z'));
  builtinPlan = await planManeuvers(builtinProblem);
  fileProblem = parseProblem(twoBodyProblemInUtc('2027-08-11T00:00:00Z'), INVENTED);
  filePlan = await planManeuvers(fileProblem); // planned with the table it was checked with
});

describe('plan export with UTC epochs', () => {
  describe('when the plan lies past the built-in table\'s expiry', () => {
    it('should show UTC beside TDB in the comments and carry the leap-second caveat in the header', async () => {
      const opm = await exportPlanAsCcsds(builtinProblem, builtinPlan, { kind: 'opm', creationDateUtc: CREATED });
      expect(opm).toMatch(/^TIME_SYSTEM\s*=\s*TDB$/m);
      expect(opm).toMatch(/^COMMENT ignition 2027-08-11T00:10:00\.000 UTC = 2027-08-11T00:11:09\.\d{3} TDB$/m);
      expect(opm).toMatch(/^COMMENT epoch 2027-08-11T00:00:00\.000 UTC = /m);
      expect(opm).toMatch(/^COMMENT UTC readings: leap seconds from the built-in table, expires 2026-06-28$/m);
      expect(opm).toMatch(/^COMMENT WARNING UTC_LEAP_SECONDS_ASSUMED: /m);
    });
    it('should write UTC epochs when asked, through the same table', async () => {
      const opm = await exportPlanAsCcsds(builtinProblem, builtinPlan, { kind: 'opm', creationDateUtc: CREATED, timeSystem: 'UTC' });
      expect(opm).toMatch(/^MAN_EPOCH_IGNITION\s*=\s*2027-08-11T00:10:00\.000000$/m);
    });
  });
  describe('when the plan was made with a list holding an invented leap second', () => {
    it('should write its UTC epochs through that list, name it, and mark no caveat', async () => {
      const opm = await exportPlanAsCcsds(fileProblem, filePlan, { kind: 'opm', creationDateUtc: CREATED, timeSystem: 'UTC' });
      expect(opm).toMatch(/^EPOCH\s*=\s*2027-08-11T00:00:00\.000000$/m);
      expect(opm).toMatch(/^MAN_EPOCH_IGNITION\s*=\s*2027-08-11T00:10:00\.000000$/m);
      expect(commentText(opm)).toContain(`UTC readings: leap seconds from ${INVENTED_PATH} (SHA-256 ${INVENTED.sha256}), expires 2027-12-28`);
      expect(opm).not.toContain('UTC_LEAP_SECONDS_ASSUMED');
      const oem = await exportPlanAsCcsds(fileProblem, filePlan, { kind: 'oem', creationDateUtc: CREATED, timeSystem: 'UTC', stepS: 600 });
      expect(oem).toMatch(/^COMMENT Arc 2: after TCM-1 at 2027-08-11T00:10:00\.000 UTC = 2027-08-11T00:11:10\.\d{3} TDB$/m);
      expect(oem).toMatch(/^2027-08-11T00:10:00\.000000 /m);
    });
  });
});

describe('reading an OEM written in UTC', () => {
  it('should read its epochs through the table given: 1 s later in TDB past the invented leap second', () => {
    // The stored two-segment OEM fixture with its epochs relabelled UTC (its 2030 dates lie after the invented leap second).
    const text = readFileSync('test/fixtures/ccsds/oem-mars-two-segments.oem', 'utf8').replace('TIME_SYSTEM = TDB', 'TIME_SYSTEM = UTC');
    const builtin = readOem(text);
    const invented = readOem(text, INVENTED);
    const a = builtin.segments[0].states[0].epochTdbS;
    const b = invented.segments[0].states[0].epochTdbS;
    expect(b - a).toBeCloseTo(1, 6);
    expect(invented.segments[0].metadata.startTdbS - builtin.segments[0].metadata.startTdbS).toBeCloseTo(1, 6);
  });
});
