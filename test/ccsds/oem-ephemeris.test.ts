import { describe, expect, it } from 'vitest';
import {
  formatCcsdsEpoch, oemToEphemeris, oemToTrajectory, readOem, writeOem, type Oem, type OemState,
} from '../../ccsds/index.ts';
import {
  createBuiltinEphemeris, layerEphemerides, OutOfSpanError, type BodyName, type Vec3,
} from '../../propagator/index.ts';

/**
 * Accuracy of an OEM written by veer, read back and interpolated, against the exact trajectory.
 *
 * Truth: a circular orbit, x = r cos ωt, y = r sin ωt cos i, z = r sin ωt sin i. Every component's k-th
 * derivative is bounded by r ω^k, so the interpolation error theorem (e.g. Burden & Faires, Numerical
 * Analysis, Thm 3.3 for Lagrange and Thm 3.9 for Hermite) gives, per component,
 *   Lagrange on nodes t_0..t_d:        |e(t)| ≤ r ω^(d+1) / (d+1)! · Π|t − t_i|
 *   Hermite on nodes t_0..t_(m−1):     |e(t)| ≤ r ω^(2m) / (2m)! · Π(t − t_i)²
 * plus the printed rounding of the tabulated values carried through the basis (the Lebesgue sums
 * Σ|ℓ_i(t)|, Σ|h_i(t)|, Σ|k_i(t)|). The bound is taken over every window of consecutive nodes that
 * contains t, so it holds whichever window the interpolator picks.
 */
const MU_EARTH_KM3_S2 = 398600.4415; // any GM works for the analytic circle; EGM-like value, common practice
const RADIUS_KM = 7000;
const OMEGA = Math.sqrt(MU_EARTH_KM3_S2 / RADIUS_KM ** 3);
const INCLINATION = 0.9;
const T0 = 9.0e8; // TDB s from J2000, whole seconds: the printed epochs are exact
const STEP_S = 60;
const LINES = 40;
const POSITION_ROUNDING_KM = 0.5e-6; // 6 decimals (writer default)
const VELOCITY_ROUNDING_KMS = 0.5e-9; // 9 decimals (writer default)

function truth(t: number): { p: Vec3; v: Vec3 } {
  const a = OMEGA * (t - T0);
  const [c, s] = [Math.cos(a), Math.sin(a)];
  return {
    p: [RADIUS_KM * c, RADIUS_KM * s * Math.cos(INCLINATION), RADIUS_KM * s * Math.sin(INCLINATION)],
    v: [-RADIUS_KM * OMEGA * s, RADIUS_KM * OMEGA * c * Math.cos(INCLINATION), RADIUS_KM * OMEGA * c * Math.sin(INCLINATION)],
  };
}

function factorial(n: number): number {
  return n <= 1 ? 1 : n * factorial(n - 1);
}

function circleOem(interpolation: 'LAGRANGE' | 'HERMITE', degree: number): Oem {
  const states: OemState[] = Array.from({ length: LINES }, (_, i) => {
    const t = T0 + STEP_S * i;
    const { p, v } = truth(t);
    return { epoch: formatCcsdsEpoch(t, 'TDB'), epochTdbS: t, positionKm: p, velocityKmS: v, line: 0 };
  });
  return {
    header: { version: '2.0', creationDate: '2030-01-01T00:00:00', originator: 'VEER-TEST', comments: [] },
    segments: [{
      metadata: {
        comments: [], objectName: 'CIRCLE', objectId: 'UNKNOWN', centerName: 'EARTH', centre: 'earth', refFrame: 'EME2000',
        frame: 'J2000_EQUATORIAL', timeSystem: 'TDB', startTime: states[0].epoch, startTdbS: states[0].epochTdbS,
        stopTime: states[LINES - 1].epoch, stopTdbS: states[LINES - 1].epochTdbS, interpolation, interpolationDegree: degree,
      },
      dataComments: [], states, covariances: [],
    }],
  };
}

/** Largest bound over all windows of `points` consecutive nodes containing t. */
function errorBound(t: number, points: number, hermite: boolean): number {
  let worst = 0;
  const nodes = Array.from({ length: LINES }, (_, i) => T0 + STEP_S * i);
  for (let start = 0; start + points <= LINES; start++) {
    const w = nodes.slice(start, start + points);
    if (t < w[0] || t > w[points - 1]) continue;
    let product = 1;
    for (const ti of w) product *= hermite ? (t - ti) ** 2 : Math.abs(t - ti);
    const order = hermite ? 2 * points : points;
    const truncation = RADIUS_KM * OMEGA ** order / factorial(order) * product;
    let rounding = 0;
    for (let i = 0; i < points; i++) {
      let l = 1;
      let dl = 0;
      for (let j = 0; j < points; j++) if (j !== i) { l *= (t - w[j]) / (w[i] - w[j]); dl += 1 / (w[i] - w[j]); }
      rounding += hermite
        ? Math.abs((1 - 2 * dl * (t - w[i])) * l * l) * POSITION_ROUNDING_KM + Math.abs((t - w[i]) * l * l) * VELOCITY_ROUNDING_KMS
        : Math.abs(l) * POSITION_ROUNDING_KM;
    }
    worst = Math.max(worst, truncation + rounding);
  }
  return worst;
}

describe('OEM as a tabulated ephemeris', () => {
  const cases: ['LAGRANGE' | 'HERMITE', number, number][] = [['LAGRANGE', 7, 8], ['LAGRANGE', 5, 6], ['HERMITE', 5, 3], ['HERMITE', 7, 4]];
  for (const [method, degree, points] of cases) {
    describe(`when a circular orbit is written by veer with ${method} degree ${degree} and read back`, () => {
      const text = writeOem(circleOem(method, degree));
      const trajectory = oemToTrajectory(readOem(text));

      it('should reproduce the truth within the interpolation error bound at every quarter step', () => {
        let worstRatio = 0;
        for (let k = 1; k < 4 * (LINES - 1); k++) {
          const t = T0 + (STEP_S / 4) * k;
          const got = trajectory.stateAt(t).positionKm;
          const { p } = truth(t);
          const bound = errorBound(t, points, method === 'HERMITE');
          for (let c = 0; c < 3; c++) {
            const error = Math.abs(got[c] - p[c]);
            expect(error, `t = T0 + ${t - T0} s, component ${c}`).toBeLessThanOrEqual(bound);
            worstRatio = Math.max(worstRatio, error / bound);
          }
        }
        // The bound is not vacuous: the worst case uses a sizeable part of it.
        expect(worstRatio).toBeGreaterThan(0.05);
      });

      it('should give velocities close to the truth', () => {
        const t = T0 + 10.5 * STEP_S;
        const got = trajectory.stateAt(t).velocityKmS;
        const { v } = truth(t);
        // Derivative of the interpolant: one order less accurate; 1e-7 km/s is far above what it shows here.
        got.forEach((x, c) => expect(Math.abs(x - v[c])).toBeLessThan(1e-7));
      });
    });
  }

  describe('when asked outside the tabulated span', () => {
    const trajectory = oemToTrajectory(readOem(writeOem(circleOem('LAGRANGE', 7))));

    it('should throw OutOfSpanError before the first and after the last line', () => {
      expect(() => trajectory.stateAt(T0 - 1)).toThrow(OutOfSpanError);
      expect(() => trajectory.stateAt(T0 + STEP_S * (LINES - 1) + 1e-3)).toThrow(OutOfSpanError);
      expect(trajectory.stateAt(T0).positionKm[0]).toBeCloseTo(RADIUS_KM, 6);
    });

    it('should throw OutOfSpanError in a gap between segments', () => {
      const oem = circleOem('LAGRANGE', 3);
      const first = oem.segments[0];
      const cut = (from: number, to: number) => ({
        ...first,
        metadata: {
          ...first.metadata, startTime: first.states[from].epoch, startTdbS: first.states[from].epochTdbS,
          stopTime: first.states[to].epoch, stopTdbS: first.states[to].epochTdbS,
        },
        states: first.states.slice(from, to + 1),
      });
      const split = readOem(writeOem({ ...oem, segments: [cut(0, 9), cut(20, 39)] }));
      const t = oemToTrajectory(split);
      expect(() => t.stateAt(T0 + 15 * STEP_S)).toThrow(/gap between the segments/);
      const tq = T0 + 25.5 * STEP_S;
      expect(Math.abs(t.stateAt(tq).positionKm[2] - truth(tq).p[2])).toBeLessThanOrEqual(errorBound(tq, 4, false));
    });
  });

  describe('when an OEM of the Moon stands in for the Moon in the built-in ephemeris', () => {
    it('should match astronomy-engine between the tabulated epochs', () => {
      // Reference: astronomy-engine (npm), through the built-in source; tabulated hourly for two days.
      const builtin = createBuiltinEphemeris();
      const out = new Float64Array(6);
      const start = 9.2e8;
      const states: OemState[] = Array.from({ length: 49 }, (_, i) => {
        const t = start + 3600 * i;
        builtin.stateInto('moon', 'earth', t, out);
        return {
          epoch: formatCcsdsEpoch(t, 'TDB'), epochTdbS: t, positionKm: [out[0], out[1], out[2]],
          velocityKmS: [out[3], out[4], out[5]], line: 0,
        };
      });
      const oem: Oem = {
        header: { version: '2.0', creationDate: '2030-01-01T00:00:00', originator: 'VEER-TEST', comments: [] },
        segments: [{
          metadata: {
            comments: [], objectName: 'MOON', objectId: 'UNKNOWN', centerName: 'EARTH', centre: 'earth', refFrame: 'EME2000',
            frame: 'J2000_EQUATORIAL', timeSystem: 'TDB', startTime: states[0].epoch, startTdbS: start,
            stopTime: states[48].epoch, stopTdbS: states[48].epochTdbS, interpolation: 'LAGRANGE', interpolationDegree: 7,
          },
          dataComments: [], states, covariances: [],
        }],
      };
      const moon = oemToEphemeris(readOem(writeOem(oem)));
      expect(moon.target satisfies BodyName).toBe('moon');
      const layered = layerEphemerides(moon, builtin);
      const got = new Float64Array(6);
      let worstKm = 0;
      for (let k = 0; k < 96; k++) {
        const t = start + 1800 + 1800 * k * 0.999;
        if (t > start + 48 * 3600) break;
        layered.stateInto('moon', 'sun', t, got);
        builtin.stateInto('moon', 'sun', t, out);
        for (let c = 0; c < 3; c++) worstKm = Math.max(worstKm, Math.abs(got[c] - out[c]));
      }
      // Observed 1.5e-6 km (the 1 mm printing through the Lagrange basis, plus the float64 sum of the
      // Earth's heliocentric position); limit 1e-5 km just above it.
      expect(worstKm).toBeLessThan(1e-5);
    });
  });
});
