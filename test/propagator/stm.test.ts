import { describe, expect, it } from 'vitest';
import { propagate } from '../../propagator/run/propagate.ts';
import { keplerStm } from '../../propagator/kepler/index.ts';
import { GM_KM3_S2 } from '../../propagator/constants.ts';
import type { ForceModelSpec, VelocityImpulse, PropagationRequest } from '../../propagator/run/propagation-types.ts';
import type { Vec3 } from '../../propagator/types.ts';
import { circularEphemeris } from './forces-test-ephemeris.ts';

const AU = 149597870.7;
const YEAR = 3.15581e7;
const ephemeris = circularEphemeris([
  { body: 'earth', radiusKm: AU, periodS: YEAR },
  { body: 'moon', radiusKm: AU + 384400, periodS: YEAR, phaseRad: 0 },
], { startTdbS: 0, endTdbS: 1e9 });
const T0 = 2e8;
const DURATION = 30000;
const x0 = [8000, 1500, 2000, -1.2, 6.4, 2.1];
const perturbed: ForceModelSpec = { centralBody: 'earth', perturbingBodies: ['sun', 'moon'], centralJ2: true };

function run(state: number[], forces: ForceModelSpec, burns: VelocityImpulse[] = [], tolerance = 1e-13, duration = DURATION) {
  const request: PropagationRequest = {
    initial: { epochTdbS: T0, centre: 'earth', frame: 'J2000_EQUATORIAL', positionKm: state.slice(0, 3) as Vec3, velocityKmS: state.slice(3) as Vec3 },
    endEpochTdbS: T0 + duration, forces, ephemeris, burns, withStm: true,
    relativeTolerance: tolerance, absoluteTolerance: tolerance,
  };
  const result = propagate(request);
  expect(result.outcome).toBe('finished');
  return result;
}
const finalOf = (r: ReturnType<typeof run>): number[] => [...r.final.positionKm, ...r.final.velocityKmS];

/** Central differences of the final state w.r.t. the initial state (steps 0.1 km, 1e-4 km/s: large enough that
 * integration noise (~1e-9 km) divided by the step stays below 1e-7, small enough that the truncation
 * error (step/|r|)^2 ~ 1e-10 is negligible). */
function finiteDifferenceStm(forces: ForceModelSpec, burns: VelocityImpulse[] = []): number[] {
  const stm = new Array<number>(36).fill(0);
  for (let j = 0; j < 6; j++) {
    const h = j < 3 ? 1e-1 : 1e-4;
    const plus = [...x0];
    const minus = [...x0];
    plus[j] += h;
    minus[j] -= h;
    const fp = finalOf(run(plus, forces, burns));
    const fm = finalOf(run(minus, forces, burns));
    for (let i = 0; i < 6; i++) stm[6 * i + j] = (fp[i] - fm[i]) / (2 * h);
  }
  return stm;
}

/** Largest element-wise difference, relative to the largest element of the same 3x3 block of `b`. */
function blockRelativeError(a: number[], b: number[], columns = 6): number {
  let worst = 0;
  const rows = a.length / columns;
  for (let i = 0; i < rows; i++) {
    for (let j = 0; j < columns; j++) {
      let scale = 0;
      const bi = Math.floor(i / 3) * 3;
      const bj = Math.floor(j / 3) * 3;
      for (let p = bi; p < bi + 3; p++) for (let q = bj; q < bj + 3; q++) scale = Math.max(scale, Math.abs(b[columns * p + q]));
      worst = Math.max(worst, Math.abs(a[columns * i + j] - b[columns * i + j]) / scale);
    }
  }
  return worst;
}

describe('state transition matrix (variational equations)', () => {
  describe('when the force model has J2, the Sun and the Moon', () => {
    it('should agree with central finite differences of the propagation to ~1e-6 relative', () => {
      const stm = run(x0, perturbed).stm!;
      const fd = finiteDifferenceStm(perturbed);
      expect(blockRelativeError(stm, fd)).toBeLessThan(1e-6);
    });

    it('should be symplectic (Φᵀ J Φ = J) for this conservative model', () => {
      const phi = run(x0, perturbed).stm!;
      // J = [[0, I], [-I, 0]]; (ΦᵀJΦ)_ij = Σ_k Φ_ki (JΦ)_kj.
      const jPhi = (k: number, j: number): number => (k < 3 ? phi[6 * (k + 3) + j] : -phi[6 * (k - 3) + j]);
      let worst = 0;
      let scale = 0;
      for (let i = 0; i < 36; i++) scale = Math.max(scale, Math.abs(phi[i]));
      for (let i = 0; i < 6; i++) {
        for (let j = 0; j < 6; j++) {
          let sum = 0;
          for (let k = 0; k < 6; k++) sum += phi[6 * k + i] * jPhi(k, j);
          const expected = j === i + 3 ? 1 : i === j + 3 ? -1 : 0;
          worst = Math.max(worst, Math.abs(sum - expected));
        }
      }
      // Relative to |Φ|^2, the scale of the products summed (round-off and integration error).
      // Observed 5e-18: the deviation is at round-off level of the products.
      expect(worst / (scale * scale)).toBeLessThan(1e-15);
    });
  });

  describe('when the motion is pure two-body', () => {
    it('should match the analytic two-body STM from the universal-variable Kepler solution', () => {
      // Analytic STM: differentiation of the Lagrange-coefficient solution (Battin 1999, §9.7), as
      // implemented by keplerStm in propagator/kepler.
      const stm = run(x0, { centralBody: 'earth', perturbingBodies: [] }).stm!;
      const analytic = keplerStm(x0.slice(0, 3), x0.slice(3), DURATION, GM_KM3_S2.earth).stm;
      // Observed 3.6e-11.
      expect(blockRelativeError(stm, analytic)).toBeLessThan(1e-9);
    });
  });

  describe('when an impulsive burn lies inside the span', () => {
    const burns: VelocityImpulse[] = [{ epochTdbS: T0 + 11000, deltaVKmS: [0.02, -0.01, 0.005] }];
    it('should carry the STM through the burn (finite differences)', () => {
      const stm = run(x0, perturbed, burns).stm!;
      expect(blockRelativeError(stm, finiteDifferenceStm(perturbed, burns))).toBeLessThan(1e-6);
    });
    for (const [label, duration, burnList] of [
      ['forward', DURATION, burns],
      ['backward', -DURATION, [{ ...burns[0], epochTdbS: T0 - 11000 }]],
    ] as const) it(`should give d(final)/d(Δv) matching finite differences in Δv (${label})`, () => {
      const sensitivity = run(x0, perturbed, [...burnList], 1e-13, duration).burnSensitivities![0];
      const fd = new Array<number>(18).fill(0);
      for (let j = 0; j < 3; j++) {
        const h = 1e-4;
        const dvPlus = [...burnList[0].deltaVKmS] as Vec3;
        const dvMinus = [...burnList[0].deltaVKmS] as Vec3;
        dvPlus[j] += h;
        dvMinus[j] -= h;
        const fp = finalOf(run(x0, perturbed, [{ ...burnList[0], deltaVKmS: dvPlus }], 1e-13, duration));
        const fm = finalOf(run(x0, perturbed, [{ ...burnList[0], deltaVKmS: dvMinus }], 1e-13, duration));
        for (let i = 0; i < 6; i++) fd[3 * i + j] = (fp[i] - fm[i]) / (2 * h);
      }
      expect(blockRelativeError(sensitivity, fd, 3)).toBeLessThan(1e-6);
    });
  });
});
