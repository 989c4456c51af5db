import { describe, expect, it } from 'vitest';
import {
  formatCcsdsEpoch, ODM_WRITE_DEFAULTS, readOem, readOpm, writeOem, writeOpm,
  type Oem, type OemState, type Opm,
} from '../../ccsds/index.ts';
import { InvalidInputError, type TimeScale, type Vec3 } from '../../propagator/index.ts';

/** Small seeded PRNG (mulberry32, common practice) so the values are varied but repeatable. */
function prng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const random = prng(20301);
const between = (lo: number, hi: number): number => lo + (hi - lo) * random();
const vec = (scale: number): Vec3 => [between(-scale, scale), between(-scale, scale), between(-scale, scale)];

/** A positive-definite 6×6 covariance L·Lᵀ with position σ ~ `sigmaKm`, velocity σ ~ `sigmaKmS`. */
function covariance(sigmaKm: number, sigmaKmS: number): number[][] {
  const scale = [sigmaKm, sigmaKm, sigmaKm, sigmaKmS, sigmaKmS, sigmaKmS];
  const l = Array.from({ length: 6 }, (_, i) => Array.from({ length: 6 }, (_, j) => (j < i ? between(-0.5, 0.5) : j === i ? 1 : 0)));
  return l.map((_, i) => l.map((__, j) => scale[i] * scale[j] * l[i].reduce((s, v, k) => s + v * l[j][k], 0)));
}

/** Half a unit in the last printed decimal place, plus float noise. */
const half = (decimals: number): number => 0.5 * 10 ** -decimals * (1 + 1e-9) + 1e-15;

function expectPrinted(actual: readonly number[], expected: readonly number[], decimals: number): void {
  actual.forEach((v, i) => expect(Math.abs(v - expected[i])).toBeLessThanOrEqual(half(decimals) + Math.abs(expected[i]) * 2e-16));
}

function expectCovariance(actual: number[][], expected: number[][], digits: number): void {
  for (let i = 0; i < 6; i++) {
    for (let j = 0; j < 6; j++) {
      expect(Math.abs(actual[i][j] - expected[i][j])).toBeLessThanOrEqual(Math.abs(expected[i][j]) * 0.5 * 10 ** (1 - digits) * (1 + 1e-9));
    }
  }
}

function sampleOpm(scale: TimeScale, epochTdbS: number): Opm {
  return {
    header: { version: '2.0', creationDate: '2025-06-01T00:00:00', originator: 'VEER-TEST', comments: ['round trip & <check>'] },
    metadata: {
      comments: ['invented'], objectName: 'ROUND TRIP', objectId: 'UNKNOWN', centerName: 'EARTH', centre: 'earth',
      refFrame: 'EME2000', frame: 'J2000_EQUATORIAL', timeSystem: scale,
    },
    state: {
      comments: [], epoch: formatCcsdsEpoch(epochTdbS, scale), epochTdbS, positionKm: vec(42000), velocityKmS: vec(7.5),
    },
    keplerian: {
      comments: [], semiMajorAxisKm: between(7000, 50000), eccentricity: between(0, 0.9), inclinationDeg: between(0, 180),
      raOfAscNodeDeg: between(0, 360), argOfPericenterDeg: between(0, 360), anomaly: { kind: 'mean', deg: between(0, 360) },
      gmKm3S2: 398600.4415,
    },
    spacecraft: { comments: ['mass'], massKg: between(100, 5000), solarRadAreaM2: between(1, 50), solarRadCoeff: between(1, 2) },
    covariance: { comments: [], covRefFrame: 'RTN', matrix: covariance(0.05, 5e-5) },
    maneuvers: [0, 1].map((k) => {
      const t = epochTdbS + 3600 * (k + 1) + between(0, 1);
      return {
        comments: [`burn ${k}`], epochIgnition: formatCcsdsEpoch(t, scale), epochIgnitionTdbS: t, durationS: 0,
        deltaMassKg: -between(0.1, 30), manRefFrame: k === 0 ? 'RTN' : 'TNW', deltaVKmS: vec(0.05),
      };
    }),
    userDefined: [['NOTE', 'kept as text']],
  };
}

describe('CCSDS writers and readers', () => {
  const epochs: [TimeScale, number][] = [['UTC', 7.9e8 + 0.123456789], ['TAI', 8.1e8 + 0.5], ['TT', 9.5e8 + 0.25], ['TDB', 1.0e9 + 0.987654]];

  for (const encoding of ['kvn', 'xml'] as const) {
    describe(`when an OPM is written as ${encoding.toUpperCase()} and read back`, () => {
      for (const [scale, epochTdbS] of epochs) {
        it(`should preserve every value to its printed precision (${scale})`, () => {
          const opm = sampleOpm(scale, epochTdbS);
          const text = writeOpm(opm, { encoding });
          const back = readOpm(text);
          const d = ODM_WRITE_DEFAULTS;
          expect(back.header).toEqual(opm.header);
          expect(back.metadata).toEqual(opm.metadata);
          // Epoch printed to the microsecond: within half of it (plus the float64 resolution near 1e9 s).
          expect(Math.abs(back.state.epochTdbS - epochTdbS)).toBeLessThanOrEqual(0.5e-6 + 2.4e-7);
          expectPrinted(back.state.positionKm, opm.state.positionKm, d.positionDecimals);
          expectPrinted(back.state.velocityKmS, opm.state.velocityKmS, d.velocityDecimals);
          const k = opm.keplerian!;
          expectPrinted([back.keplerian!.semiMajorAxisKm], [k.semiMajorAxisKm], d.positionDecimals);
          expectPrinted([back.keplerian!.eccentricity], [k.eccentricity], 12);
          expectPrinted([back.keplerian!.inclinationDeg, back.keplerian!.anomaly.deg], [k.inclinationDeg, k.anomaly.deg], 10);
          expect(back.keplerian!.anomaly.kind).toBe('mean');
          expectPrinted([back.spacecraft!.massKg!], [opm.spacecraft!.massKg!], 3);
          expectCovariance(back.covariance!.matrix, opm.covariance!.matrix, d.covarianceDigits);
          back.maneuvers.forEach((m, i) => {
            expect(m.manRefFrame).toBe(opm.maneuvers[i].manRefFrame);
            expect(Math.abs(m.epochIgnitionTdbS - opm.maneuvers[i].epochIgnitionTdbS)).toBeLessThanOrEqual(0.5e-6 + 2.4e-7);
            expectPrinted(m.deltaVKmS, opm.maneuvers[i].deltaVKmS, d.velocityDecimals);
            expectPrinted([m.deltaMassKg], [opm.maneuvers[i].deltaMassKg], 6);
          });
          expect(back.userDefined).toEqual(opm.userDefined);
          // Writing what was read gives the same text: nothing drifts on a second pass.
          expect(writeOpm(back, { encoding })).toBe(text);
        });
      }
    });

    describe(`when an OEM is written as ${encoding.toUpperCase()} and read back`, () => {
      it('should preserve segments, lines, accelerations and covariance blocks', () => {
        const scale: TimeScale = 'UTC';
        const start = 7.95e8;
        const states = (t0: number, withAcceleration: boolean): OemState[] => Array.from({ length: 5 }, (_, i) => {
          const t = t0 + 60 * i + 0.000001 * i;
          return {
            epoch: formatCcsdsEpoch(t, scale), epochTdbS: t, positionKm: vec(1e8), velocityKmS: vec(30), line: 0,
            ...(withAcceleration ? { accelerationKmS2: vec(1e-5) } : {}),
          };
        });
        const segment = (t0: number, withAcceleration: boolean, interpolation: 'HERMITE' | 'LAGRANGE') => {
          const s = states(t0, withAcceleration);
          return {
            metadata: {
              comments: [], objectName: 'ROUND TRIP', objectId: 'UNKNOWN', centerName: 'SUN', centre: 'sun' as const,
              refFrame: 'ICRF', frame: 'J2000_EQUATORIAL' as const, timeSystem: scale,
              startTime: s[0].epoch, startTdbS: s[0].epochTdbS, stopTime: s[4].epoch, stopTdbS: s[4].epochTdbS,
              useableStartTime: s[1].epoch, useableStartTdbS: s[1].epochTdbS,
              interpolation, interpolationDegree: 3,
            },
            dataComments: ['arc'],
            states: s,
            covariances: [{ comments: ['c'], epoch: s[2].epoch, epochTdbS: s[2].epochTdbS, covRefFrame: 'EME2000', matrix: covariance(3, 1e-3) }],
          };
        };
        const oem: Oem = {
          header: { version: '2.0', creationDate: '2025-06-01T00:00:00', originator: 'VEER-TEST', comments: [] },
          segments: [segment(start, true, 'HERMITE'), segment(start + 600, false, 'LAGRANGE')],
        };
        const text = writeOem(oem, { encoding });
        const back = readOem(text);
        expect(back.segments).toHaveLength(2);
        back.segments.forEach((seg, k) => {
          const orig = oem.segments[k];
          const withoutTdb = (m: object): object => Object.fromEntries(Object.entries(m).filter(([key]) => !key.endsWith('TdbS')));
          expect(withoutTdb(seg.metadata)).toEqual(withoutTdb(orig.metadata));
          expect(Math.abs(seg.metadata.stopTdbS - orig.metadata.stopTdbS)).toBeLessThanOrEqual(0.5e-6 + 2.4e-7);
          expect(seg.dataComments).toEqual(['arc']);
          seg.states.forEach((s, i) => {
            expect(s.epoch).toBe(orig.states[i].epoch);
            expectPrinted(s.positionKm, orig.states[i].positionKm, ODM_WRITE_DEFAULTS.positionDecimals);
            expectPrinted(s.velocityKmS, orig.states[i].velocityKmS, ODM_WRITE_DEFAULTS.velocityDecimals);
            if (orig.states[i].accelerationKmS2) {
              expectPrinted(s.accelerationKmS2!, orig.states[i].accelerationKmS2!, ODM_WRITE_DEFAULTS.accelerationDecimals);
            } else {
              expect(s.accelerationKmS2).toBeUndefined();
            }
          });
          expectCovariance(seg.covariances[0].matrix, orig.covariances[0].matrix, ODM_WRITE_DEFAULTS.covarianceDigits);
          expect(seg.covariances[0].covRefFrame).toBe('EME2000');
        });
        expect(writeOem(back, { encoding })).toBe(text);
      });
    });
  }

  describe('when a message names a frame the readers refuse', () => {
    // CCSDS 502.0-B's frame table has no J2000 ecliptic frame (from memory): nothing unreadable is written.
    it('should refuse to write an ecliptic REF_FRAME, COV_REF_FRAME or MAN_REF_FRAME, naming the field', () => {
      const opm = sampleOpm('TDB', 1e9);
      expect(() => writeOpm({ ...opm, metadata: { ...opm.metadata, refFrame: 'ECLIPJ2000' } }))
        .toThrow(/^metadata\.refFrame: not written: frame 'ECLIPJ2000' is refused: .* no J2000 ecliptic frame/);
      expect(() => writeOpm({ ...opm, covariance: { comments: [], covRefFrame: 'ECLIPJ2000', matrix: covariance(1, 1e-3) } }))
        .toThrow(/^covariance\.covRefFrame: not written/);
      expect(() => writeOpm({ ...opm, maneuvers: opm.maneuvers.map((m) => ({ ...m, manRefFrame: 'ECLIPJ2000' })) }))
        .toThrow(/^maneuvers\[0\]\.manRefFrame: not written/);
      expect(() => writeOpm({ ...opm, metadata: { ...opm.metadata, refFrame: 'TOD' } })).toThrow(InvalidInputError);
    });
  });

  describe('when a comment is long or not ASCII', () => {
    it('should wrap it into KVN lines of at most 254 characters, spelling out common symbols', () => {
      const opm = sampleOpm('TDB', 1e9);
      opm.header.comments = [`Δv of 3 m/s — ${'word '.repeat(80)}end`];
      const text = writeOpm(opm);
      expect(Math.max(...text.split('\n').map((l) => l.length))).toBeLessThanOrEqual(254);
      const back = readOpm(text);
      expect(back.header.comments.length).toBeGreaterThan(1);
      expect(back.header.comments.join(' ')).toBe(`Dv of 3 m/s - ${'word '.repeat(80)}end`);
    });
  });
});
