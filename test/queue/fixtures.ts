/**
 * Invented problems for the service tests. `examples/two-body-demo.json` (the planner's fast demo) is used
 * for jobs that really run; `schemaValidProblem()` only needs to pass validation (an invented spacecraft on
 * an Earth orbit; numbers are illustrative, not a mission's).
 */
import { existsSync, readFileSync } from 'node:fs';
import { resolve } from 'node:path';

const ROOT = resolve(import.meta.dirname, '../..');
export const TWO_BODY_DEMO = resolve(ROOT, 'examples/two-body-demo.json');

/** A schema- and semantics-valid problem (Earth two-body, one burn, one position target). */
export function schemaValidProblem(): Record<string, any> {
  return {
    title: 'service test problem',
    spacecraft: { name: 'TESTSAT-1', massKg: 500, engine: { ispS: 220, thrustN: 22 } },
    initialState: {
      epoch: '2031-03-01T00:00:00 TDB', centre: 'earth', frame: 'J2000_EQUATORIAL',
      positionKm: [7000, 0, 0], velocityKmS: [0, 7.546, 0],
    },
    endEpoch: '2031-03-01T02:00:00 TDB',
    forceModel: { centralBody: 'earth' },
    burns: [{ label: 'TCM-1', epoch: '2031-03-01T00:10:00 TDB', frame: 'RTN', deltaVGuessKmS: [0, 0.001, 0] }],
    targets: [{ kind: 'position', epoch: '2031-03-01T01:00:00 TDB', centre: 'earth', positionKm: [-6000, 3600, 0], toleranceKm: 1 }],
  };
}

/** The planner's two-body demo problem, or null while it does not exist. */
export function twoBodyDemo(): Record<string, any> | null {
  if (!existsSync(TWO_BODY_DEMO)) return null;
  return JSON.parse(readFileSync(TWO_BODY_DEMO, 'utf8')) as Record<string, any>;
}

/** A submission body. */
export function submission(problem: Record<string, unknown>, extra: Record<string, unknown> = {}): Record<string, unknown> {
  return { problem, reason: 'service test: correct the approach after the latest orbit determination', ...extra };
}
