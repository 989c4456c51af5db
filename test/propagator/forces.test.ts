import { describe, expect, it } from 'vitest';
import {
  addJ2, addPointMass, addSolarPressure, addThirdBody, battinF, ForceModel, SOLAR_PRESSURE_1AU_N_M2, solarPressureStrength,
} from '../../propagator/forces/index.ts';
import { GM_KM3_S2, J2_EARTH, J2_REFERENCE_RADIUS_EARTH_KM, KM_PER_AU } from '../../propagator/constants.ts';
import { InvalidInputError } from '../../contract/errors.ts';
import type { ForceModelSpec } from '../../propagator/run/propagation-types.ts';
import { circularEphemeris } from './forces-test-ephemeris.ts';

type Field = (r: number[], acc: Float64Array, partials: Float64Array | null) => void;

/** Max relative difference between the analytic gradient and central differences of the field. */
function gradientError(field: Field, r: number[], stepKm: number): number {
  const analytic = new Float64Array(9);
  field(r, new Float64Array(3), analytic);
  let worst = 0;
  const scale = Math.max(...Array.from(analytic, Math.abs));
  for (let j = 0; j < 3; j++) {
    const plus = new Float64Array(3);
    const minus = new Float64Array(3);
    const rp = [...r];
    const rm = [...r];
    rp[j] += stepKm;
    rm[j] -= stepKm;
    field(rp, plus, null);
    field(rm, minus, null);
    for (let i = 0; i < 3; i++) {
      const numeric = (plus[i] - minus[i]) / (2 * stepKm);
      worst = Math.max(worst, Math.abs(numeric - analytic[3 * i + j]) / scale);
    }
  }
  return worst;
}

const mu = GM_KM3_S2.earth;
const r0 = [7000, -1200, 3100];

describe('forces', () => {
  describe('when the analytic partials are compared with central finite differences', () => {
    it('should agree for the point mass', () => {
      const err = gradientError((r, a, p) => addPointMass(mu, r[0], r[1], r[2], a, p), r0, 1e-2);
      expect(err).toBeLessThan(1e-7);
    });
    it('should agree for a third body in f(q) form', () => {
      const s = [3.8e5, 1.1e5, -4e4];
      const err = gradientError((r, a, p) => addThirdBody(GM_KM3_S2.moon, r[0], r[1], r[2], s[0], s[1], s[2], a, p), r0, 1e-1);
      expect(err).toBeLessThan(1e-7);
    });
    it('should agree for J2', () => {
      const err = gradientError((r, a, p) => addJ2(mu, J2_EARTH, J2_REFERENCE_RADIUS_EARTH_KM, r[0], r[1], r[2], a, p), r0, 1e-2);
      expect(err).toBeLessThan(1e-7);
    });
    it('should agree for solar radiation pressure', () => {
      const sun = [-1.4e8, 3e7, 1.2e7];
      const k = solarPressureStrength(20, 1.3, 500);
      const err = gradientError((r, a, p) => { addSolarPressure(k, r[0], r[1], r[2], sun[0], sun[1], sun[2], 0, a, p); }, r0, 1);
      expect(err).toBeLessThan(1e-6);
    });
  });

  describe('when J2 is compared with the gradient of its potential', () => {
    // Perturbing potential R = -(mu J2 Re^2 / (2 r^3)) (3 z^2/r^2 - 1), a = grad R (Vallado, Fundamentals
    // of Astrodynamics and Applications, 4th ed., §8.7, standard zonal-harmonic form; from memory).
    const potential = (r: number[]): number => {
      const rr = Math.hypot(r[0], r[1], r[2]);
      return -(mu * J2_EARTH * J2_REFERENCE_RADIUS_EARTH_KM ** 2) / (2 * rr ** 3) * (3 * (r[2] / rr) ** 2 - 1);
    };
    it('should match the numerical gradient of the potential', () => {
      const acc = new Float64Array(3);
      addJ2(mu, J2_EARTH, J2_REFERENCE_RADIUS_EARTH_KM, r0[0], r0[1], r0[2], acc, null);
      for (let i = 0; i < 3; i++) {
        const h = 1e-2;
        const rp = [...r0];
        const rm = [...r0];
        rp[i] += h;
        rm[i] -= h;
        const numeric = (potential(rp) - potential(rm)) / (2 * h);
        expect(Math.abs(numeric - acc[i])).toBeLessThan(1e-8 * Math.hypot(...acc));
      }
    });
  });

  describe('when Battin\'s f(q) is compared with (1+q)^{3/2} - 1 at moderate q', () => {
    it('should agree to round-off', () => {
      for (const q of [-0.9, -0.5, -0.1, 0.3, 1, 5]) {
        expect(battinF(q)).toBeCloseTo((1 + q) ** 1.5 - 1, 13);
      }
    });
  });

  describe('when the third-body term is compared with the textbook direct+indirect difference', () => {
    it('should agree where the spacecraft is far from both bodies (no cancellation)', () => {
      const r = [2e5, -1e5, 5e4];
      const s = [3e5, 2e5, -1e5];
      const gm = GM_KM3_S2.moon;
      const acc = new Float64Array(3);
      addThirdBody(gm, r[0], r[1], r[2], s[0], s[1], s[2], acc, null);
      const d = r.map((v, i) => v - s[i]);
      const dn = Math.hypot(...d);
      const sn = Math.hypot(...s);
      for (let i = 0; i < 3; i++) {
        const direct = -gm * (d[i] / dn ** 3 + s[i] / sn ** 3);
        expect(Math.abs(acc[i] - direct)).toBeLessThan(1e-13 * Math.hypot(...acc));
      }
    });
  });

  describe('when solar radiation pressure is evaluated at 1 au', () => {
    it('should give the radiation pressure of the IAU 2015 B3 irradiance over c', () => {
      // Montenbruck & Gill, Satellite Orbits (2000), §3.4: P ≈ 4.56e-6 N/m^2 at 1 au with 1367 W/m^2 (from
      // memory); scaled to the IAU 2015 value 1361 W/m^2 it is 4.54e-6 N/m^2.
      expect(SOLAR_PRESSURE_1AU_N_M2).toBeCloseTo(4.56e-6 * (1361 / 1367), 8);
      const acc = new Float64Array(3);
      const k = solarPressureStrength(10, 1.5, 1000);
      addSolarPressure(k, KM_PER_AU, 0, 0, 0, 0, 0, 0, acc, null);
      // C_R P A/m = 1.5 * 4.54e-6 * 0.01 m/s^2, pointing away from the Sun, in km/s^2.
      expect(acc[0]).toBeCloseTo((1.5 * SOLAR_PRESSURE_1AU_N_M2 * 0.01) / 1000, 18);
      expect(acc[0]).toBeGreaterThan(0);
    });
    it('should vanish in the cylindrical shadow of the central body and not beside it', () => {
      const k = solarPressureStrength(10, 1.5, 1000);
      const sun = [KM_PER_AU, 0, 0];
      const dark = new Float64Array(3);
      expect(addSolarPressure(k, -7000, 100, 0, sun[0], sun[1], sun[2], 6378, dark, null)).toBe(false);
      expect(Math.hypot(...dark)).toBe(0);
      const lit = new Float64Array(3);
      expect(addSolarPressure(k, -7000, 7000, 0, sun[0], sun[1], sun[2], 6378, lit, null)).toBe(true);
      expect(Math.hypot(...lit)).toBeGreaterThan(0);
    });
  });

  describe('when a ForceModel combines the central body and perturbers', () => {
    const ephemeris = circularEphemeris([
      { body: 'earth', radiusKm: KM_PER_AU, periodS: 3.15581e7 },
      { body: 'moon', radiusKm: KM_PER_AU + 384400, periodS: 3.15581e7 },
      { body: 'jupiter', radiusKm: 5.2 * KM_PER_AU, periodS: 3.74e8, phaseRad: 1 },
    ]);
    it('should sum the terms and give a symmetric gradient', () => {
      const model = new ForceModel({ centralBody: 'earth', perturbingBodies: ['sun', 'moon', 'jupiter'], centralJ2: true }, ephemeris);
      const acc = new Float64Array(3);
      const partials = new Float64Array(9);
      model.accelerationInto(1e6, Float64Array.from([7000, 100, 200, 0, 7.5, 0]), acc, partials);
      const central = new Float64Array(3);
      addPointMass(mu, 7000, 100, 200, central, null);
      expect(Math.hypot(acc[0] - central[0], acc[1] - central[1], acc[2] - central[2]) / Math.hypot(...central))
        .toBeLessThan(2e-3);
      expect(partials[1]).toBeCloseTo(partials[3], 20);
      expect(partials[2]).toBeCloseTo(partials[6], 20);
      expect(model.evaluations).toBe(1);
    });
    it('should reject bad specs with InvalidInputError naming the field', () => {
      const bad: [ForceModelSpec, RegExp][] = [
        [{ centralBody: 'pluto' as never, perturbingBodies: [] }, /forces\.centralBody/],
        [{ centralBody: 'sun', perturbingBodies: ['mars'] }, /forces\.perturbingBodies\[0\].*does not provide/],
        [{ centralBody: 'sun', perturbingBodies: ['sun'] }, /central body/],
        [{ centralBody: 'sun', perturbingBodies: ['earth', 'earth'] }, /listed twice/],
        [{ centralBody: 'sun', perturbingBodies: [], centralJ2: true }, /forces\.centralJ2/],
        [{ centralBody: 'sun', perturbingBodies: [], gmOverridesKm3S2: { sun: -1 } }, /gmOverridesKm3S2\.sun/],
        [{ centralBody: 'sun', perturbingBodies: [], gmOverridesKm3S2: { sun: Number.NaN } }, /gmOverridesKm3S2\.sun/],
        [{ centralBody: 'sun', perturbingBodies: [], solarPressure: { areaM2: 1, reflectivityCoefficient: 1.2, massKg: 0 } }, /massKg/],
        [{ centralBody: 'sun', perturbingBodies: [], solarPressure: { areaM2: Number.POSITIVE_INFINITY, reflectivityCoefficient: 1.2, massKg: 1 } }, /areaM2/],
        [{ centralBody: 'sun', perturbingBodies: [], solarPressure: { areaM2: 1, reflectivityCoefficient: 3, massKg: 1 } }, /reflectivityCoefficient/],
      ];
      for (const [spec, pattern] of bad) {
        expect(() => new ForceModel(spec, ephemeris)).toThrow(InvalidInputError);
        expect(() => new ForceModel(spec, ephemeris)).toThrow(pattern);
      }
    });
  });
});
