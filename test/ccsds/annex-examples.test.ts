/**
 * The example messages of CCSDS 502.0-B (Orbit Data Messages, Blue Book issue 2, annex examples of an OPM
 * and an OEM), WRITTEN FROM MEMORY — keyword order, values and comments as remembered, not copied from the
 * document, so a digit may differ from the printed example. What they check is the reader against the
 * standard's own layout: the values as written come back in km and km/s, and what this project does not
 * model (an Earth-fixed frame, the Mars system barycentre as a centre) is refused naming the keyword and line.
 */
import { describe, expect, it } from 'vitest';
import { CcsdsFormatError, readOem, readOpm } from '../../ccsds/index.ts';
import { parseEpoch } from '../../propagator/index.ts';

// 502.0-B annex example OPM (from memory): an Earth-fixed (ITRF-97) state with spacecraft parameters.
const ANNEX_OPM = `CCSDS_OPM_VERS = 2.0
CREATION_DATE = 1998-11-06T09:23:57
ORIGINATOR = JAXA
COMMENT GEOCENTRIC, CARTESIAN, EARTH FIXED
OBJECT_NAME = GODZILLA 5
OBJECT_ID = 1998-057A
CENTER_NAME = EARTH
REF_FRAME = ITRF-97
TIME_SYSTEM = UTC
EPOCH = 1998-12-18T14:28:15.1172
X = 6503.514000
Y = 1239.647000
Z = -717.490000
X_DOT = -0.873160
Y_DOT = 8.740420
Z_DOT = -4.191076
MASS = 3000.000000
SOLAR_RAD_AREA = 18.770000
SOLAR_RAD_COEFF = 1.000000
DRAG_AREA = 18.770000
DRAG_COEFF = 2.500000
`;

// 502.0-B annex example OEM (from memory): one segment about the Mars barycentre, Hermite degree 7, records
// of epoch, position km and velocity km/s (the example's "intervening data records omitted" line left out).
const ANNEX_OEM = `CCSDS_OEM_VERS = 2.0
CREATION_DATE = 1996-11-04T17:22:31
ORIGINATOR = NASA/JPL
META_START
OBJECT_NAME = MARS GLOBAL SURVEYOR
OBJECT_ID = 1996-062A
CENTER_NAME = MARS BARYCENTER
REF_FRAME = EME2000
TIME_SYSTEM = UTC
START_TIME = 1996-12-18T12:00:00.331
USEABLE_START_TIME = 1996-12-18T12:10:00.331
USEABLE_STOP_TIME = 1996-12-28T21:23:00.331
STOP_TIME = 1996-12-28T21:28:00.331
INTERPOLATION = HERMITE
INTERPOLATION_DEGREE = 7
META_STOP
COMMENT This file was produced by M.R. Somebody, MSOO NAV/JPL, 1996NOV 04. It is
COMMENT to be used for DSN scheduling purposes only.
1996-12-18T12:00:00.331 2789.619 -280.045 -1746.755 4.73372 -2.49586 -1.04195
1996-12-18T12:01:00.331 2783.419 -308.143 -1877.071 5.18604 -2.42124 -1.99608
1996-12-18T12:02:00.331 2776.033 -336.859 -2008.682 5.63678 -2.33951 -1.94687
1996-12-28T21:28:00.331 -3881.024 563.959 -682.773 -3.28827 -3.66735 1.63861
`;

const lineOf = (text: string, keyword: string): number => text.split('\n').findIndex((l) => l.startsWith(keyword)) + 1;

describe('CCSDS 502.0-B annex examples (from memory)', () => {
  describe('when the example OPM is read as written', () => {
    it('should refuse its Earth-fixed frame, naming REF_FRAME and its line', () => {
      const error = (() => { try { readOpm(ANNEX_OPM); } catch (e) { return e; } return null; })();
      expect(error).toBeInstanceOf(CcsdsFormatError);
      expect((error as CcsdsFormatError).message).toMatch(/REF_FRAME/);
      expect((error as CcsdsFormatError).message).toContain(`line ${lineOf(ANNEX_OPM, 'REF_FRAME')}`);
    });
  });
  describe('when the same OPM names an inertial frame (EME2000)', () => {
    const opm = readOpm(ANNEX_OPM.replace('REF_FRAME = ITRF-97', 'REF_FRAME = EME2000'));
    it('should give back the header, state and spacecraft values as written', () => {
      expect(opm.header).toMatchObject({ version: '2.0', creationDate: '1998-11-06T09:23:57', originator: 'JAXA' });
      expect(opm.metadata).toMatchObject({ objectName: 'GODZILLA 5', objectId: '1998-057A', centre: 'earth', timeSystem: 'UTC' });
      expect(opm.state.positionKm).toEqual([6503.514, 1239.647, -717.49]);
      expect(opm.state.velocityKmS).toEqual([-0.87316, 8.74042, -4.191076]);
      expect(opm.state.epochTdbS).toBe(parseEpoch('1998-12-18T14:28:15.1172 UTC'));
      expect(opm.spacecraft).toMatchObject({ massKg: 3000, solarRadAreaM2: 18.77, solarRadCoeff: 1, dragAreaM2: 18.77, dragCoeff: 2.5 });
    });
  });
  describe('when the example OEM is read as written', () => {
    it('should refuse its Mars-barycentre centre (not modelled here), naming CENTER_NAME and its line', () => {
      const error = (() => { try { readOem(ANNEX_OEM); } catch (e) { return e; } return null; })();
      expect(error).toBeInstanceOf(CcsdsFormatError);
      expect((error as CcsdsFormatError).message).toMatch(/CENTER_NAME/);
      expect((error as CcsdsFormatError).message).toContain(`line ${lineOf(ANNEX_OEM, 'CENTER_NAME')}`);
    });
  });
  describe('when the same OEM is centred on MARS', () => {
    const oem = readOem(ANNEX_OEM.replace('CENTER_NAME = MARS BARYCENTER', 'CENTER_NAME = MARS'));
    it('should read the metadata, the comments and every record in km and km/s', () => {
      const segment = oem.segments[0];
      expect(segment.metadata).toMatchObject({ objectName: 'MARS GLOBAL SURVEYOR', centre: 'mars', refFrame: 'EME2000' });
      expect(segment.states).toHaveLength(4);
      expect(segment.states[0].positionKm).toEqual([2789.619, -280.045, -1746.755]);
      expect(segment.states[3].velocityKmS).toEqual([-3.28827, -3.66735, 1.63861]);
      expect(segment.states[1].epochTdbS).toBe(parseEpoch('1996-12-18T12:01:00.331 UTC'));
    });
  });
});
