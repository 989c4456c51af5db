import { describe, expect, it } from 'vitest';
import { InvalidInputError } from '../../contract/errors.ts';
import {
  conicToState, keplerPropagate, keplerSolve, stateToConic, stumpff, type ConicElements,
} from '../../propagator/kepler/index.ts';

const MU = 398600.4418;
type V = readonly number[];
const dist = (a: V, b: V) => Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);
const cross = (a: V, b: V) => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];

/** Independent propagation by the classical anomalies (Kepler's equation in E or H, solved by Newton). */
function classical(el: ConicElements, dtS: number): ReturnType<typeof conicToState> {
  const e = el.eccentricity;
  const a = el.semiMajorAxisKm;
  const nu = el.trueAnomalyRad;
  const n = Math.sqrt(MU / Math.abs(a) ** 3);
  let nu1: number;
  if (e < 1) {
    const E0 = 2 * Math.atan(Math.sqrt((1 - e) / (1 + e)) * Math.tan(nu / 2));
    const M = E0 - e * Math.sin(E0) + n * dtS;
    let E = M;
    for (let k = 0; k < 50; k++) E -= (E - e * Math.sin(E) - M) / (1 - e * Math.cos(E));
    nu1 = 2 * Math.atan(Math.sqrt((1 + e) / (1 - e)) * Math.tan(E / 2));
  } else {
    const H0 = 2 * Math.atanh(Math.sqrt((e - 1) / (e + 1)) * Math.tan(nu / 2));
    const M = e * Math.sinh(H0) - H0 + n * dtS;
    let H = Math.asinh(M / e);
    for (let k = 0; k < 80; k++) H -= (e * Math.sinh(H) - H - M) / (e * Math.cosh(H) - 1);
    nu1 = 2 * Math.atan(Math.sqrt((e + 1) / (e - 1)) * Math.tanh(H / 2));
  }
  return conicToState({ ...el, trueAnomalyRad: nu1 }, MU);
}

const cases: { name: string; el: ConicElements; dtS: number }[] = [
  { name: 'low eccentric ellipse', dtS: 5000,
    el: { semiLatusRectumKm: 7000 * (1 - 0.01 ** 2), semiMajorAxisKm: 7000, eccentricity: 0.01,
      inclinationRad: 0.9, raanRad: 1.2, argPeriapsisRad: 0.3, trueAnomalyRad: 2.0 } },
  { name: 'highly eccentric ellipse over several revolutions', dtS: 3.5 * 86400,
    el: { semiLatusRectumKm: 26600 * (1 - 0.74 ** 2), semiMajorAxisKm: 26600, eccentricity: 0.74,
      inclinationRad: 1.1, raanRad: 4.0, argPeriapsisRad: 4.7, trueAnomalyRad: 0.1 } },
  { name: 'hyperbola backwards in time', dtS: -2 * 86400,
    el: { semiLatusRectumKm: -20000 * (1 - 1.8 ** 2), semiMajorAxisKm: -20000, eccentricity: 1.8,
      inclinationRad: 0.4, raanRad: 0.5, argPeriapsisRad: 2.5, trueAnomalyRad: 0.7 } },
];

describe('universal-variable Kepler solver', () => {
  describe('when compared with the classical anomaly solution', () => {
    for (const c of cases) {
      it(`should agree for a ${c.name}`, () => {
        const s0 = conicToState(c.el, MU);
        const got = keplerPropagate(s0.positionKm, s0.velocityKmS, c.dtS, MU);
        const ref = classical(c.el, c.dtS);
        const scale = Math.hypot(...ref.positionKm);
        expect(dist(got.positionKm, ref.positionKm) / scale).toBeLessThan(1e-11);
        expect(dist(got.velocityKmS, ref.velocityKmS) / Math.hypot(...ref.velocityKmS)).toBeLessThan(1e-10);
      });
    }
  });

  describe('when the orbit is parabolic or within 1e-9 of parabolic', () => {
    it('should be continuous across e = 1 and conserve energy and angular momentum', () => {
      const rp = 7000;
      const vEsc = Math.sqrt((2 * MU) / rp);
      const results = [1 - 1e-9, 1, 1 + 1e-9].map((k) => keplerPropagate([rp, 0, 0], [0, vEsc * k, 0], 20000, MU));
      // Velocity changes of 1e-9 relative move the 20000-s point by ~1e-9·(r/rp)·r: well under 1 m.
      expect(dist(results[0].positionKm, results[1].positionKm)).toBeLessThan(1e-3);
      expect(dist(results[2].positionKm, results[1].positionKm)).toBeLessThan(1e-3);
      const { positionKm: r, velocityKmS: v } = results[1];
      const energy = (v[0] ** 2 + v[1] ** 2 + v[2] ** 2) / 2 - MU / Math.hypot(...r);
      expect(Math.abs(energy)).toBeLessThan(1e-12 * MU / rp);
      const h = cross(r, v);
      expect(Math.abs(Math.hypot(...h) - rp * vEsc) / (rp * vEsc)).toBeLessThan(1e-13);
    });
  });

  describe('when propagating forward and then back', () => {
    it('should return to the start for ellipse, parabola and hyperbola', () => {
      const starts = [[7000, 0, 0, 0, 7.2, 1], [7000, 0, 0, 0, Math.sqrt((2 * MU) / 7000), 0], [7000, 0, 0, 0, 11, 2]];
      for (const s of starts) {
        const f = keplerPropagate(s.slice(0, 3), s.slice(3), 30000, MU);
        const b = keplerPropagate(f.positionKm, f.velocityKmS, -30000, MU);
        expect(dist(b.positionKm, s.slice(0, 3))).toBeLessThan(1e-6);
      }
    });
    it('should return to the start after exactly one period', () => {
      const a = 9000;
      const period = 2 * Math.PI * Math.sqrt(a ** 3 / MU);
      const r0 = [a * 0.8, 100, -300];
      const speed = Math.sqrt(MU * (2 / Math.hypot(...r0) - 1 / a));
      const v0 = [0, speed * 0.6, speed * 0.8];
      const s = keplerSolve(r0, v0, period, MU);
      expect(dist(s.positionKm, r0)).toBeLessThan(1e-7);
    });
  });

  describe('when the input is bad', () => {
    it('should throw InvalidInputError naming the field', () => {
      expect(() => keplerPropagate([0, 0, 0], [1, 0, 0], 10, MU)).toThrow(InvalidInputError);
      expect(() => keplerPropagate([7000, 0, 0], [0, Number.NaN, 0], 10, MU)).toThrow(/v0KmS/);
      expect(() => keplerPropagate([7000, 0, 0], [0, 7, 0], 10, -1)).toThrow(/muKm3S2/);
    });
  });
});

describe('Stumpff functions', () => {
  describe('when the argument crosses the series/closed-form switch', () => {
    it('should be continuous to round-off', () => {
      for (const psi of [1, -1]) {
        const dPsi = 2e-12 * psi;
        const a = stumpff(psi * (1 - 1e-12));
        const b = stumpff(psi * (1 + 1e-12));
        // Remove the functions' own slope (dc2/dψ = c4 − c3/2, dc3/dψ = (3c5 − c4)/2) from the jump.
        expect(Math.abs(b.c2 - a.c2 - (a.c4 - a.c3 / 2) * dPsi)).toBeLessThan(2e-15);
        expect(Math.abs(b.c3 - a.c3 - ((3 * a.c5 - a.c4) / 2) * dPsi)).toBeLessThan(2e-15);
        expect(Math.abs(b.c5 - a.c5) / a.c5).toBeLessThan(1e-13);
      }
    });
    it('should match the closed forms c2 = (1 − cos√ψ)/ψ, c3 = (√ψ − sin√ψ)/√ψ³ at ψ = 0.5', () => {
      const x = Math.sqrt(0.5);
      const s = stumpff(0.5);
      expect(s.c2).toBeCloseTo((1 - Math.cos(x)) / 0.5, 15);
      expect(s.c3).toBeCloseTo((x - Math.sin(x)) / x ** 3, 14);
    });
  });
});

describe('conic elements', () => {
  describe('when converting to a state and back', () => {
    it('should recover every element for ellipses and hyperbolas', () => {
      for (const c of cases) {
        const s = conicToState(c.el, MU);
        const el = stateToConic(s.positionKm, s.velocityKmS, MU);
        expect(el.eccentricity).toBeCloseTo(c.el.eccentricity, 12);
        expect(el.semiMajorAxisKm / c.el.semiMajorAxisKm).toBeCloseTo(1, 11);
        expect(el.inclinationRad).toBeCloseTo(c.el.inclinationRad, 12);
        expect(el.raanRad).toBeCloseTo(c.el.raanRad, 12);
        expect(el.argPeriapsisRad).toBeCloseTo(c.el.argPeriapsisRad, 11);
        expect(el.trueAnomalyRad).toBeCloseTo(c.el.trueAnomalyRad, 11);
      }
    });
  });
  describe('when the orbit is circular and equatorial', () => {
    it('should put the whole angle in the true anomaly (true longitude)', () => {
      const v = Math.sqrt(MU / 7000);
      const el = stateToConic([0, 7000, 0], [-v, 0, 0], MU);
      expect(el.raanRad).toBe(0);
      expect(el.argPeriapsisRad).toBe(0);
      expect(el.trueAnomalyRad).toBeCloseTo(Math.PI / 2, 12);
    });
  });
  describe('when the angular momentum is zero', () => {
    it('should throw InvalidInputError', () => {
      expect(() => stateToConic([7000, 0, 0], [1, 0, 0], MU)).toThrow(/angular momentum is zero/);
    });
  });
});
