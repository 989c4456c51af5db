/**
 * Invented problems for the service tests. `examples/two-body-demo.json` (the planner's fast demo) is used
 * for jobs that really run; `schemaValidProblem()` only needs to pass validation (an invented spacecraft on
 * an Earth orbit; numbers are illustrative, not a mission's).
 */
import { existsSync, readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import type { Redis } from 'ioredis';

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

/** GM of the Earth, km³/s² (IERS Conventions 2010, Table 1.1 — from memory); only used to place a reachable target. */
const GM_EARTH_KM3_S2 = 398600.4418;

/**
 * A fast, convergent problem: circular Earth orbit of radius 7000 km in the J2000 equator; the target is
 * the two-body position one hour later shifted 0.002 rad ahead along the orbit (about 14 km), which a small
 * burn after ten minutes reaches. Optional execution errors and Monte Carlo settings for dispersion tests.
 */
export function reachableProblem(opts: { samples?: number; seed?: number; name?: string } = {}): Record<string, any> {
  const rKm = 7000;
  const n = Math.sqrt(GM_EARTH_KM3_S2 / rKm ** 3);
  const angle = n * 3600 + 0.002;
  const p = schemaValidProblem();
  p.spacecraft.name = opts.name ?? 'TESTSAT-1';
  p.initialState.velocityKmS = [0, Math.sqrt(GM_EARTH_KM3_S2 / rKm), 0];
  p.targets = [{ kind: 'position', epoch: '2031-03-01T01:00:00 TDB', centre: 'earth', positionKm: [rKm * Math.cos(angle), rKm * Math.sin(angle), 0], toleranceKm: 0.5 }];
  p.executionErrors = { fixedMagnitudeMS: 0.01, proportionalMagnitudeFraction: 0.01, fixedPointingMS: 0.01, proportionalPointingDeg: 0.5 };
  p.dispersion = { samples: opts.samples ?? 20, seed: opts.seed ?? 7 };
  return p;
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

/** Every Redis key matching `pattern` (SCAN, so a busy Redis is not blocked). */
export async function keysOf(redis: Redis, pattern: string): Promise<string[]> {
  const found: string[] = [];
  let cursor = '0';
  do {
    const [next, keys] = await redis.scan(cursor, 'MATCH', pattern, 'COUNT', 1000);
    found.push(...keys);
    cursor = next;
  } while (cursor !== '0');
  return found;
}
