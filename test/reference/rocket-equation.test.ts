/**
 * Rocket equation and burn duration against hand-computed cases (arithmetic in the comments) and an
 * independent 40-digit evaluation with decimal.js (npm 10.6.0).
 * g0 = 9.80665 m/s² exactly: standard acceleration of gravity, 3rd CGPM (1901).
 */
import { Decimal } from 'decimal.js';
import { describe, expect, it } from 'vitest';
import {
  budgetBurns, burnDurationS, deltaVFromPropellantKmS, massFlowRateKgS, propellantMassKg,
} from '../../planner/maneuver-math.ts';

describe('rocket equation', () => {
  describe('when the burn Δv equals the exhaust velocity (mass ratio e)', () => {
    // Hand computation: Isp = 300 s → ve = 300 × 9.80665 = 2941.995 m/s. Δv = ve ⇒ m1 = m0/e, so
    // m_p = 1000 × (1 − 1/e) = 1000 × (1 − 0.36787944117) = 632.12055883 kg.
    // Thrust 400 N: ṁ = 400 / 2941.995 = 0.13596216173 kg/s; t = 632.12055883 / 0.13596216173 = 4649.2388087 s.
    it('should use 632.12055883 kg and burn 4649.2388087 s', () => {
      expect(propellantMassKg(2.941995, 1000, 300)).toBeCloseTo(632.12055883, 7);
      expect(massFlowRateKgS(400, 300)).toBeCloseTo(0.13596216173, 10);
      expect(burnDurationS(2.941995, 1000, 300, 400)).toBeCloseTo(4649.2388087, 6);
    });
  });

  describe('when a 100 m/s correction burn is made', () => {
    // Hand computation: x = Δv/ve = 100 / 2941.995 = 0.033990540433;
    // 1 − e^(−x) = x − x²/2 + x³/6 − x⁴/24 = 0.033990540433 − 0.000577678420 + 0.000006545184 − 0.000000055617
    // = 0.033419351580 (next term +3.8e-10 → 0.0334193519709 with it); m_p = 1000 × that = 33.41935197 kg;
    // t = 33.41935197 / 0.13596216173 = 245.79891600 s at 400 N.
    it('should use 33.41935197 kg and burn 245.798916 s', () => {
      expect(propellantMassKg(0.1, 1000, 300)).toBeCloseTo(33.41935197, 7);
      expect(burnDurationS(0.1, 1000, 300, 400)).toBeCloseTo(245.798916, 5);
    });

    it('should agree with a 40-digit decimal.js evaluation to 1e-12 relative', () => {
      Decimal.set({ precision: 40 });
      for (const [dvMS, m0, isp] of [[100, 1000, 300], [3.7, 812.5, 228], [1500, 2400, 321]] as const) {
        const ve = new Decimal(isp).times('9.80665');
        const reference = new Decimal(m0).times(new Decimal(1).minus(new Decimal(-dvMS).div(ve).exp())).toNumber();
        const ours = propellantMassKg(dvMS / 1000, m0, isp);
        expect(Math.abs(ours - reference) / reference).toBeLessThan(1e-12);
      }
    });

    it('should invert: Δv from the propellant used returns the burn', () => {
      const mp = propellantMassKg(0.1, 1000, 300);
      expect(deltaVFromPropellantKmS(mp, 1000, 300)).toBeCloseTo(0.1, 13);
    });
  });

  describe('when burns are executed in sequence', () => {
    // Two 100 m/s burns equal one 200 m/s burn in propellant (the rocket equation composes multiplicatively).
    it('should carry the mass from one burn to the next', () => {
      const [first, second] = budgetBurns([0.1, 0.1], 1000, 300, 400);
      expect(second.massBeforeKg).toBe(first.massAfterKg);
      expect(first.propellantKg + second.propellantKg).toBeCloseTo(propellantMassKg(0.2, 1000, 300), 9);
      expect(second.durationS).toBeLessThan(first.durationS);
    });
  });

  describe('when given bad input', () => {
    it('should name the field', () => {
      expect(() => propellantMassKg(-0.1, 1000, 300)).toThrow(/^deltaVKmS:/);
      expect(() => propellantMassKg(0.1, 0, 300)).toThrow(/^initialMassKg:/);
      expect(() => burnDurationS(0.1, 1000, 300, Number.NaN)).toThrow(/^thrustN:/);
      expect(() => deltaVFromPropellantKmS(1000, 1000, 300)).toThrow(/^propellantKg:/);
    });
  });
});
