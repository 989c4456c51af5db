/**
 * The moving centre (forces/moving-centre.ts, switching/moving-centre-dynamics.ts): a run about Mars that
 * keeps the heliocentric equations. Checks: the reference body is validated with its field named; a
 * re-anchoring is an exact change of coordinate (the read-out state does not move); and a Mars-centred run
 * with the Sun as reference body follows a heliocentric run of the same state (Encke, tight tolerance) far
 * more closely than the plain Mars-centred run does when Mars does not move as Newtonian gravity says.
 * Sources: exact algebra of the change of coordinate (common practice: Encke's rectification is the same
 * kind of restart); expectations measured on this machine, limits a few times above (numbers in brackets).
 */
import { describe, expect, it } from 'vitest';
import {
  changeCentre, createCowellDynamics, ForceModel, GM_KM3_S2, InvalidInputError, MEAN_SEMI_MAJOR_AXIS_KM, propagate,
  type ForceModelSpec, type PropagationDynamics, type StateVector,
} from '../../propagator/index.ts';
import { createEnckeOrFallback } from '../../propagator/encke/index.ts';
import { MOVING_CENTRE_DEFAULTS, MovingCentreDynamics } from '../../propagator/switching/index.ts';
import { circularEphemeris } from './forces-test-ephemeris.ts';

const T0 = 9.5e8;
const A_KM = MEAN_SEMI_MAJOR_AXIS_KM.mars!;
// Mars on a circle 1 % faster than the Sun–Mars two-body period: 2 % away from Newtonian motion.
const ephemeris = circularEphemeris([{
  body: 'mars', radiusKm: A_KM, phaseRad: 0.3, phaseEpochTdbS: T0,
  periodS: 0.99 * 2 * Math.PI * Math.sqrt(A_KM ** 3 / (GM_KM3_S2.sun + GM_KM3_S2.mars)),
}]);
const aboutMars: ForceModelSpec = { centralBody: 'mars', perturbingBodies: ['sun'], referenceBody: 'sun' };
const orbiter: StateVector = {
  epochTdbS: T0, centre: 'mars', frame: 'J2000_EQUATORIAL', positionKm: [6000, 0, 1000], velocityKmS: [0, 2.6, 0.5],
};
const cartesian = (d: PropagationDynamics, t: number, y: Float64Array): number[] => {
  const out = new Float64Array(6);
  d.cartesianInto(t, y, out);
  return [...out];
};

describe('moving centre', () => {
  describe('when the reference body is neither the centre nor a perturbing body', () => {
    it('should refuse the force model naming forces.referenceBody', () => {
      const bad = () => new ForceModel({ centralBody: 'mars', perturbingBodies: ['sun'], referenceBody: 'earth' }, ephemeris);
      expect(bad).toThrow(InvalidInputError);
      expect(bad).toThrow(expect.objectContaining({ field: 'forces.referenceBody' }));
    });
  });

  describe('when the offset from the cubic has grown past its threshold', () => {
    const builds: Record<string, (f: ForceModel, s: number[]) => PropagationDynamics> = {
      cowell: (f, s) => createCowellDynamics(f, s, true),
      encke: (f, s) => createEnckeOrFallback({ startTdbS: T0, relativeTolerance: 1e-12, absoluteTolerance: 1e-12, withStm: true },
        f, s, createCowellDynamics),
    };
    for (const [method, build] of Object.entries(builds)) {
      it(`should re-anchor without moving the state read out (${method})`, () => {
        const forces = new ForceModel(aboutMars, ephemeris);
        forces.anchorMovingCentre(T0);
        const dynamics = new MovingCentreDynamics(build(forces, [...orbiter.positionKm, ...orbiter.velocityKmS]));
        const y = Float64Array.from(dynamics.initialY);
        const t1 = T0 + 2 * 86400; // the same y read two days on: Mars's offset from the cubic is ~900 km
        // Encke's own clock (last component) must agree with the epoch the vector is read at.
        if (method === 'encke') y[y.length - 1] = t1 - T0;
        const before = cartesian(dynamics, t1, y);
        expect(dynamics.maybeRectify(t1, y)).toBe(true);
        expect(dynamics.reanchors).toBe(1);
        const after = cartesian(dynamics, t1, y);        // [0 and 0: the read-out before and the shift after form the same differences; the limits allow
        // a rounding of the 1e4 km state]
        expect(Math.hypot(...after.slice(0, 3).map((x, i) => x - before[i]))).toBeLessThan(1e-11);
        expect(Math.hypot(...after.slice(3).map((x, i) => x - before[3 + i]))).toBeLessThan(1e-14);
        // Cowell holds Φ itself (still I: nothing was integrated); Encke folds Φ at its restart (tested there).
        if (method === 'cowell') for (let k = 0; k < 36; k++) expect(y[6 + k], `Φ[${k}]`).toBe(k % 7 === 0 ? 1 : 0);
        expect(dynamics.maybeRectify(t1, y)).toBe(false);
        expect(MOVING_CENTRE_DEFAULTS.reanchorRatio).toBe(1e-3);
      });
    }
  });

  describe('when an orbiter of Mars is flown for two days', () => {
    it('should follow the heliocentric run, which the plain Mars-centred run does not', () => {
      const end = T0 + 2 * 86400;
      const tol = { relativeTolerance: 1e-12, absoluteTolerance: 1e-12 };
      const moving = propagate({ initial: orbiter, endEpochTdbS: end, ephemeris, forces: aboutMars, ...tol });
      const plain = propagate({ initial: orbiter, endEpochTdbS: end, ephemeris, forces: { ...aboutMars, referenceBody: undefined }, ...tol });
      const helio = propagate({ initial: orbiter, endEpochTdbS: end, ephemeris, method: 'encke',
        forces: { centralBody: 'sun', perturbingBodies: ['mars'] }, relativeTolerance: 1e-14, absoluteTolerance: 1e-14 });
      const reference = changeCentre(helio.final, 'mars', ephemeris);
      const miss = (s: StateVector) => Math.hypot(...s.positionKm.map((x, i) => x - reference.positionKm[i]));
      // [moving 1.0e-3 km; plain 113 km]
      expect(miss(moving.final)).toBeLessThan(5e-3);
      expect(miss(plain.final)).toBeGreaterThan(100);
    });
  });
});
