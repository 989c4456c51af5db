/**
 * Forces seen through whole propagations, against analytic results outside the code under test.
 */
import { describe, expect, it } from 'vitest';
import { propagate } from '../../propagator/run/propagate.ts';
import { keplerPropagate, stateToConic } from '../../propagator/kepler/index.ts';
import { GM_KM3_S2, J2_EARTH, J2_REFERENCE_RADIUS_EARTH_KM } from '../../propagator/constants.ts';
import { solarPressureStrength } from '../../propagator/forces/index.ts';
import type { Vec3 } from '../../propagator/types.ts';
import { circularEphemeris } from './forces-test-ephemeris.ts';

const AU = 149597870.7;
const ephemeris = circularEphemeris([{ body: 'earth', radiusKm: AU, periodS: 3.15581e7 }]);

describe('forces in propagation', () => {
  describe('when solar radiation pressure acts on a heliocentric spacecraft (no shadow, Sun central)', () => {
    it('should move it on the Kepler orbit of the reduced parameter mu - K (radial inverse-square push)', () => {
      // Analytic: a = -mu r/r^3 + K r/r^3 is Kepler motion with mu_eff = mu - K (common practice; e.g.
      // McInnes, Solar Sailing, 1999, §2.3 "lightness number" from memory).
      const srp = { areaM2: 400, reflectivityCoefficient: 1.8, massKg: 100, shadow: 'none' as const };
      const k = solarPressureStrength(srp.areaM2, srp.reflectivityCoefficient, srp.massKg);
      const r0: Vec3 = [1.1 * AU, 0.2 * AU, 0.01 * AU];
      const v0: Vec3 = [-5, 28, 1];
      const duration = 120 * 86400;
      const result = propagate({
        initial: { epochTdbS: 0, centre: 'sun', frame: 'J2000_EQUATORIAL', positionKm: r0, velocityKmS: v0 },
        endEpochTdbS: duration, forces: { centralBody: 'sun', perturbingBodies: [], solarPressure: srp }, ephemeris,
        relativeTolerance: 1e-13, absoluteTolerance: 1e-13,
      });
      const withSrp = keplerPropagate(r0, v0, duration, GM_KM3_S2.sun - k);
      const withoutSrp = keplerPropagate(r0, v0, duration, GM_KM3_S2.sun);
      const miss = Math.hypot(...result.final.positionKm.map((v, i) => v - withSrp.positionKm[i]));
      const srpEffect = Math.hypot(...withSrp.positionKm.map((v, i) => v - withoutSrp.positionKm[i]));
      expect(srpEffect).toBeGreaterThan(1000); // the push is large enough to matter
      // Observed: 3.5 mm miss against a 1.7 million km effect of the pressure.
      expect(miss).toBeLessThan(1e-8 * srpEffect);
      expect(miss).toBeLessThan(0.01);
    });
  });

  describe('when J2 acts on a low Earth orbit for 10 days', () => {
    it('should turn the node at the secular rate -3/2 n J2 (R/p)^2 cos i within 1%', () => {
      // Vallado, Fundamentals of Astrodynamics and Applications (4th ed.), §9.6, secular nodal rate
      // (from memory). Compared over whole revolutions so short-period terms largely cancel.
      const mu = GM_KM3_S2.earth;
      const a = 7000;
      const inc = (50 * Math.PI) / 180;
      const v = Math.sqrt(mu / a);
      const r0: Vec3 = [a, 0, 0];
      const v0: Vec3 = [0, v * Math.cos(inc), v * Math.sin(inc)];
      const n = Math.sqrt(mu / a ** 3);
      const revolutions = 150;
      const duration = (revolutions * 2 * Math.PI) / n;
      const result = propagate({
        initial: { epochTdbS: 0, centre: 'earth', frame: 'J2000_EQUATORIAL', positionKm: r0, velocityKmS: v0 },
        endEpochTdbS: duration, forces: { centralBody: 'earth', perturbingBodies: [], centralJ2: true }, ephemeris,
        relativeTolerance: 1e-11, absoluteTolerance: 1e-11,
      });
      expect(result.outcome).toBe('finished');
      const start = stateToConic(r0, v0, mu);
      const end = stateToConic(result.final.positionKm, result.final.velocityKmS, mu);
      let dRaan = end.raanRad - start.raanRad;
      if (dRaan > Math.PI) dRaan -= 2 * Math.PI;
      const expected = -1.5 * n * J2_EARTH * (J2_REFERENCE_RADIUS_EARTH_KM / a) ** 2 * Math.cos(inc) * duration;
      // Observed ratio 1.0044: osculating initial elements differ from mean ones by O(J2).
      expect(dRaan / expected).toBeGreaterThan(0.99);
      expect(dRaan / expected).toBeLessThan(1.01);
    });
  });
});
