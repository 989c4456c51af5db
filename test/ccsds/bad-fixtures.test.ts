/**
 * The malformed fixtures in test/fixtures/ccsds/bad/: hand-written (from memory, in the layout of the
 * CCSDS 502.0-B annex examples), one fault each. Each must be refused naming the keyword and the line.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { CcsdsFormatError, readOem, readOpm } from '../../ccsds/index.ts';

const BAD = new URL('../fixtures/ccsds/bad/', import.meta.url);

/** File → the keyword and 1-based line the reader must name, and what the message must say. */
const EXPECTED: Record<string, { keyword: string; line: number; message: RegExp }> = {
  'opm-missing-object-id.opm': { keyword: 'OBJECT_ID', line: 6, message: /required keyword OBJECT_ID missing; found keyword CENTER_NAME/ },
  'opm-bad-epoch.opm': { keyword: 'EPOCH', line: 10, message: /day 30 does not exist in 2030-02/ },
  'opm-ecliptic-frame.opm': { keyword: 'REF_FRAME', line: 8, message: /no J2000 ecliptic frame; the file should give its states in EME2000 or ICRF/ },
  'opm-unknown-centre.opm': { keyword: 'CENTER_NAME', line: 7, message: /centre 'PLUTO' is not one the propagator knows/ },
  'opm-wrong-unit.opm': { keyword: 'Y', line: 12, message: /unit \[m\] where the standard puts \[km\]/ },
  // The fault is reported on the block's first line (CX_X), where the matrix starts.
  'opm-covariance-not-psd.opm': { keyword: 'CX_X', line: 17, message: /not positive semi-definite/ },
  'opm-mismatched-end-tag.xml': { keyword: 'xml', line: 14, message: /<\/OBJECT_NAME> closes <OBJECT_ID>/ },
  'oem-epochs-not-increasing.oem': { keyword: 'EPOCH', line: 18, message: /does not follow 2030-05-17T06:04:00\.000 \(line 17\): epochs must increase/ },
  'oem-missing-meta-stop.oem': { keyword: 'META_STOP', line: 15, message: /expected META_STOP, found a data line/ },
};

function refusal(name: string): CcsdsFormatError {
  const text = readFileSync(new URL(name, BAD), 'utf8');
  try {
    (name.startsWith('oem') ? readOem : readOpm)(text);
  } catch (error) {
    if (error instanceof CcsdsFormatError) return error;
    throw error;
  }
  throw new Error(`${name} was accepted`);
}

describe('malformed CCSDS fixtures (bad/)', () => {
  describe('when each file is read', () => {
    for (const [name, expected] of Object.entries(EXPECTED)) {
      it(`should refuse ${name} naming ${expected.keyword} on line ${expected.line}`, () => {
        const error = refusal(name);
        expect([error.field, error.line]).toEqual([expected.keyword, expected.line]);
        expect(error.message).toMatch(new RegExp(`^${expected.keyword}: line ${expected.line}: `));
        expect(error.message).toMatch(expected.message);
      });
    }
  });

  describe('when the folder is listed', () => {
    it('should hold exactly the files this test expects (none unchecked, none missing)', () => {
      expect(readdirSync(BAD).sort()).toEqual(Object.keys(EXPECTED).sort());
    });
  });
});
