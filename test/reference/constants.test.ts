/**
 * propagator/constants.ts against independent sources.
 * - astronomy-engine 2.1.19: its GM values (MassProduct, au^3/day^2) come from the JPL DE405 memorandum;
 *   its KM_PER_AU and C_AUDAY constants. Our GMs are DE440's, from memory: see the note above the GM checks.
 * - IAU 2009 system of astronomical constants ("current best estimates"; Luzum et al. 2011,
 *   Celestial Mechanics and Dynamical Astronomy 110:293): mass ratios, from memory.
 * - IERS Conventions (2010), Table 1.1: Earth's J2 (zero-tide system), from memory.
 */
import * as Astronomy from 'astronomy-engine';
import { describe, expect, it } from 'vitest';
import {
  GM_KM3_S2, J2_EARTH, KM_PER_AU, RADIUS_KM, SPEED_OF_LIGHT_KM_S,
} from '../../propagator/index.ts';
import type { BodyName } from '../../propagator/index.ts';

const AE_BODY: Record<BodyName, Astronomy.Body> = {
  sun: Astronomy.Body.Sun, mercury: Astronomy.Body.Mercury, venus: Astronomy.Body.Venus, earth: Astronomy.Body.Earth,
  moon: Astronomy.Body.Moon, mars: Astronomy.Body.Mars, jupiter: Astronomy.Body.Jupiter, saturn: Astronomy.Body.Saturn,
  uranus: Astronomy.Body.Uranus, neptune: Astronomy.Body.Neptune,
};

/** astronomy-engine's GM converted to km^3/s^2 with its own au (the au its DE405 values are in). */
function astronomyEngineGm(body: BodyName): number {
  return (Astronomy.MassProduct(AE_BODY[body]) * Astronomy.KM_PER_AU ** 3) / 86400 ** 2;
}

/**
 * Our GMs are the DE440 values (Park et al. 2021, AJ 161:105, Table 8) WRITTEN FROM MEMORY: no source carrying
 * DE440's own digits is available to this test (no npm package ships them). The check below is against the
 * DE405 values astronomy-engine carries, so it can catch a wrong digit only down to the size of each body's
 * DE405→DE440 revision. Limits per body: about 3x the difference measured here on 2026-12-03 (relative):
 * Sun 1.8e-10, Mercury 9.6e-6, Venus 2.1e-8, Earth 6.6e-9, Moon 9.5e-8, Mars 1.4e-6, Jupiter 3.0e-8,
 * Saturn 1.1e-6, Uranus 1.3e-6, Neptune 1.0e-6. Digits below those limits are unverified (from memory).
 * (astronomy-engine's Mercury value is DE405's Mercury-system value; the Earth and Moon are their own.)
 */
const DE405_REVISION_LIMIT: Record<BodyName, number> = {
  sun: 6e-10, mercury: 3e-5, venus: 7e-8, earth: 2e-8, moon: 3e-7, mars: 5e-6, jupiter: 1e-7, saturn: 4e-6,
  uranus: 4e-6, neptune: 3e-6,
};

describe('gravitational parameters', () => {
  describe('when compared with astronomy-engine (DE405 values), per-body limits ~3x the revision measured', () => {
    for (const body of Object.keys(AE_BODY) as BodyName[]) {
      it(`should agree for ${body} within ${DE405_REVISION_LIMIT[body]} relative`, () => {
        const relative = Math.abs(GM_KM3_S2[body] - astronomyEngineGm(body)) / astronomyEngineGm(body);
        expect(relative).toBeLessThan(DE405_REVISION_LIMIT[body]);
      });
    }
  });
  describe('when forming mass ratios (IAU 2009 current best estimates, from memory)', () => {
    it('should give GM_sun / GM_earth = 332946.0487 ± 0.0007', () => {
      expect(Math.abs(GM_KM3_S2.sun / GM_KM3_S2.earth - 332946.0487)).toBeLessThan(0.0007 * 2);
    });
    it('should give the Earth/Moon mass ratio 81.30056894 within 1e-6', () => {
      expect(Math.abs(GM_KM3_S2.earth / GM_KM3_S2.moon - 81.30056894)).toBeLessThan(1e-6);
    });
  });
});

describe('distance and speed constants', () => {
  describe('when compared with astronomy-engine', () => {
    it('should have the IAU 2012 au within 10 m of astronomy-engine\'s older DE405-era au', () => {
      expect(KM_PER_AU).toBe(149597870.7);
      expect(Math.abs(KM_PER_AU - Astronomy.KM_PER_AU)).toBeLessThan(0.01);
    });
    it('should reproduce its speed of light in au/day', () => {
      expect((Astronomy.C_AUDAY * Astronomy.KM_PER_AU) / 86400).toBeCloseTo(SPEED_OF_LIGHT_KM_S, 6);
    });
    it('should share its Jupiter equatorial radius (IAU WGCCRE 2015: 71,492 km)', () => {
      expect(RADIUS_KM.jupiter).toBe(Astronomy.JUPITER_EQUATORIAL_RADIUS_KM);
    });
  });
});

describe("Earth's J2", () => {
  describe('when compared with IERS Conventions (2010) Table 1.1, J2 = 1.0826359e-3 (zero-tide)', () => {
    it('should agree within 2e-8 (the permanent-tide convention alone moves J2 by ~9e-9)', () => {
      expect(Math.abs(J2_EARTH - 1.0826359e-3)).toBeLessThan(2e-8);
    });
  });
});
