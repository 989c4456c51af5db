import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { CcsdsFormatError, readOem, readOpm } from '../../ccsds/index.ts';

// Each case breaks one thing in a hand-written fixture (test/fixtures/ccsds, layout of the CCSDS 502.0-B
// annex examples, written from memory) and expects the reader to name the keyword and the line.
const fixture = (name: string): string => readFileSync(new URL(`../fixtures/ccsds/${name}`, import.meta.url), 'utf8');
const OPM = fixture('opm-earth-maneuvers.opm');
const OEM = fixture('oem-mars-two-segments.oem');

/** 1-based number of the first line starting with `prefix`. */
function lineOf(text: string, prefix: string): number {
  const index = text.split('\n').findIndex((l) => l.startsWith(prefix));
  if (index < 0) throw new Error(`no line starts with ${prefix}`);
  return index + 1;
}

function replaceLine(text: string, prefix: string, replacement: string | null): string {
  const lines = text.split('\n');
  const i = lines.findIndex((l) => l.startsWith(prefix));
  if (i < 0) throw new Error(`no line starts with ${prefix}`);
  if (replacement === null) lines.splice(i, 1); else lines[i] = replacement;
  return lines.join('\n');
}

function failure(read: () => unknown): CcsdsFormatError {
  try {
    read();
  } catch (error) {
    if (error instanceof CcsdsFormatError) return error;
    throw error;
  }
  throw new Error('the reader accepted the malformed text');
}

describe('CCSDS readers on malformed input', () => {
  describe('when a required OPM keyword is missing', () => {
    it('should name the keyword and the line where it was expected', () => {
      const text = replaceLine(OPM, 'OBJECT_ID', null);
      const error = failure(() => readOpm(text));
      expect(error.field).toBe('OBJECT_ID');
      expect(error.line).toBe(lineOf(text, 'CENTER_NAME'));
      expect(error.message).toMatch(/required keyword OBJECT_ID missing; found keyword CENTER_NAME/);
      expect(error.name).toBe('InvalidInputError');
    });

    it('should report a missing velocity component', () => {
      const text = replaceLine(OPM, 'Z_DOT', null);
      const error = failure(() => readOpm(text));
      expect(error.field).toBe('Z_DOT');
      expect(error.line).toBe(lineOf(OPM, 'Z_DOT') + 1);
    });
  });

  describe('when an epoch is bad', () => {
    it('should refuse a day that does not exist', () => {
      const text = replaceLine(OPM, 'EPOCH', 'EPOCH = 2025-02-30T00:00:00.000');
      const error = failure(() => readOpm(text));
      expect([error.field, error.line]).toEqual(['EPOCH', lineOf(OPM, 'EPOCH')]);
      expect(error.message).toMatch(/day 30 does not exist/);
    });

    it('should refuse a date in another layout', () => {
      const text = replaceLine(OPM, 'EPOCH', 'EPOCH = 2025/03/02 00:00:00');
      expect(failure(() => readOpm(text)).line).toBe(lineOf(OPM, 'EPOCH'));
    });

    it('should refuse a day of year past the end of the year', () => {
      const text = replaceLine(OPM, 'MAN_EPOCH_IGNITION = 2025-063', 'MAN_EPOCH_IGNITION = 2025-366T13:00:00');
      const error = failure(() => readOpm(text));
      expect([error.field, error.line]).toEqual(['MAN_EPOCH_IGNITION', lineOf(OPM, 'MAN_EPOCH_IGNITION = 2025-063')]);
    });

    it('should refuse a Z suffix when the time system is not UTC', () => {
      const text = fixture('opm-sun-minimal.opm').replace('EPOCH = 2030-121T06:30:00.25', 'EPOCH = 2030-121T06:30:00.25Z');
      expect(failure(() => readOpm(text)).message).toMatch(/ends in Z \(UTC\) but the time system is TDB/);
    });
  });

  describe('when a frame, centre, time system or unit is not supported', () => {
    const cases: [string, string, string, RegExp][] = [
      ['REF_FRAME', 'REF_FRAME = TOD', 'REF_FRAME', /frame 'TOD' is not supported/],
      ['CENTER_NAME', 'CENTER_NAME = PLUTO', 'CENTER_NAME', /centre 'PLUTO' is not one the propagator knows/],
      ['CENTER_NAME', 'CENTER_NAME = JUPITER', 'CENTER_NAME', /write 'JUPITER BARYCENTER'/],
      ['TIME_SYSTEM', 'TIME_SYSTEM = GPS', 'TIME_SYSTEM', /time system 'GPS' is not supported/],
      ['X = ', 'X = -19864223.7 [m]', 'X', /unit \[m\] where the standard puts \[km\]/],
      ['MAN_REF_FRAME = RTN', 'MAN_REF_FRAME = QSW', 'MAN_REF_FRAME', /frame 'QSW' is not supported/],
      ['COV_REF_FRAME', 'COV_REF_FRAME = ITRF2000', 'COV_REF_FRAME', /not supported/],
      ['CCSDS_OPM_VERS', 'CCSDS_OPM_VERS = 1.0', 'CCSDS_OPM_VERS', /version '1.0' is not supported/],
    ];
    for (const [prefix, replacement, field, message] of cases) {
      it(`should refuse '${replacement}' on its line`, () => {
        const error = failure(() => readOpm(replaceLine(OPM, prefix, replacement)));
        expect([error.field, error.line]).toEqual([field, lineOf(OPM, prefix)]);
        expect(error.message).toMatch(message);
      });
    }

    // CCSDS 502.0-B annex A frame table (from memory): EME2000, GCRF, GRC, ICRF, ITRF..., MCI, TDR, TEME, TOD —
    // no J2000 ecliptic frame, so an ecliptic name is refused with the line and what to write instead.
    const ecliptic: [string, string, string, string][] = [
      ['OPM', 'REF_FRAME', 'REF_FRAME = ECLIPJ2000', 'REF_FRAME'],
      ['OPM', 'COV_REF_FRAME', 'COV_REF_FRAME = ECLIPJ2000', 'COV_REF_FRAME'],
      ['OPM', 'MAN_REF_FRAME = RTN', 'MAN_REF_FRAME = ECLIPTIC', 'MAN_REF_FRAME'],
      ['OEM', 'REF_FRAME', 'REF_FRAME = ECLIPJ2000', 'REF_FRAME'],
    ];
    for (const [kind, prefix, replacement, field] of ecliptic) {
      it(`should refuse the ecliptic frame name in '${replacement}' (${kind}) on its line, pointing to EME2000/ICRF`, () => {
        const original = kind === 'OPM' ? OPM : OEM;
        const error = failure(() => (kind === 'OPM' ? readOpm : readOem)(replaceLine(original, prefix, replacement)));
        expect([error.field, error.line]).toEqual([field, lineOf(original, prefix)]);
        expect(error.message).toMatch(/table of CCSDS 502\.0-B has no J2000 ecliptic frame; the file should give its states in EME2000 or ICRF/);
      });
    }

    it('should refuse GCRF about a centre other than the Earth', () => {
      const text = fixture('opm-sun-minimal.opm').replace('REF_FRAME = ICRF', 'REF_FRAME = GCRF');
      expect(failure(() => readOpm(text)).message).toMatch(/GCRF is geocentric/);
    });
  });

  describe('when the covariance is not positive semi-definite', () => {
    it('should refuse a correlation above one and give the first covariance line', () => {
      // CY_X² > CX_X·CY_Y: the 2×2 position minor is negative, so no covariance can hold it.
      const text = replaceLine(OPM, 'CY_X', 'CY_X = 8.0E-4 [km**2]');
      const error = failure(() => readOpm(text));
      expect(error.line).toBe(lineOf(OPM, 'CX_X'));
      expect(error.message).toMatch(/not positive semi-definite/);
    });

    it('should refuse a negative variance', () => {
      const error = failure(() => readOpm(replaceLine(OPM, 'CZ_Z', 'CZ_Z = -1.0E-4 [km**2]')));
      expect(error.message).toMatch(/variance \[3,3\] = -0.0001 < 0/);
    });

    it('should refuse a non-positive-semi-definite OEM covariance block on its first row', () => {
      const text = OEM.replace(' 1.225000E-3\n', ' 1.0E-6\n');
      const error = failure(() => readOem(text));
      expect(error.line).toBe(lineOf(OEM, ' 1.225000E-3'));
    });
  });

  describe('when the OPM blocks break the standard order or rules', () => {
    it('should refuse a COMMENT inside the state vector', () => {
      const text = replaceLine(OPM, 'Y = ', 'COMMENT not here');
      const error = failure(() => readOpm(text));
      expect(error.line).toBe(lineOf(OPM, 'Y = '));
      expect(error.message).toMatch(/COMMENT lines are allowed only at the start of a block/);
    });

    it('should refuse maneuvers without a spacecraft mass', () => {
      const text = replaceLine(OPM, 'MASS', null);
      expect(failure(() => readOpm(text)).field).toBe('MASS');
    });

    it('should refuse spacecraft parameters after the covariance', () => {
      const lines = OPM.split('\n');
      const mass = lines.splice(lineOf(OPM, 'MASS') - 1, 1)[0];
      lines.splice(lineOf(OPM, 'COMMENT First maneuver') - 2, 0, mass);
      const text = lines.join('\n');
      const error = failure(() => readOpm(text));
      expect(error.line).toBe(lineOf(text, 'MASS'));
      expect(error.message).toMatch(/out of the standard's order/);
    });

    it('should refuse an unknown keyword', () => {
      const text = replaceLine(OPM, 'DRAG_COEFF', 'DRAG_COEFFICIENT = 2.2');
      expect(failure(() => readOpm(text))).toMatchObject({ field: 'DRAG_COEFFICIENT', line: lineOf(OPM, 'DRAG_COEFF') });
    });

    it('should refuse a positive mass change', () => {
      const text = replaceLine(OPM, 'MAN_DELTA_MASS = -0.722', 'MAN_DELTA_MASS = 0.722 [kg]');
      expect(failure(() => readOpm(text))).toMatchObject({ field: 'MAN_DELTA_MASS', line: lineOf(OPM, 'MAN_DELTA_MASS = -0.722') });
    });

    it('should refuse a value that is not a number', () => {
      const text = replaceLine(OPM, 'Y_DOT', 'Y_DOT = 1.2.3 [km/s]');
      expect(failure(() => readOpm(text))).toMatchObject({ field: 'Y_DOT', line: lineOf(OPM, 'Y_DOT') });
    });
  });

  describe('when a KVN line is longer than the standard allows', () => {
    it('should name the line', () => {
      const text = replaceLine(OPM, 'COMMENT State Vector', `COMMENT ${'x'.repeat(260)}`);
      expect(failure(() => readOpm(text))).toMatchObject({ field: 'file', line: lineOf(OPM, 'COMMENT State Vector') });
    });
  });

  describe('when OEM epochs do not increase', () => {
    it('should name the line of the out-of-order epoch and the line it fails to follow', () => {
      const lines = OEM.split('\n');
      const third = lineOf(OEM, '2030-05-17T06:04:00.000');
      [lines[third - 1], lines[third]] = [lines[third], lines[third - 1]];
      const error = failure(() => readOem(lines.join('\n')));
      expect([error.field, error.line]).toEqual(['EPOCH', third + 1]);
      expect(error.message).toMatch(new RegExp(`does not follow 2030-05-17T06:06:00.000 \\(line ${third}\\)`));
    });

    it('should refuse a repeated epoch', () => {
      const text = OEM.replace('2030-05-17T06:02:00.000 ', '2030-05-17T06:00:00.000 ');
      expect(failure(() => readOem(text)).line).toBe(lineOf(OEM, '2030-05-17T06:02:00.000'));
    });
  });

  describe('when an OEM segment is malformed', () => {
    it('should refuse an ephemeris line with six fields', () => {
      const line = lineOf(OEM, '2030-05-17T06:04:00.000');
      const text = OEM.replace(/^(2030-05-17T06:04:00.000 .*) \S+$/m, '$1');
      expect(failure(() => readOem(text))).toMatchObject({ field: 'data', line });
    });

    it('should refuse a line outside START_TIME..STOP_TIME', () => {
      const text = replaceLine(replaceLine(OEM, 'STOP_TIME', 'STOP_TIME = 2030-05-17T06:12:00.000'),
        'USEABLE_STOP_TIME', 'USEABLE_STOP_TIME = 2030-05-17T06:12:00.000');
      expect(failure(() => readOem(text)).line).toBe(lineOf(OEM, '2030-05-17T06:14:00.000'));
    });

    it('should refuse a missing META_STOP', () => {
      const text = replaceLine(OEM, 'META_STOP', null);
      expect(failure(() => readOem(text))).toMatchObject({ field: 'META_STOP', line: lineOf(OEM, 'META_STOP') + 1 });
    });

    it('should refuse an interpolation method the standard does not list', () => {
      const text = replaceLine(OEM, 'INTERPOLATION =', 'INTERPOLATION = SPLINE');
      expect(failure(() => readOem(text))).toMatchObject({ field: 'INTERPOLATION', line: lineOf(OEM, 'INTERPOLATION =') });
    });
  });

  describe('when the XML is malformed', () => {
    it('should name the line of a mismatched end tag', () => {
      const xml = fixture('opm-earth.xml');
      const text = xml.replace('<Y units="km">37202.4036</Y>', '<Y units="km">37202.4036</Z>');
      expect(failure(() => readOpm(text)).line).toBe(lineOf(xml, '          <Y units="km">'));
    });

    it('should name the line of a wrong unit attribute', () => {
      const xml = fixture('oem-mars.xml');
      const text = xml.replace('<X units="km">-1335.338691</X>', '<X units="m">-1335338.691</X>');
      expect(failure(() => readOem(text)).line).toBe(lineOf(xml, '          <X units="km">-1335.338691'));
    });
  });
});
