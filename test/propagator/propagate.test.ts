import { describe, expect, it } from 'vitest';
import { propagate, propagateAsync } from '../../propagator/run/propagate.ts';
import { keplerPropagate } from '../../propagator/kepler/index.ts';
import { GM_KM3_S2, RADIUS_KM } from '../../propagator/constants.ts';
import { InvalidInputError, OutOfSpanError } from '../../contract/errors.ts';
import { eclipticFromEquatorialJ2000 } from '../../propagator/frames/index.ts';
import type { PropagationRequest } from '../../propagator/run/propagation-types.ts';
import type { Vec3 } from '../../propagator/types.ts';
import { circularEphemeris } from './forces-test-ephemeris.ts';

const AU = 149597870.7;
const YEAR = 3.15581e7;
// Earth on a circular heliocentric orbit; the Moon 384400 km farther out on the same period, so it sits
// at a fixed point of the Earth's rotating frame (an analytic test ephemeris, not real positions).
const ephemeris = circularEphemeris([
  { body: 'earth', radiusKm: AU, periodS: YEAR },
  { body: 'moon', radiusKm: AU + 384400, periodS: YEAR },
], { startTdbS: 0, endTdbS: 1e9 });
const mu = GM_KM3_S2.earth;
const T0 = 2e8;
const r0: Vec3 = [7000, 0, 1000];
const v0: Vec3 = [0, 7.6, 1.0];

function request(overrides: Partial<PropagationRequest> = {}): PropagationRequest {
  return {
    initial: { epochTdbS: T0, centre: 'earth', frame: 'J2000_EQUATORIAL', positionKm: r0, velocityKmS: v0 },
    endEpochTdbS: T0 + 20000,
    forces: { centralBody: 'earth', perturbingBodies: [] },
    ephemeris,
    relativeTolerance: 1e-12,
    absoluteTolerance: 1e-12,
    ...overrides,
  };
}

const distance = (a: readonly number[], b: readonly number[]): number => Math.hypot(...a.map((v, i) => v - b[i]));

describe('propagate', () => {
  describe('when propagating pure two-body motion', () => {
    // Limits: a few mm after ~3.4 revolutions at tolerance 1e-12 (observed 0.5..1.1 mm).
    it('should agree with the universal-variable Kepler solution (analytic) to millimetres', () => {
      const result = propagate(request());
      expect(result.outcome).toBe('finished');
      const kepler = keplerPropagate(r0, v0, 20000, mu);
      expect(distance(result.final.positionKm, kepler.positionKm)).toBeLessThan(3e-6);
      expect(distance(result.final.velocityKmS, kepler.velocityKmS)).toBeLessThan(3e-9);
      expect(result.final.epochTdbS).toBe(T0 + 20000);
      expect(result.stats.evaluations).toBeGreaterThan(result.stats.acceptedSteps * 12);
    });
    it('should return to the start when propagated back in time', () => {
      const forward = propagate(request());
      const back = propagate(request({ initial: forward.final, endEpochTdbS: T0 }));
      expect(back.outcome).toBe('finished');
      expect(back.final.epochTdbS).toBe(T0);
      expect(distance(back.final.positionKm, r0)).toBeLessThan(2e-6);
    });
  });

  describe('when output samples are requested', () => {
    it('should give start, every outputStepS and the end, each on the Kepler solution', () => {
      const result = propagate(request({ outputStepS: 3000 }));
      expect(result.samples.map((s) => s.epochTdbS - T0)).toEqual([0, 3000, 6000, 9000, 12000, 15000, 18000, 20000]);
      for (const sample of result.samples) {
        const kepler = keplerPropagate(r0, v0, sample.epochTdbS - T0, mu);
        expect(distance(sample.positionKm, kepler.positionKm)).toBeLessThan(3e-6);
      }
    });
  });

  describe('when impulsive burns are given', () => {
    it('should stop exactly at each burn and apply its Δv (forward)', () => {
      const dv: Vec3 = [0.01, -0.02, 0.005];
      const result = propagate(request({ burns: [{ epochTdbS: T0 + 7000, deltaVKmS: dv }] }));
      const before = keplerPropagate(r0, v0, 7000, mu);
      const after = keplerPropagate(before.positionKm, before.velocityKmS.map((v, i) => v + dv[i]), 13000, mu);
      expect(distance(result.final.positionKm, after.positionKm)).toBeLessThan(3e-6);
    });
    it('should undo a burn when propagating backward through it', () => {
      const dv: Vec3 = [0.01, -0.02, 0.005];
      const forward = propagate(request({ burns: [{ epochTdbS: T0 + 7000, deltaVKmS: dv }] }));
      const back = propagate(request({ initial: forward.final, endEpochTdbS: T0, burns: [{ epochTdbS: T0 + 7000, deltaVKmS: dv }] }));
      expect(distance(back.final.positionKm, r0)).toBeLessThan(2e-6);
      expect(distance(back.final.velocityKmS, v0)).toBeLessThan(2e-9);
    });
  });

  describe('when the initial state is given about another centre and in the ecliptic frame', () => {
    it('should give the same trajectory as the equivalent Earth-centred equatorial state', () => {
      const earth = new Float64Array(6);
      ephemeris.stateInto('earth', 'sun', T0, earth, 0);
      const helio = [...r0, ...v0].map((v, i) => v + earth[i]);
      const initial = {
        epochTdbS: T0, centre: 'sun' as const, frame: 'J2000_ECLIPTIC' as const,
        positionKm: eclipticFromEquatorialJ2000(helio.slice(0, 3)), velocityKmS: eclipticFromEquatorialJ2000(helio.slice(3)),
      };
      const direct = propagate(request());
      const converted = propagate(request({ initial }));
      expect(converted.final.centre).toBe('earth');
      expect(converted.final.frame).toBe('J2000_EQUATORIAL');
      // Round-off of the 1 au offset (~1.5e8 km * 1e-16) limits the agreement.
      expect(distance(converted.final.positionKm, direct.final.positionKm)).toBeLessThan(1e-4);
    });
  });

  describe('when the trajectory reaches a body surface', () => {
    it('should end with outcome impact on the central body at the surface crossing', () => {
      const result = propagate(request({ initial: { ...request().initial, velocityKmS: [0, 7.0, 0.5] } }));
      expect(result.outcome).toBe('impact');
      expect(result.events).toHaveLength(1);
      expect(result.events[0].body).toBe('earth');
      expect(Math.hypot(...result.final.positionKm) - RADIUS_KM.earth).toBeLessThan(1e-4);
      expect(Math.hypot(...result.final.positionKm) - RADIUS_KM.earth).toBeGreaterThan(-1e-4);
      expect(result.message).toMatch(/impact on earth/);
    });
    it('should report an impact on a perturbing body', () => {
      const moon = new Float64Array(3);
      ephemeris.positionInto('moon', 'earth', T0, moon, 0);
      const start: Vec3 = [moon[0] + 8000, moon[1], moon[2]];
      const result = propagate(request({
        initial: { epochTdbS: T0, centre: 'earth', frame: 'J2000_EQUATORIAL', positionKm: start, velocityKmS: [-2, 2 * Math.PI * 384400 / YEAR, 0] },
        endEpochTdbS: T0 + 86400,
        forces: { centralBody: 'earth', perturbingBodies: ['moon'] },
      }));
      expect(result.outcome).toBe('impact');
      expect(result.events[0].body).toBe('moon');
      expect(result.events[0].distanceKm).toBeCloseTo(RADIUS_KM.moon, 3);
      // The event's state is relative to the Moon (contract), the final state to the central body.
      expect(result.events[0].state.centre).toBe('moon');
      expect(Math.hypot(...result.events[0].state.positionKm)).toBeCloseTo(RADIUS_KM.moon, 3);
      expect(result.final.centre).toBe('earth');
    });
  });

  describe('when cancelled or out of steps', () => {
    it('should stop with outcome cancelled when the signal fires during the run', () => {
      const controller = new AbortController();
      const result = propagate(request({ endEpochTdbS: T0 + 30 * 86400 }), {
        signal: controller.signal,
        onProgress: (fraction) => {
          if (fraction > 0.01) controller.abort();
        },
      });
      expect(result.outcome).toBe('cancelled');
      expect(result.final.epochTdbS).toBeLessThan(T0 + 86400);
    });
    it('should stop with max-steps', () => {
      const result = propagate(request({ maxSteps: 10 }));
      expect(result.outcome).toBe('max-steps');
      expect(result.stats.steps).toBe(10);
    });
  });

  describe('when run asynchronously', () => {
    it('should give the same result as the synchronous run and report progress up to 1', async () => {
      const fractions: number[] = [];
      const asyncResult = await propagateAsync(request({ withStm: true }), { onProgress: (f) => fractions.push(f) });
      const syncResult = propagate(request({ withStm: true }));
      expect(asyncResult).toEqual(syncResult);
      expect(fractions.at(-1)).toBe(1);
    });
    it('should stop promptly when aborted from a timer', async () => {
      const controller = new AbortController();
      setTimeout(() => controller.abort(), 30);
      const started = performance.now();
      const result = await propagateAsync(request({ endEpochTdbS: T0 + 3650 * 86400, relativeTolerance: 1e-13 }), { signal: controller.signal });
      expect(result.outcome).toBe('cancelled');
      expect(performance.now() - started).toBeLessThan(2000);
    });
  });

  describe('when the span ends at the edge of the ephemeris span', () => {
    it('should not evaluate the forces beyond it (the starting-step trial is bounded by the span)', () => {
      // Default tolerances put Hairer's starting-step trial evaluation ~0.37 s ahead on this state.
      const tight = circularEphemeris([{ body: 'earth', radiusKm: AU, periodS: YEAR }], { startTdbS: T0, endTdbS: T0 + 0.1 });
      const result = propagate({
        initial: { epochTdbS: T0, centre: 'sun', frame: 'J2000_EQUATORIAL', positionKm: [1.2 * AU, 0, 0], velocityKmS: [0, 27, 0] },
        endEpochTdbS: T0 + 0.1, forces: { centralBody: 'sun', perturbingBodies: ['earth'] }, ephemeris: tight,
      });
      expect(result.outcome).toBe('finished');
    });
  });

  describe('when the request is invalid', () => {
    const cases: [string, Partial<PropagationRequest>, RegExp][] = [
      ['non-finite position', { initial: { ...request().initial, positionKm: [Number.NaN, 0, 0] } }, /initial\.positionKm\[0\]/],
      ['tolerance out of range', { relativeTolerance: 0.5 }, /relativeTolerance/],
      ['zero absolute tolerance', { absoluteTolerance: 0 }, /absoluteTolerance/],
      ['burn outside the span', { burns: [{ epochTdbS: T0 - 5, deltaVKmS: [0, 0, 0] }] }, /burns\[0\]\.epochTdbS/],
      ['unknown centre', { initial: { ...request().initial, centre: 'vulcan' as never } }, /initial\.centre/],
      ['start inside the Earth', { initial: { ...request().initial, positionKm: [100, 0, 0] } }, /inside earth/],
      ['negative output step', { outputStepS: -1 }, /outputStepS/],
      ['a missing force model', { forces: undefined as never }, /^forces/],
      ['a missing ephemeris', { ephemeris: undefined as never }, /^ephemeris/],
    ];
    for (const [name, overrides, pattern] of cases) {
      it(`should reject ${name} with InvalidInputError naming the field`, () => {
        expect(() => propagate(request(overrides))).toThrow(InvalidInputError);
        expect(() => propagate(request(overrides))).toThrow(pattern);
      });
    }
    it('should reject an end epoch outside the ephemeris span with OutOfSpanError', () => {
      const outside = request({ endEpochTdbS: 2e9, forces: { centralBody: 'earth', perturbingBodies: ['moon'] } });
      expect(() => propagate(outside)).toThrow(OutOfSpanError);
      expect(() => propagate(outside)).toThrow(/endEpochTdbS/);
    });
  });
});
