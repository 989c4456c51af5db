/**
 * Leap seconds against published sources.
 * - The IERS leap-seconds.list updated through IERS Bulletin C 70 (copy in test/fixtures/leap-seconds, public
 *   domain, as shipped in tzdata 2025b): the TAI − UTC steps of Bulletin C and the list's own #h SHA-1.
 * - FIPS 180-2 appendix A: the SHA-1 examples "abc" and the 448-bit message (values from the standard,
 *   written from memory and agreeing with Node's crypto).
 */
import { readFileSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import {
  BUILTIN_LEAP_SECONDS, formatEpoch, parseEpoch, parseLeapSecondsList, taiFromTdb, taiMinusUtcS, utcDateText,
} from '../../propagator/index.ts';
import { sha1HexOfAscii } from '../../propagator/time/sha1.ts';

const IERS_TEXT = readFileSync('test/fixtures/leap-seconds/iers-2025-07.list', 'utf8');
const IERS = parseLeapSecondsList(IERS_TEXT, 'iers-2025-07.list');

describe('SHA-1 of the #h line', () => {
  it('should give the FIPS 180-2 appendix A digests', () => {
    expect(sha1HexOfAscii('abc')).toBe('a9993e364706816aba3e25717850c26c9cd0d89d');
    expect(sha1HexOfAscii('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq')).toBe('84983e441c3bd26ebaae4aa1f95129e5e54670f1');
  });
  it('should agree with Node\'s crypto on every length across two blocks', () => {
    for (let n = 0; n < 140; n++) {
      const text = '0123456789'.repeat(14).slice(0, n);
      expect(sha1HexOfAscii(text)).toBe(createHash('sha1').update(text).digest('hex'));
    }
  });
});

describe('UTC across every leap second of IERS Bulletin C', () => {
  // Each step after the first ends the day before it with 23:59:60 (all leap seconds so far were positive).
  for (const [i, step] of IERS.steps.entries()) {
    if (i === 0) continue;
    const before = IERS.steps[i - 1].taiMinusUtcS;
    const lastDay = utcDateText(step.utcDay - 1);
    it(`should count ${lastDay}T23:59:60 and step TAI − UTC from ${before} s to ${step.taiMinusUtcS} s`, () => {
      const texts = [`${lastDay}T23:59:59.500 UTC`, `${lastDay}T23:59:60.000 UTC`, `${lastDay}T23:59:60.750 UTC`, `${utcDateText(step.utcDay)}T00:00:00.000 UTC`];
      const tdb = texts.map((t) => parseEpoch(t, undefined, 'epoch', BUILTIN_LEAP_SECONDS));
      // UTC → TDB → UTC gives the text back, the leap second included.
      tdb.forEach((t, k) => expect(formatEpoch(t, 'UTC', 3, BUILTIN_LEAP_SECONDS)).toBe(texts[k]));
      // TAI seconds between the readings: 0.5, 0.75, 0.25 (the inserted second is counted).
      const tai = tdb.map(taiFromTdb);
      expect(tai[1] - tai[0]).toBeCloseTo(0.5, 6);
      expect(tai[2] - tai[1]).toBeCloseTo(0.75, 6);
      expect(tai[3] - tai[2]).toBeCloseTo(0.25, 6);
      expect(taiMinusUtcS(`${lastDay}T23:59:59`, BUILTIN_LEAP_SECONDS)).toBe(before);
      expect(taiMinusUtcS(utcDateText(step.utcDay), BUILTIN_LEAP_SECONDS)).toBe(step.taiMinusUtcS);
      // The same instant read in TAI: UTC + TAI − UTC.
      expect(tai[3]).toBe(taiFromTdb(parseEpoch(`${utcDateText(step.utcDay)}T00:00:${step.taiMinusUtcS} TAI`)));
    });
  }
  describe('when the epoch lies past the list\'s expiry (2026-06-28)', () => {
    it('should keep TAI − UTC = 37 s and still round-trip, on the expiry day and years after', () => {
      for (const text of ['2026-06-27T23:59:59.999 UTC', '2026-06-28T00:00:00.000 UTC', '2026-06-30T23:59:59.250 UTC', '2027-08-11T06:00:00.125 UTC', '2040-01-01T00:00:00.000 UTC']) {
        const t = parseEpoch(text, undefined, 'epoch', IERS);
        expect(formatEpoch(t, 'UTC', 3, IERS)).toBe(text);
        expect(taiMinusUtcS(text.slice(0, 10), IERS)).toBe(37);
      }
    });
  });
});
