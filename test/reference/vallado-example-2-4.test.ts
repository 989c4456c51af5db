/**
 * Vallado, "Fundamentals of Astrodynamics and Applications" (4th ed., 2013), Example 2-4 (KEPLER):
 * r0 = [1131.340, −2282.343, 6672.423] km, v0 = [−5.64305, 4.30333, 2.42879] km/s, Δt = 40 min,
 * μ = 398600.4418 km^3/s^2; printed r = [−4219.7527, 4363.0292, −3958.7666] km,
 * v = [3.689866, −1.916735, −6.112511] km/s. Values typed from memory; they reproduce to the printed digits.
 */
import { describe, expect, it } from 'vitest';
import { createBuiltinEphemeris, propagate, type Vec3 } from '../../propagator/index.ts';
import { keplerPropagate } from '../../propagator/kepler/index.ts';

const MU = 398600.4418;
const R0 = [1131.340, -2282.343, 6672.423];
const V0 = [-5.64305, 4.30333, 2.42879];
const R_PRINTED = [-4219.7527, 4363.0292, -3958.7666];
const V_PRINTED = [3.689866, -1.916735, -6.112511];

describe('universal-variable Kepler solver against Vallado Example 2-4', () => {
  describe('when propagating the printed state 40 minutes ahead', () => {
    it('should reproduce the printed position to 0.1 m and velocity to 1 mm/s', () => {
      const { positionKm, velocityKmS } = keplerPropagate(R0, V0, 40 * 60, MU);
      for (let i = 0; i < 3; i++) {
        // Printed digits are 0.1 m / 1e-6 km/s; limits are the 0.1 m and 1 mm/s.
        expect(Math.abs(positionKm[i] - R_PRINTED[i]), `r[${i}]`).toBeLessThan(1e-4);
        expect(Math.abs(velocityKmS[i] - V_PRINTED[i]), `v[${i}]`).toBeLessThan(1e-6);
      }
    });
  });
  describe('when propagating the printed final state 40 minutes back', () => {
    it('should recover the initial state to 1 mm', () => {
      const { positionKm, velocityKmS } = keplerPropagate(R_PRINTED, V_PRINTED, -40 * 60, MU);
      for (let i = 0; i < 3; i++) {
        // The printed final state is rounded to 0.1 m, so the back-propagation inherits ~1e-4 km.
        expect(Math.abs(positionKm[i] - R0[i]), `r[${i}]`).toBeLessThan(1e-3);
        expect(Math.abs(velocityKmS[i] - V0[i]), `v[${i}]`).toBeLessThan(1e-6);
      }
    });
  });
});

describe('Cowell and Encke against Vallado Example 2-4', () => {
  for (const method of ['cowell', 'encke'] as const) {
    describe(`when ${method} propagates the same 40 minutes with the example's μ`, () => {
      const result = propagate({
        initial: { epochTdbS: 0, centre: 'earth', frame: 'J2000_EQUATORIAL', positionKm: R0 as Vec3, velocityKmS: V0 as Vec3 },
        endEpochTdbS: 2400, forces: { centralBody: 'earth', perturbingBodies: [], gmOverridesKm3S2: { earth: MU } },
        ephemeris: createBuiltinEphemeris(), method, relativeTolerance: 1e-13, absoluteTolerance: 1e-12,
      });
      it('should reproduce the printed digits (0.1 m, 1 mm/s)', () => {
        for (let i = 0; i < 3; i++) {
          expect(Math.abs(result.final.positionKm[i] - R_PRINTED[i]), `r[${i}]`).toBeLessThan(1e-4);
          expect(Math.abs(result.final.velocityKmS[i] - V_PRINTED[i]), `v[${i}]`).toBeLessThan(1e-6);
        }
      });
      it('should agree with the Kepler solver to better than 1 cm', () => {
        const k = keplerPropagate(R0, V0, 2400, MU);
        const d = Math.hypot(...k.positionKm.map((x, i) => x - result.final.positionKm[i]));
        expect(d).toBeLessThan(1e-5);
      });
    });
  }
});
