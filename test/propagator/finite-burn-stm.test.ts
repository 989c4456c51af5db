/**
 * Finite-burn sensitivities of the propagator (STM through thrust arcs; partials with respect to the thrust
 * direction, ignition epoch and duration, including the mass coupling of a later burn to an earlier
 * burn's duration) against central finite differences of full propagations (the standard check of
 * variational equations, e.g. Montenbruck & Gill, Satellite Orbits, §7.1).
 */
import { describe, expect, it } from 'vitest';
import { propagate } from '../../propagator/run/propagate.ts';
import type { FiniteBurnSpec, ForceModelSpec, PropagationRequest } from '../../propagator/run/propagation-types.ts';
import type { Vec3 } from '../../propagator/types.ts';
import { circularEphemeris } from './forces-test-ephemeris.ts';

const AU = 149597870.7;
const YEAR = 3.15581e7;
const ephemeris = circularEphemeris([
  { body: 'earth', radiusKm: AU, periodS: YEAR },
  { body: 'moon', radiusKm: AU + 384400, periodS: YEAR, phaseRad: 0 },
]);
const T0 = 2e8;
const forces: ForceModelSpec = { centralBody: 'earth', perturbingBodies: ['sun', 'moon'], centralJ2: true };
const x0 = [7200, 800, 300, -0.9, 7.1, 1.9];
const s = Math.sqrt(1 - 0.6 * 0.6 - 0.1 * 0.1);
const BURNS: FiniteBurnSpec[] = [
  { startTdbS: T0 + 1200, durationS: 700, thrustN: 300, massFlowKgS: 0.1, axes: 'RTN', direction: [0.1, 0.6, s] },
  { startTdbS: T0 + 6000, durationS: 500, thrustN: 200, massFlowKgS: 0.07, axes: 'VNB', direction: [s, -0.1, 0.6] },
  { startTdbS: T0 + 9000, durationS: 400, thrustN: 250, massFlowKgS: 0.08, axes: 'inertial', direction: [0.6, s, 0.1] },
];
const IMPULSE = { epochTdbS: T0 + 3000, deltaVKmS: [0.002, -0.001, 0.0005] as Vec3 };

function run(state: number[], burns: FiniteBurnSpec[], withStm = false, massKg = 900) {
  const request: PropagationRequest = {
    initial: { epochTdbS: T0, centre: 'earth', frame: 'J2000_EQUATORIAL', positionKm: state.slice(0, 3) as Vec3, velocityKmS: state.slice(3) as Vec3 },
    endEpochTdbS: T0 + 12000, forces, ephemeris, finiteBurns: burns, burns: [IMPULSE], initialMassKg: massKg, withStm,
    relativeTolerance: 1e-13, absoluteTolerance: 1e-13,
  };
  const result = propagate(request);
  expect(result.outcome).toBe('finished');
  return result;
}
const finalOf = (r: ReturnType<typeof run>): number[] => [...r.final.positionKm, ...r.final.velocityKmS];
const nominal = run(x0, BURNS, true);

/** Central difference of the final state for a perturbation `apply(h)` of the inputs. */
function centralDifference(h: number, apply: (h: number) => { state: number[]; burns: FiniteBurnSpec[] }): number[] {
  const p = apply(h);
  const m = apply(-h);
  const fp = finalOf(run(p.state, p.burns));
  const fm = finalOf(run(m.state, m.burns));
  return fp.map((v, i) => (v - fm[i]) / (2 * h));
}

/** Relative agreement limit. Measured at tolerance 1e-13 (largest |analytic − FD| over a column / its
 * largest entry): STM 4e-8, impulsive Δv 1.8e-7, direction ≤ 6.6e-7, duration ≤ 1.1e-7, ignition ≤ 1.3e-7
 * — the floor of the finite differences themselves (integration noise over the step); limit ~5x above. */
const LIMIT = 3e-6;

/** Largest |a − b| over the column, relative to the column's largest entry. */
function relativeDifference(a: number[], b: number[]): number {
  const scale = Math.max(...b.map(Math.abs));
  return Math.max(...a.map((v, i) => Math.abs(v - b[i]))) / scale;
}

const withBurn = (k: number, change: Partial<FiniteBurnSpec>): FiniteBurnSpec[] => BURNS.map((b, i) => (i === k ? { ...b, ...change } : b));
const normalise = (v: number[]): Vec3 => v.map((x) => x / Math.hypot(v[0], v[1], v[2])) as Vec3;
const cross = (a: number[], b: number[]): number[] => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
/** Columns of a 6x3 row-major matrix times w. */
const times = (m: number[], w: number[]): number[] => [0, 1, 2, 3, 4, 5].map((i) => m[3 * i] * w[0] + m[3 * i + 1] * w[1] + m[3 * i + 2] * w[2]);

describe('finite-burn sensitivities', () => {
  describe('when compared with central differences of full propagations', () => {
    it('should give the STM of the initial state through coasts, arcs and an impulsive burn', () => {
      for (let j = 0; j < 6; j++) {
        const h = j < 3 ? 1e-1 : 1e-4;
        const fd = centralDifference(h, (d) => ({ state: x0.map((v, i) => (i === j ? v + d : v)), burns: BURNS }));
        const column = [0, 1, 2, 3, 4, 5].map((i) => nominal.stm![6 * i + j]);
        expect(relativeDifference(column, fd), `column ${j}`).toBeLessThan(LIMIT);
      }
    });

    it('should give the impulsive burn sensitivity through the later arcs', () => {
      const sens = nominal.burnSensitivities![0];
      const h = 1e-5;
      for (let j = 0; j < 3; j++) {
        const dv = (d: number): Vec3 => IMPULSE.deltaVKmS.map((v, i) => (i === j ? v + d : v)) as Vec3;
        const fp = finalOf(propagate({ ...requestWith(dv(h)) }));
        const fm = finalOf(propagate({ ...requestWith(dv(-h)) }));
        const fd = fp.map((v, i) => (v - fm[i]) / (2 * h));
        expect(relativeDifference([0, 1, 2, 3, 4, 5].map((i) => sens[3 * i + j]), fd), `Δv ${j}`).toBeLessThan(LIMIT);
      }
    });

    it('should give the sensitivity to the initial mass (every arc acceleration scales with it)', () => {
      const h = 1;
      const fp = finalOf(run(x0, BURNS, false, 900 + h));
      const fm = finalOf(run(x0, BURNS, false, 900 - h));
      expect(relativeDifference(nominal.initialMassSensitivity!, fp.map((v, i) => (v - fm[i]) / (2 * h)))).toBeLessThan(LIMIT);
    });

    BURNS.forEach((burn, k) => {
      describe(`when burn ${k} is steered in ${burn.axes} axes`, () => {
        const sens = nominal.finiteBurnSensitivities![k];

        it('should give the direction partials along two directions turning the unit vector', () => {
          const u = burn.direction;
          const w1 = normalise(cross(u, [0, 0, 1]));
          const w2 = normalise(cross(u, w1));
          for (const w of [w1, w2]) {
            // Normalisation is second order along w ⟂ u, so the derivative along w is (∂x/∂u)·w.
            const fd = centralDifference(1e-3, (d) => ({ state: x0, burns: withBurn(k, { direction: normalise(u.map((v, i) => v + d * w[i])) }) }));
            expect(relativeDifference(times(sens.direction, w), fd)).toBeLessThan(LIMIT);
          }
        });

        it('should give the duration partial (ignition held), mass coupling to later burns included', () => {
          const fd = centralDifference(0.5, (d) => ({ state: x0, burns: withBurn(k, { durationS: burn.durationS + d }) }));
          expect(relativeDifference(sens.durationS, fd)).toBeLessThan(LIMIT);
        });

        it('should give the ignition-epoch partial (duration held)', () => {
          const fd = centralDifference(0.5, (d) => ({ state: x0, burns: withBurn(k, { startTdbS: burn.startTdbS + d }) }));
          expect(relativeDifference(sens.startTdbS, fd)).toBeLessThan(LIMIT);
        });
      });
    });
  });
});

function requestWith(dv: Vec3): PropagationRequest {
  return {
    initial: { epochTdbS: T0, centre: 'earth', frame: 'J2000_EQUATORIAL', positionKm: x0.slice(0, 3) as Vec3, velocityKmS: x0.slice(3) as Vec3 },
    endEpochTdbS: T0 + 12000, forces, ephemeris, finiteBurns: BURNS, burns: [{ epochTdbS: IMPULSE.epochTdbS, deltaVKmS: dv }], initialMassKg: 900,
    relativeTolerance: 1e-13, absoluteTolerance: 1e-13,
  };
}
