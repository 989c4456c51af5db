/** Δv axes conversions of planner/maneuver-math (the rocket equation is checked in test/reference). */
import { describe, expect, it } from 'vitest';
import {
  deltaVFromInertialKmS, deltaVInAllAxes, deltaVToInertialKmS,
} from '../../planner/maneuver-math.ts';
import { axesToInertialMatrix, type Vec3 } from '../../propagator/index.ts';

describe('Δv axes', () => {
  describe('when the orbit is circular in the xy plane at the +x point', () => {
    // By construction (common practice definitions): R = x̂, T = ŷ, N = ẑ; V = ŷ, N = ẑ, B = V × N = x̂.
    const r: Vec3 = [7000, 0, 0];
    const v: Vec3 = [0, 7.546, 0];

    it('should express a along-track inertial Δv as pure T (RTN) and pure V (VNB)', () => {
      const all = deltaVInAllAxes([0, 0.01, 0], r, v);
      expect(all.rtnKmS).toEqual([0, 0.01, 0]);
      expect(all.vnbKmS).toEqual([0.01, 0, 0]);
      expect(all.magnitudeMS).toBeCloseTo(10, 12);
    });

    it('should map a radial Δv to B in VNB', () => {
      expect(deltaVFromInertialKmS([0.001, 0, 0], 'VNB', r, v)).toEqual([0, 0, 0.001]);
    });
  });

  describe('when the state is general', () => {
    const r: Vec3 = [-4200, 5100, 1800];
    const v: Vec3 = [-4.1, -3.2, 5.0];
    const dv: Vec3 = [0.003, -0.007, 0.0025];

    for (const axes of ['inertial', 'RTN', 'VNB'] as const) {
      it(`should round-trip through ${axes} and keep the magnitude`, () => {
        const local = deltaVFromInertialKmS(dv, axes, r, v);
        const back = deltaVToInertialKmS(local, axes, r, v);
        back.forEach((x, i) => expect(x).toBeCloseTo(dv[i], 15));
        expect(Math.hypot(...local)).toBeCloseTo(Math.hypot(...dv), 15);
      });

      it(`should give the ${axes} → inertial matrix consistent with the conversion`, () => {
        const m = axesToInertialMatrix(axes, r, v);
        const local: Vec3 = [0.01, -0.02, 0.005];
        const viaMatrix = m.map((row) => row[0] * local[0] + row[1] * local[1] + row[2] * local[2]);
        const direct = deltaVToInertialKmS(local, axes, r, v);
        viaMatrix.forEach((x, i) => expect(x).toBeCloseTo(direct[i], 15));
      });
    }
  });

  describe('when the Δv is not three finite numbers', () => {
    it('should name the field', () => {
      expect(() => deltaVToInertialKmS([1, Number.NaN, 0], 'RTN', [7000, 0, 0], [0, 7.5, 0])).toThrow(/^deltaVKmS:/);
    });
  });
});
