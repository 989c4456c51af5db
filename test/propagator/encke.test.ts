import { describe, expect, it } from 'vitest';
import {
  buildChebyshevEphemeris, createBuiltinEphemeris, GM_KM3_S2, keplerPropagate, keplerStm, propagate, type PropagationRequest,
} from '../../propagator/index.ts';

const MU = GM_KM3_S2.earth;
const T0 = 8.0e8;
// Chebyshev cache of the built-in source: the same physics, far cheaper look-ups.
const ephemeris = buildChebyshevEphemeris(createBuiltinEphemeris(), { bodies: ['earth', 'moon', 'sun'], startTdbS: T0 - 86400, endTdbS: T0 + 2 * 86400 });
const R0: [number, number, number] = [7000, -1200, 800];
const V0: [number, number, number] = [1.1, 7.2, 2.3];
const dist = (a: readonly number[], b: readonly number[]) => Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);

function request(extra: Partial<PropagationRequest>): PropagationRequest {
  return {
    initial: { epochTdbS: T0, centre: 'earth', frame: 'J2000_EQUATORIAL', positionKm: R0, velocityKmS: V0 },
    endEpochTdbS: T0 + 86400, forces: { centralBody: 'earth', perturbingBodies: [] }, ephemeris,
    relativeTolerance: 1e-12, absoluteTolerance: 1e-10, ...extra,
  };
}

describe("Encke's method", () => {
  describe('when there is no perturbation', () => {
    it('should follow the Kepler solution to round-off in very few steps', () => {
      const r = propagate(request({ method: 'encke' }));
      const k = keplerPropagate(R0, V0, 86400, MU);
      expect(dist(r.final.positionKm, k.positionKm)).toBeLessThan(1e-8);
      // Steps only grow from the first trial step (1e-3 of the orbit's time scale), ×6 at most per step.
      expect(r.stats.acceptedSteps).toBeLessThan(15);
      expect(r.stats.rectifications).toBe(0);
    });
    it('should report the method used: encke when asked, cowell by default', () => {
      expect(propagate(request({ method: 'encke', endEpochTdbS: T0 + 600 })).methodUsed).toBe('encke');
      expect(propagate(request({ endEpochTdbS: T0 + 600 })).methodUsed).toBe('cowell');
    });
  });

  describe('when the Earth J2, the Moon and the Sun perturb a low orbit for a day', () => {
    const forces = { centralBody: 'earth' as const, perturbingBodies: ['moon' as const, 'sun' as const], centralJ2: true };
    const cowell = propagate(request({ forces, relativeTolerance: 1e-13, absoluteTolerance: 1e-12 }));
    const encke = propagate(request({ forces, method: 'encke' }));
    it('should agree with a tight Cowell run to 1 m', () => {
      expect(dist(encke.final.positionKm, cowell.final.positionKm)).toBeLessThan(1e-3);
    });
    it('should rectify its reference conic and count it', () => {
      // J2 drives |δ|/|r| past 1e-2 within a day on a 7000-km orbit.
      expect(encke.stats.rectifications).toBeGreaterThan(0);
    });
  });

  describe('when propagating backward in time', () => {
    it('should agree with backward Cowell', () => {
      const forces = { centralBody: 'earth' as const, perturbingBodies: ['moon' as const, 'sun' as const], centralJ2: true };
      const c = propagate(request({ forces, endEpochTdbS: T0 - 43200, relativeTolerance: 1e-13, absoluteTolerance: 1e-12 }));
      const e = propagate(request({ forces, endEpochTdbS: T0 - 43200, method: 'encke' }));
      expect(e.outcome).toBe('finished');
      expect(dist(e.final.positionKm, c.final.positionKm)).toBeLessThan(1e-3);
    });
  });

  describe('when a burn happens during the run', () => {
    it('should agree with Cowell through the burn', () => {
      const burns = [{ epochTdbS: T0 + 3000, deltaVKmS: [0.05, -0.02, 0.01] as [number, number, number] }];
      const forces = { centralBody: 'earth' as const, perturbingBodies: ['moon' as const] };
      const c = propagate(request({ forces, burns, relativeTolerance: 1e-13, absoluteTolerance: 1e-12 }));
      const e = propagate(request({ forces, burns, method: 'encke' }));
      expect(dist(e.final.positionKm, c.final.positionKm)).toBeLessThan(1e-3);
    });
  });

  describe('when the STM is requested', () => {
    it('should match the analytic two-body STM for an unperturbed orbit', () => {
      const r = propagate(request({ method: 'encke', withStm: true, endEpochTdbS: T0 + 20000 }));
      const analytic = keplerStm(R0, V0, 20000, MU).stm;
      const scale = Math.max(...analytic.map(Math.abs));
      for (let k = 0; k < 36; k++) expect(Math.abs(r.stm![k] - analytic[k]) / scale, `Φ[${k}]`).toBeLessThan(1e-8);
    });
    it('should match the Cowell STM under perturbations', () => {
      const forces = { centralBody: 'earth' as const, perturbingBodies: ['moon' as const, 'sun' as const], centralJ2: true };
      const c = propagate(request({ forces, withStm: true, relativeTolerance: 1e-13, absoluteTolerance: 1e-12 }));
      const e = propagate(request({ forces, withStm: true, method: 'encke' }));
      const scale = Math.max(...c.stm!.map(Math.abs));
      for (let k = 0; k < 36; k++) expect(Math.abs(e.stm![k] - c.stm![k]) / scale, `Φ[${k}]`).toBeLessThan(1e-6);
    });
  });

  describe('when the STM is requested with a burn', () => {
    it('should give the burn sensitivity d(final)/d(Δv) of Cowell', () => {
      const burns = [{ epochTdbS: T0 + 3000, deltaVKmS: [0.05, -0.02, 0.01] as [number, number, number] }];
      const forces = { centralBody: 'earth' as const, perturbingBodies: ['moon' as const] };
      const end = T0 + 20000;
      const c = propagate(request({ forces, burns, withStm: true, endEpochTdbS: end, relativeTolerance: 1e-13, absoluteTolerance: 1e-12 }));
      const e = propagate(request({ forces, burns, withStm: true, endEpochTdbS: end, method: 'encke' }));
      const sc = c.burnSensitivities![0];
      const scale = Math.max(...sc.map(Math.abs));
      for (let k = 0; k < 18; k++) expect(Math.abs(e.burnSensitivities![0][k] - sc[k]) / scale, `S[${k}]`).toBeLessThan(1e-6);
    });
  });

  describe('when the reference orbit is degenerate', () => {
    it('should fall back to Cowell for a near-parabolic start and say so in warnings', () => {
      const vEsc = Math.sqrt((2 * MU) / Math.hypot(...R0));
      const v = V0.map((x) => (x / Math.hypot(...V0)) * vEsc * (1 + 1e-9)) as [number, number, number];
      const initial = { epochTdbS: T0, centre: 'earth' as const, frame: 'J2000_EQUATORIAL' as const, positionKm: R0, velocityKmS: v };
      const e = propagate(request({ initial, method: 'encke', endEpochTdbS: T0 + 3600 }));
      const c = propagate(request({ initial, endEpochTdbS: T0 + 3600 }));
      expect(e.warnings.join(' ')).toMatch(/fell back to 'cowell': near-parabolic/);
      expect(e.methodUsed).toBe('cowell');
      expect(e.final.positionKm).toEqual(c.final.positionKm);
    });
    it('should fall back for zero angular momentum (radial motion)', () => {
      const initial = { epochTdbS: T0, centre: 'earth' as const, frame: 'J2000_EQUATORIAL' as const,
        positionKm: R0, velocityKmS: R0.map((x) => x / 2000) as [number, number, number] };
      const e = propagate(request({ initial, method: 'encke', endEpochTdbS: T0 + 600 }));
      expect(e.warnings.join(' ')).toMatch(/zero angular momentum/);
      expect(e.methodUsed).toBe('cowell');
      expect(e.outcome).toBe('finished');
    });
  });
});
