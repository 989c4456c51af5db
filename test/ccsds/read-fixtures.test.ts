import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import {
  covarianceInStateFrame, readOem, readOpm, readOpmAsInitialState, segmentInterpolation, vnbFromTnw,
} from '../../ccsds/index.ts';
import { eclipticFromEquatorialJ2000, parseEpoch, rtnMatrix } from '../../propagator/index.ts';

// Fixtures: hand-written from memory in the layout of the CCSDS 502.0-B annex examples, invented content
// (see test/fixtures/ccsds/README.md).
const fixture = (name: string): string => readFileSync(new URL(`../fixtures/ccsds/${name}`, import.meta.url), 'utf8');

describe('OPM reader', () => {
  describe('when reading the hand-written KVN file with every block', () => {
    const opm = readOpm(fixture('opm-earth-maneuvers.opm'));

    it('should read the header and metadata as written', () => {
      expect(opm.header).toMatchObject({ version: '2.0', creationDate: '2025-03-01T08:15:00', originator: 'VEER-DEMO' });
      expect(opm.header.comments).toHaveLength(1);
      expect(opm.metadata).toMatchObject({
        objectName: 'LARKSPUR-1', objectId: '2024-900A', centerName: 'EARTH', centre: 'earth', refFrame: 'EME2000',
        frame: 'J2000_EQUATORIAL', timeSystem: 'UTC',
      });
    });

    it('should convert the UTC epoch to TDB through the leap-second table', () => {
      // 2025-03-02T00:00:00 UTC: TAI − UTC = 37 s (IERS Bulletin C), TT − TAI = 32.184 s (IAU), TDB − TT
      // < 2 ms, so TDB = UTC calendar seconds + 69.184 s within 2 ms.
      const utcCalendar = Date.UTC(2025, 2, 2) / 1000 - Date.UTC(2000, 0, 1, 12) / 1000;
      expect(Math.abs(opm.state.epochTdbS - (utcCalendar + 69.184))).toBeLessThan(0.002);
    });

    it('should read the state vector in km and km/s', () => {
      expect(opm.state.positionKm).toEqual([-19864.2237, 37202.4036, 27.9016]);
      expect(opm.state.velocityKmS).toEqual([-2.71213761, -1.44694477, 0.00191049]);
    });

    it('should read Keplerian elements, spacecraft parameters and the user-defined parameter', () => {
      expect(opm.keplerian).toMatchObject({ semiMajorAxisKm: 42164.2, eccentricity: 0.00041, anomaly: { kind: 'true', deg: 122.7 } });
      expect(opm.spacecraft).toMatchObject({ massKg: 2140.5, solarRadAreaM2: 24, solarRadCoeff: 1.35, dragAreaM2: 18, dragCoeff: 2.2 });
      expect(opm.userDefined).toEqual([['EARTH_MODEL', 'WGS-84']]);
    });

    it('should read the covariance as a symmetric matrix in RTN', () => {
      expect(opm.covariance?.covRefFrame).toBe('RTN');
      expect(opm.covariance?.matrix[0][0]).toBe(3.24e-4);
      expect(opm.covariance?.matrix[0][1]).toBe(opm.covariance?.matrix[1][0]);
      expect(opm.covariance?.matrix[5][5]).toBe(1.21e-12);
    });

    it('should read both maneuvers, the second with a day-of-year epoch', () => {
      expect(opm.maneuvers).toHaveLength(2);
      expect(opm.maneuvers[0]).toMatchObject({ manRefFrame: 'RTN', durationS: 0, deltaMassKg: -0.722, deltaVKmS: [0, 0.0030125, 0] });
      // Day 063 of 2025 is 4 March (31 + 28 + 4).
      expect(opm.maneuvers[1].epochIgnitionTdbS).toBe(parseEpoch('2025-03-04T13:00:00.000 UTC'));
      expect(opm.maneuvers[1].comments).toEqual(['Second maneuver: finite burn in inertial axes']);
    });
  });

  describe('when reading it as the planner initial state', () => {
    const result = readOpmAsInitialState(fixture('opm-earth-maneuvers.opm'));

    it('should give the epoch with its scale, centre, frame and state', () => {
      expect(result.initialState).toMatchObject({
        epoch: '2025-03-02T00:00:00.000 UTC', centre: 'earth', frame: 'J2000_EQUATORIAL',
        positionKm: [-19864.2237, 37202.4036, 27.9016],
      });
      expect(result.massKg).toBe(2140.5);
      expect(result.notes.join(' ')).toMatch(/2 maneuver block/);
    });

    it('should rotate the RTN covariance into the state frame, keeping its trace and its RTN form', () => {
      const opm = result.opm;
      const c = result.initialState.covarianceKmKmS!;
      const rtn = opm.covariance!.matrix;
      const trace = (m: number[][], from: number): number => m[from][from] + m[from + 1][from + 1] + m[from + 2][from + 2];
      expect(trace(c, 0)).toBeCloseTo(trace(rtn, 0), 15);
      // Back to RTN with the propagator's own RTN axes (rows R, T, N): A C Aᵀ on the position block.
      const a = rtnMatrix(opm.state.positionKm, opm.state.velocityKmS);
      const row = (i: number): number[] => [a[3 * i], a[3 * i + 1], a[3 * i + 2]];
      const back = (i: number, j: number): number => row(i).reduce((s, ai, k) => s + ai * row(j).reduce((t, aj, l) => t + c[k][l] * aj, 0), 0);
      expect(back(0, 0)).toBeCloseTo(rtn[0][0], 15);
      expect(back(1, 0)).toBeCloseTo(rtn[1][0], 15);
      expect(back(2, 2)).toBeCloseTo(rtn[2][2], 15);
      expect(covarianceInStateFrame(opm)).toEqual(c);
    });
  });

  describe('when reading the minimal OPM', () => {
    const opm = readOpm(fixture('opm-sun-minimal.opm'));

    it('should accept a TDB day-of-year epoch with a fraction and no units', () => {
      // Day 121 of 2030 is 1 May (31 + 28 + 31 + 30 + 1).
      expect(opm.state.epochTdbS).toBe(parseEpoch('2030-05-01T06:30:00.25 TDB'));
      expect(opm.metadata).toMatchObject({ centre: 'sun', refFrame: 'ICRF', frame: 'J2000_EQUATORIAL', timeSystem: 'TDB' });
      expect(opm.state.positionKm[0]).toBe(1.234567890123e8);
      expect(opm.keplerian).toBeUndefined();
      expect(opm.maneuvers).toEqual([]);
    });
  });

  describe('when reading the hand-written XML file', () => {
    const opm = readOpm(fixture('opm-earth.xml'));

    it('should read the same state as the KVN file', () => {
      const kvn = readOpm(fixture('opm-earth-maneuvers.opm'));
      expect(opm.state).toEqual({ ...kvn.state, comments: ['State Vector'] });
      expect(opm.metadata).toEqual({ ...kvn.metadata, comments: [] });
    });

    it('should read entities, the TNW maneuver and the user-defined parameter', () => {
      expect(opm.maneuvers[0].comments).toEqual(['Along-track trim & nothing else']);
      expect(opm.maneuvers[0].manRefFrame).toBe('TNW');
      // TNW (T along v, N = W × T, W along h) → VNB (V along v, N along h, B = V × N): (t, n, w) → (t, w, −n).
      expect(vnbFromTnw([1, 2, 3])).toEqual([1, 3, -2]);
      expect(opm.userDefined).toEqual([['EARTH_MODEL', 'WGS-84']]);
    });
  });
});

describe('OEM reader', () => {
  describe('when reading the hand-written two-segment KVN file', () => {
    const oem = readOem(fixture('oem-mars-two-segments.oem'));

    it('should read both segments with their interpolation settings', () => {
      expect(oem.segments).toHaveLength(2);
      expect(oem.segments[0].metadata).toMatchObject({ centre: 'mars', interpolation: 'HERMITE', interpolationDegree: 5 });
      expect(oem.segments[1].metadata).toMatchObject({ interpolation: 'LAGRANGE', interpolationDegree: 7 });
      expect(oem.segments[0].states).toHaveLength(8);
      expect(oem.segments[1].states).toHaveLength(8);
    });

    it('should read the lines with their line numbers and epochs 120 s apart', () => {
      const states = oem.segments[0].states;
      expect(states[0].positionKm).toEqual([-1335.338691, -2410.628183, 2766.396987]);
      expect(states[1].epochTdbS - states[0].epochTdbS).toBe(120);
      expect(fixture('oem-mars-two-segments.oem').split('\n')[states[0].line - 1]).toMatch(/^2030-05-17T06:00:00.000 /);
    });

    it('should read the lower-triangle covariance rows', () => {
      const c = oem.segments[0].covariances[0];
      expect(c.covRefFrame).toBe('RTN');
      expect(c.matrix[5][2]).toBe(1.408217e-7);
      expect(c.matrix[2][5]).toBe(1.408217e-7);
      expect(c.epochTdbS).toBe(oem.segments[0].states[7].epochTdbS);
    });
  });

  describe('when reading the hand-written XML file', () => {
    it('should give the same states as the KVN file and read the keyword covariance', () => {
      const xml = readOem(fixture('oem-mars.xml'));
      const kvn = readOem(fixture('oem-mars-two-segments.oem'));
      expect(xml.segments[0].states.map((s) => [s.epochTdbS, s.positionKm, s.velocityKmS]))
        .toEqual(kvn.segments[0].states.slice(0, 4).map((s) => [s.epochTdbS, s.positionKm, s.velocityKmS]));
      expect(xml.segments[0].covariances[0].matrix[3][3]).toBe(1e-9);
    });
  });
});

describe('OPM reader, version 3.0 and frame details', () => {
  // Written from memory in the 502.0-B-3 layout: CLASSIFICATION before CREATION_DATE, MESSAGE_ID after ORIGINATOR.
  const v3 = [
    'CCSDS_OPM_VERS = 3.0',
    'COMMENT version 3 header',
    'CLASSIFICATION = unclassified demo',
    'CREATION_DATE = 2030-02-01T00:00:00Z',
    'ORIGINATOR = VEER-DEMO',
    'MESSAGE_ID = DEMO-0001',
    'OBJECT_NAME = FINCH',
    'OBJECT_ID = UNKNOWN',
    'CENTER_NAME = SUN',
    'REF_FRAME = ICRF',
    'TIME_SYSTEM = TT',
    'EPOCH = 2030-02-02T00:00:00',
    'X = 1.4e8 [km]', 'Y = 2.0e7 [km]', 'Z = 1.0e5 [km]',
    'X_DOT = -4.1 [km/s]', 'Y_DOT = 29.0 [km/s]', 'Z_DOT = 0.01 [km/s]',
    'COV_REF_FRAME = EME2000',
    ...['1e2', '0', '1e2', '0', '0', '1e2', '0', '0', '0', '1e-6', '0', '0', '0', '0', '1e-6', '0', '0', '0', '0', '0', '1e-6']
      .map((v, i) => `${['CX_X', 'CY_X', 'CY_Y', 'CZ_X', 'CZ_Y', 'CZ_Z', 'CX_DOT_X', 'CX_DOT_Y', 'CX_DOT_Z', 'CX_DOT_X_DOT',
        'CY_DOT_X', 'CY_DOT_Y', 'CY_DOT_Z', 'CY_DOT_X_DOT', 'CY_DOT_Y_DOT', 'CZ_DOT_X', 'CZ_DOT_Y', 'CZ_DOT_Z',
        'CZ_DOT_X_DOT', 'CZ_DOT_Y_DOT', 'CZ_DOT_Z_DOT'][i]} = ${v}`),
  ].join('\n');

  describe('when the header has the 3.0 keywords and the state is in ICRF', () => {
    const read = readOpmAsInitialState(v3);

    it('should read CLASSIFICATION and MESSAGE_ID and map ICRF to the J2000 equatorial frame', () => {
      expect(read.opm.header).toMatchObject({ version: '3.0', classification: 'unclassified demo', messageId: 'DEMO-0001' });
      expect(read.initialState).toMatchObject({ frame: 'J2000_EQUATORIAL', centre: 'sun', epoch: '2030-02-02T00:00:00 TT' });
    });

    it('should keep an EME2000 covariance as it is (EME2000 and ICRF are the same axes here)', () => {
      const c = read.initialState.covarianceKmKmS!;
      expect(c[0][0]).toBe(100);
      expect(c[5][5]).toBe(1e-6);
      expect(c[1][2]).toBe(0);
    });

    it('should refuse the same message with an ecliptic REF_FRAME, on its line', () => {
      // 502.0-B's frame table has no J2000 ecliptic frame (from memory).
      expect(() => readOpmAsInitialState(v3.replace('REF_FRAME = ICRF', 'REF_FRAME = ECLIPJ2000')))
        .toThrow(/^REF_FRAME: line 10: frame 'ECLIPJ2000' is refused: .*should give its states in EME2000 or ICRF/);
    });

    it('should refuse the 3.0 keywords in a 2.0 message', () => {
      expect(() => readOpm(v3.replace('CCSDS_OPM_VERS = 3.0', 'CCSDS_OPM_VERS = 2.0'))).toThrow(/line 3: OPM: required keyword CREATION_DATE missing; found keyword CLASSIFICATION/);
    });
  });

  describe('when an OEM names Hermite with an even degree', () => {
    it('should raise it to the next odd degree so no fewer conditions are matched', () => {
      const oem = readOem(fixture('oem-mars-two-segments.oem').replace('INTERPOLATION_DEGREE = 5', 'INTERPOLATION_DEGREE = 4'));
      expect(segmentInterpolation(oem.segments[0])).toEqual({ interpolation: 'hermite', degree: 5 });
      expect(segmentInterpolation(oem.segments[1])).toEqual({ interpolation: 'lagrange', degree: 7 });
    });
  });

  it('should agree with the propagator on the ecliptic rotation used to write ecliptic states in EME2000', () => {
    const v = eclipticFromEquatorialJ2000([0, 0, 1]);
    // The equatorial pole seen from the ecliptic is tilted by the obliquity, about 23.44 deg (IAU 2006: 84381.406").
    expect(Math.acos(v[2]) * 180 / Math.PI).toBeCloseTo(84381.406 / 3600, 9);
  });
});

