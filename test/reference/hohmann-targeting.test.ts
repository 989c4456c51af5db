/**
 * Reference check of the targeter: given a two-body LEO → GEO problem with targets at the transfer's end,
 * it must recover the textbook Hohmann transfer.
 *
 * Source: D. A. Vallado, "Fundamentals of Astrodynamics and Applications", 4th ed., Example 6-1 (Hohmann
 * transfer LEO → GEO): altitudes 191.34411 km and 35781.34857 km over R⊕ = 6378.137 km, Δv_a = 2.457038 km/s,
 * Δv_b = 1.478187 km/s, Δv total = 3.935224 km/s, transfer time 315.4 min (values typed from memory; they
 * reproduce with the textbook formula Δv = √(2μ/r − μ/a_t) − ... at Vallado's μ = 398600.4418 km³/s²).
 * The project's μ (DE440, 398600.435507) changes the total by 3e-8 km/s, far below the 1 mm/s limit.
 */
import { describe, expect, it } from 'vitest';
import { formatEpoch, GM_KM3_S2, parseEpoch } from '../../propagator/index.ts';
import { parseProblem, planManeuvers } from '../../planner/index.ts';

const MU = GM_KM3_S2.earth;
const R_EARTH_VALLADO_KM = 6378.137;
const R1 = R_EARTH_VALLADO_KM + 191.34411;
const R2 = R_EARTH_VALLADO_KM + 35781.34857;
const A_T = (R1 + R2) / 2;
const TOF_S = Math.PI * Math.sqrt(A_T ** 3 / MU);
// Textbook formula (Vallado eq. 6-2/6-3; Curtis §6.2), evaluated at the project's μ.
const DV1 = Math.sqrt((2 * MU) / R1 - MU / A_T) - Math.sqrt(MU / R1);
const DV2 = Math.sqrt(MU / R2) - Math.sqrt((2 * MU) / R2 - MU / A_T);

function problem() {
  const t0 = parseEpoch('2026-03-01T00:00:00 TDB');
  const t2 = t0 + TOF_S;
  const coast = 3600;
  const n2 = Math.sqrt(MU / R2 ** 3);
  const theta = Math.PI + n2 * coast; // GEO circle, starting at the apoapsis of the transfer (−x axis)
  const v2 = Math.sqrt(MU / R2);
  const text = (t: number) => formatEpoch(t, 'TDB', 6);
  return parseProblem({
    title: 'Hohmann LEO to GEO (Vallado Example 6-1)',
    spacecraft: { name: 'Reference craft', massKg: 2000, engine: { ispS: 320, thrustN: 1e6 } },
    initialState: {
      epoch: text(t0), centre: 'earth', frame: 'J2000_EQUATORIAL',
      positionKm: [R1, 0, 0], velocityKmS: [0, Math.sqrt(MU / R1), 0],
    },
    endEpoch: text(t2 + coast + 60),
    forceModel: { centralBody: 'earth', relativeTolerance: 1e-12 },
    burns: [
      { label: 'perigee burn', epoch: text(t0), frame: 'VNB', deltaVGuessKmS: [2.3, 0, 0] },
      { label: 'apogee burn', epoch: text(t2), frame: 'VNB', deltaVGuessKmS: [1.3, 0, 0] },
    ],
    targets: [{
      kind: 'state', epoch: text(t2 + coast), centre: 'earth',
      positionKm: [R2 * Math.cos(theta), R2 * Math.sin(theta), 0],
      velocityKmS: [-v2 * Math.sin(theta), v2 * Math.cos(theta), 0],
      toleranceKm: 1e-5, velocityToleranceKmS: 1e-9,
    }],
    dispersion: { samples: 0, seed: 1 },
    corrector: { maxIterations: 30, maxStepKmS: 0.5, maxEpochStepS: 60 },
  });
}

describe('targeting a Hohmann transfer (two-body)', () => {
  describe('when the targets are the GEO state after the transfer', () => {
    it('should recover the textbook Hohmann Δv to < 1 mm/s (Vallado Example 6-1)', async () => {
      const plan = await planManeuvers(problem(), { monteCarlo: 'skip' });
      expect(plan.status).toBe('converged');
      expect(plan.burns).toHaveLength(2);
      const [b1, b2] = plan.burns;
      // Formula at the project's μ: < 1 mm/s.
      expect(Math.abs(b1.magnitudeMS / 1000 - DV1)).toBeLessThan(1e-6);
      expect(Math.abs(b2.magnitudeMS / 1000 - DV2)).toBeLessThan(1e-6);
      // Vallado's printed values (from memory), same < 1 mm/s limit.
      expect(Math.abs(b1.magnitudeMS / 1000 - 2.457038)).toBeLessThan(1e-6 + 5e-7);
      expect(Math.abs(b2.magnitudeMS / 1000 - 1.478187)).toBeLessThan(1e-6 + 5e-7);
      expect(Math.abs(plan.totalDeltaVMS / 1000 - 3.935224)).toBeLessThan(1e-6);
      // Tangential burns: all of the Δv along V in VNB.
      expect(Math.abs(b1.deltaVVnbKmS[1]) + Math.abs(b1.deltaVVnbKmS[2])).toBeLessThan(1e-6);
      expect(Math.abs(b2.deltaVVnbKmS[1]) + Math.abs(b2.deltaVVnbKmS[2])).toBeLessThan(1e-6);
      expect(plan.targets.every((t) => t.met)).toBe(true);
      // Transfer time printed as 315.4 min in the example.
      expect(Math.abs((b2.epoch.tdbS - b1.epoch.tdbS) / 60 - 315.4)).toBeLessThan(0.05);
    });
  });
});
