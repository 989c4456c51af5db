/**
 * The demo problems in examples/ (built with the Lambert solver by examples/build-flyby-demo.ts): they
 * parse, they are what the build script makes, and they pose the problems the README says they pose.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { buildFlybyDemo, buildTwoBodyDemo } from '../../examples/build-flyby-demo.ts';
import { parseProblem, problemEpochs, solveLambert } from '../../planner/index.ts';
import {
  GM_KM3_S2, RADIUS_KM, computeBPlane, createBuiltinEphemeris, inertialToLocal, propagate, type Vec3,
} from '../../propagator/index.ts';

const read = (name: string): unknown => JSON.parse(readFileSync(new URL(`../../examples/${name}`, import.meta.url), 'utf8'));
const eph = createBuiltinEphemeris();

describe('demo problems', () => {
  describe('when the committed files are parsed', () => {
    it('should accept both with parseProblem', () => {
      expect(parseProblem(read('flyby-demo.json')).spacecraft.name).toBe('Saltmarsh');
      expect(parseProblem(read('two-body-demo.json')).spacecraft.name).toBe('Pipit');
    });
  });

  describe('when the build script runs again', () => {
    it('should reproduce the committed files exactly (run `npm run examples:build` after changing it)', () => {
      expect(JSON.parse(JSON.stringify(buildFlybyDemo(eph).problem))).toEqual(read('flyby-demo.json'));
      expect(JSON.parse(JSON.stringify(buildTwoBodyDemo(eph).problem))).toEqual(read('two-body-demo.json'));
    });
  });

  describe('when the two-body demo is solved by Lambert instead of the corrector', () => {
    it('should recover the known 25 m/s burn along V (VNB) to 1 mm/s', () => {
      const p = parseProblem(read('two-body-demo.json'));
      const e = problemEpochs(p);
      const target = p.targets[0];
      if (target.kind !== 'position') throw new Error('expected a position target');
      const atBurn = propagate({
        initial: { epochTdbS: e.initialTdbS, centre: 'earth', frame: 'J2000_EQUATORIAL', positionKm: p.initialState.positionKm, velocityKmS: p.initialState.velocityKmS },
        endEpochTdbS: e.burnTdbS[0], forces: { centralBody: 'earth', perturbingBodies: [] }, ephemeris: eph, relativeTolerance: 1e-13,
      }).final;
      const tof = (e.targetTdbS[0] ?? Number.NaN) - e.burnTdbS[0];
      const arc = solveLambert(atBurn.positionKm, target.positionKm, tof, GM_KM3_S2.earth, { direction: 'prograde' });
      const dv = arc.v1KmS.map((x, i) => x - atBurn.velocityKmS[i]) as Vec3;
      const vnb = inertialToLocal(dv, 'VNB', atBurn.positionKm, atBurn.velocityKmS);
      expect(arc.converged).toBe(true);
      expect(Math.abs(vnb[0] - 0.025)).toBeLessThan(1e-6);
      expect(Math.hypot(vnb[1], vnb[2])).toBeLessThan(1e-6);
    });
  });

  describe('when the flyby demo is flown without its correction burn', () => {
    it('should miss the B-plane aim point by thousands of km without hitting Mars', () => {
      const p = parseProblem(read('flyby-demo.json'));
      const e = problemEpochs(p);
      const aim = p.targets[0];
      if (aim.kind !== 'b-plane') throw new Error('expected a b-plane target');
      const final = propagate({
        initial: { epochTdbS: e.initialTdbS, centre: 'sun', frame: 'J2000_EQUATORIAL', positionKm: p.initialState.positionKm, velocityKmS: p.initialState.velocityKmS },
        endEpochTdbS: (e.targetTdbS[1] ?? Number.NaN) - 2 * 86400, forces: { centralBody: 'sun', perturbingBodies: p.forceModel.perturbingBodies },
        ephemeris: eph, relativeTolerance: 1e-11,
      }).final;
      const mars = new Float64Array(6);
      eph.stateInto('mars', 'sun', final.epochTdbS, mars, 0);
      const rel = [...final.positionKm, ...final.velocityKmS].map((x, i) => x - mars[i]);
      const b = computeBPlane(rel, GM_KM3_S2.mars, 'ecliptic');
      expect(Math.hypot(b.bDotTKm - aim.bDotTKm, b.bDotRKm - aim.bDotRKm)).toBeGreaterThan(3000);
      expect(b.periapsisRadiusKm).toBeGreaterThan(RADIUS_KM.mars + 1000);
    });
  });
});
