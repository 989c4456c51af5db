/**
 * Lambert solver (Izzo 2015) against published worked examples and an independent two-body integration.
 * The integrator is odex (npm 2.0.4: Hairer & Wanner's GBS extrapolation code ported to JavaScript), a
 * general-purpose reference library outside the project.
 */
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { solveLambert } from '../../planner/lambert/index.ts';
import type { Vec3 } from '../../propagator/index.ts';

// odex ships TypeScript sources that do not compile under our strict settings, so load its JS build.
interface OdexSolver {
  absoluteTolerance: number; relativeTolerance: number; maxSteps: number;
  solve(f: (x: number, y: number[]) => number[], x0: number, y0: number[], x1: number): { y: number[]; outcome: number };
}
const odex = createRequire(import.meta.url)('odex') as { Solver: new (n: number) => OdexSolver };

/** Two-body propagation by odex at tight tolerance: returns [r, v] after `durationS`. */
function twoBody(r: Vec3, v: Vec3, durationS: number, mu: number): number[] {
  const solver = new odex.Solver(6);
  solver.absoluteTolerance = 1e-12;
  solver.relativeTolerance = 1e-13;
  solver.maxSteps = 100000;
  const f = (_t: number, y: number[]): number[] => {
    const d = Math.hypot(y[0], y[1], y[2]);
    const k = -mu / (d * d * d);
    return [y[3], y[4], y[5], k * y[0], k * y[1], k * y[2]];
  };
  const result = solver.solve(f, 0, [...r, ...v], durationS);
  expect(result.outcome).toBe(0);
  return result.y;
}

const MU_EARTH = 398600;

describe('solveLambert', () => {
  describe('when given Curtis, Orbital Mechanics for Engineering Students, Example 5.2', () => {
    // Source: H. D. Curtis, Orbital Mechanics for Engineering Students, Example 5.2 (from memory):
    // r1 = [5000, 10000, 2100] km, r2 = [-14600, 2500, 7000] km, Δt = 1 h, μ = 398600 km³/s², prograde.
    const solution = solveLambert([5000, 10000, 2100], [-14600, 2500, 7000], 3600, MU_EARTH, { direction: 'prograde' });

    it('should converge within a handful of Householder iterations', () => {
      expect(solution.converged).toBe(true);
      expect(solution.iterations).toBeLessThanOrEqual(5);
    });

    it('should reproduce the printed v1 = [-5.9925, 1.9254, 3.2456] km/s to its digits', () => {
      const printed = [-5.9925, 1.9254, 3.2456];
      printed.forEach((value, i) => expect(Math.abs(solution.v1KmS[i] - value)).toBeLessThanOrEqual(0.5e-4));
    });

    it('should reproduce the printed v2 = [-3.3125, -4.1966, -0.38529] km/s to its digits', () => {
      const printed = [-3.3125, -4.1966, -0.38529];
      const halfUnit = [0.5e-4, 0.5e-4, 0.5e-5];
      printed.forEach((value, i) => expect(Math.abs(solution.v2KmS[i] - value)).toBeLessThanOrEqual(halfUnit[i]));
    });
  });

  // Vallado, Fundamentals of Astrodynamics and Applications, Example 7-5 was tried with values typed from
  // memory; they did not reproduce to half a unit of the last printed digit, so the case is left out
  // rather than widened (see the project's rule on from-memory values).

  describe('when its velocity is propagated by an independent two-body integration (odex)', () => {
    const r1: Vec3 = [7000, -1200, 800];
    const r2: Vec3 = [-3000, 9000, 2500];
    const cases: { name: string; tofS: number; direction: 'prograde' | 'retrograde' }[] = [
      { name: 'short way, elliptic', tofS: 2400, direction: 'prograde' },
      { name: 'long way (retrograde about +z), elliptic', tofS: 9000, direction: 'retrograde' },
      { name: 'short way, hyperbolic (very short time)', tofS: 600, direction: 'prograde' },
      { name: 'long way, long time', tofS: 30000, direction: 'retrograde' },
      { name: 'short way, near the parabolic time', tofS: 1650, direction: 'prograde' },
    ];
    for (const c of cases) {
      it(`should land on r2 within 1e-5 km and match v2 (${c.name})`, () => {
        const solution = solveLambert(r1, r2, c.tofS, MU_EARTH, { direction: c.direction });
        expect(solution.converged).toBe(true);
        const end = twoBody(r1, solution.v1KmS, c.tofS, MU_EARTH);
        const positionError = Math.hypot(end[0] - r2[0], end[1] - r2[1], end[2] - r2[2]);
        const velocityError = Math.hypot(end[3] - solution.v2KmS[0], end[4] - solution.v2KmS[1], end[5] - solution.v2KmS[2]);
        expect(positionError).toBeLessThan(1e-5);
        expect(velocityError).toBeLessThan(1e-8);
      });
    }
  });

  describe('when the direction is chosen', () => {
    it('should give angular momentum along +z for prograde and against it for retrograde', () => {
      const r1: Vec3 = [7000, 0, 100];
      const r2: Vec3 = [0, 8000, -300];
      for (const direction of ['prograde', 'retrograde'] as const) {
        const { v1KmS: v, transferAngleRad } = solveLambert(r1, r2, 3000, MU_EARTH, { direction });
        const hz = r1[0] * v[1] - r1[1] * v[0];
        expect(Math.sign(hz)).toBe(direction === 'prograde' ? 1 : -1);
        expect(transferAngleRad > Math.PI).toBe(direction === 'retrograde');
      }
    });
  });

  describe('when the geometry or input is degenerate', () => {
    it('should throw a clear error for a 180° transfer', () => {
      expect(() => solveLambert([7000, 0, 0], [-9000, 0, 0], 5000, MU_EARTH, { direction: 'prograde' }))
        .toThrow(/transfer angle is 180\.0+° .*undefined/);
    });

    it('should throw for a 0° transfer, naming r2Km', () => {
      expect(() => solveLambert([7000, 0, 0], [9000, 0, 0], 5000, MU_EARTH, { direction: 'prograde' }))
        .toThrow(/^r2Km: transfer angle is 0\.0+°/);
    });

    it('should name the field for a non-positive time of flight or μ', () => {
      expect(() => solveLambert([7000, 0, 0], [0, 9000, 0], -5, MU_EARTH, { direction: 'prograde' }))
        .toThrow(/^timeOfFlightS: must be a finite number > 0/);
      expect(() => solveLambert([7000, 0, 0], [0, 9000, 0], 5, Number.NaN, { direction: 'prograde' }))
        .toThrow(/^muKm3S2:/);
    });

    it('should refuse a reference normal lying in the transfer plane', () => {
      expect(() => solveLambert([7000, 0, 0], [0, 9000, 0], 3000, MU_EARTH,
        { direction: 'prograde', referenceNormal: [1, 0, 0] })).toThrow(/^options\.referenceNormal:/);
    });
  });
});

describe('solveLambert at the parabolic time of flight', () => {
  // Euler's parabolic time of flight (Battin, An Introduction to the Mathematics and Methods of
  // Astrodynamics, §4.2, from memory): √μ·t = [(r1 + r2 + c)^{3/2} − (r1 + r2 − c)^{3/2}]/6 for a transfer
  // angle below 180°. At that time the Lambert conic is a parabola: zero specific energy.
  const r1: Vec3 = [7000, -1200, 800];
  const r2: Vec3 = [-3000, 9000, 2500];
  const m = Math.hypot(...r1) + Math.hypot(...r2);
  const c = Math.hypot(r2[0] - r1[0], r2[1] - r1[1], r2[2] - r1[2]);
  const tofS = ((m + c) ** 1.5 - (m - c) ** 1.5) / (6 * Math.sqrt(MU_EARTH));

  for (const factor of [1, 1 + 1e-9, 1 - 1e-9]) {
    describe(`when the time is ${factor} × the parabolic time`, () => {
      it('should converge to an orbit of (nearly) zero energy that lands on r2', () => {
        const s = solveLambert(r1, r2, tofS * factor, MU_EARTH, { direction: 'prograde' });
        expect(s.converged).toBe(true);
        const energy = (s.v1KmS[0] ** 2 + s.v1KmS[1] ** 2 + s.v1KmS[2] ** 2) / 2 - MU_EARTH / Math.hypot(...r1);
        expect(Math.abs(energy)).toBeLessThan(1e-6);
        const end = twoBody(r1, s.v1KmS, tofS * factor, MU_EARTH);
        expect(Math.hypot(end[0] - r2[0], end[1] - r2[1], end[2] - r2[2])).toBeLessThan(1e-5);
      });
    });
  }
});

describe('solveLambert with complete revolutions (Izzo 2015, multi-revolution branches)', () => {
  const r1: Vec3 = [7000, -1200, 800];
  const r2: Vec3 = [-3000, 9000, 2500];

  for (const revolutions of [1, 2]) {
    for (const branch of ['left', 'right'] as const) {
      describe(`when ${revolutions} revolution(s) on the ${branch} branch are asked for`, () => {
        it('should land on r2 under odex integration after the extra revolutions', () => {
          const tofS = 40000;
          const s = solveLambert(r1, r2, tofS, MU_EARTH, { direction: 'prograde', revolutions, branch });
          expect(s.converged).toBe(true);
          expect(s.revolutions).toBe(revolutions);
          const end = twoBody(r1, s.v1KmS, tofS, MU_EARTH);
          expect(Math.hypot(end[0] - r2[0], end[1] - r2[1], end[2] - r2[2])).toBeLessThan(1e-4);
          // Period check: the conic completes `revolutions` full orbits plus the transfer arc.
          const v2 = s.v1KmS[0] ** 2 + s.v1KmS[1] ** 2 + s.v1KmS[2] ** 2;
          const a = 1 / (2 / Math.hypot(...r1) - v2 / MU_EARTH);
          const period = 2 * Math.PI * Math.sqrt(a ** 3 / MU_EARTH);
          expect(Math.floor(tofS / period)).toBe(revolutions);
        });
      });
    }
  }

  describe('when the two branches are compared', () => {
    it('should give two different conics', () => {
      const left = solveLambert(r1, r2, 40000, MU_EARTH, { direction: 'prograde', revolutions: 1, branch: 'left' });
      const right = solveLambert(r1, r2, 40000, MU_EARTH, { direction: 'prograde', revolutions: 1, branch: 'right' });
      expect(Math.hypot(left.v1KmS[0] - right.v1KmS[0], left.v1KmS[1] - right.v1KmS[1], left.v1KmS[2] - right.v1KmS[2])).toBeGreaterThan(0.1);
    });
  });

  describe('when the time is shorter than the minimum for the revolutions', () => {
    it('should throw naming timeOfFlightS and the minimum', () => {
      expect(() => solveLambert(r1, r2, 15000, MU_EARTH, { direction: 'prograde', revolutions: 2 }))
        .toThrow(/^timeOfFlightS: 15000 s is below the minimum \d+\.\d+ s for 2 complete revolution/);
    });
  });

  describe('when 200 seeded random multi-revolution problems are solved', () => {
    it('should converge on both branches whenever the time allows, in at most 8 iterations', () => {
      let seed = 777;
      const uniform = (): number => { seed = (seed * 16807) % 2147483647; return seed / 2147483647; };
      let solved = 0;
      for (let k = 0; k < 200; k += 1) {
        const a: Vec3 = [uniform() * 2e4 - 1e4, uniform() * 2e4 - 1e4, uniform() * 2e4 - 1e4];
        const b: Vec3 = [uniform() * 2e4 - 1e4, uniform() * 2e4 - 1e4, uniform() * 2e4 - 1e4];
        const tofS = 5000 + uniform() * 100000;
        const revolutions = 1 + Math.floor(uniform() * 3);
        for (const branch of ['left', 'right'] as const) {
          try {
            const s = solveLambert(a, b, tofS, MU_EARTH, { direction: 'prograde', revolutions, branch });
            expect(s.converged).toBe(true);
            expect(s.iterations).toBeLessThanOrEqual(8);
            solved += 1;
          } catch (error) {
            expect(String(error)).toMatch(/below the minimum/);
          }
        }
      }
      expect(solved).toBeGreaterThan(100);
    });
  });
});

describe('solveLambert over random geometries', () => {
  describe('when 300 seeded random single-revolution problems are solved', () => {
    // Park–Miller minimal standard generator, so the sweep is the same on every run.
    let seed = 12345;
    const uniform = (): number => { seed = (seed * 16807) % 2147483647; return seed / 2147483647; };
    const problems = Array.from({ length: 300 }, () => ({
      r1: [uniform() * 2e4 - 1e4, uniform() * 2e4 - 1e4, uniform() * 2e4 - 1e4] as Vec3,
      r2: [uniform() * 2e4 - 1e4, uniform() * 2e4 - 1e4, uniform() * 2e4 - 1e4] as Vec3,
      tofS: Math.exp(Math.log(30) + uniform() * Math.log(3e3)),
      direction: uniform() < 0.5 ? 'prograde' as const : 'retrograde' as const,
    }));

    it('should converge in at most 5 iterations every time (Izzo reports 2–3 typical)', () => {
      for (const p of problems) {
        const s = solveLambert(p.r1, p.r2, p.tofS, MU_EARTH, { direction: p.direction });
        expect(s.converged, JSON.stringify(p)).toBe(true);
        expect(s.iterations).toBeLessThanOrEqual(5);
      }
    });

    it('should land on r2 under odex integration for every tenth problem', () => {
      for (const p of problems.filter((_, i) => i % 10 === 0)) {
        const s = solveLambert(p.r1, p.r2, p.tofS, MU_EARTH, { direction: p.direction });
        const end = twoBody(p.r1, s.v1KmS, p.tofS, MU_EARTH);
        const miss = Math.hypot(end[0] - p.r2[0], end[1] - p.r2[1], end[2] - p.r2[2]);
        expect(miss, JSON.stringify(p)).toBeLessThan(1e-5 * Math.max(1, Math.hypot(...p.r2) / 1e4));
      }
    });
  });
});
