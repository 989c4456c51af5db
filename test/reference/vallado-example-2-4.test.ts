/**
 * Vallado, "Fundamentals of Astrodynamics and Applications" (4th ed., 2013), Example 2-4 (KEPLER):
 * r0 = [1131.340, −2282.343, 6672.423] km, v0 = [−5.64305, 4.30333, 2.42879] km/s, Δt = 40 min,
 * μ = 398600.4418 km^3/s^2; printed r = [−4219.7527, 4363.0292, −3958.7666] km,
 * v = [3.689866, −1.916735, −6.112511] km/s. Values typed from memory; they reproduce to the printed digits.
 */
import { describe, expect, it } from 'vitest';
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
