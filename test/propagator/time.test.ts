import { describe, expect, it } from 'vitest';
import {
  civilFromDays, daysFromCivil, formatEpoch, InvalidInputError, julianDateTdbToSeconds, OutOfSpanError,
  parseEpoch, taiFromTdb, taiMinusUtcS, tdbFromTt, tdbSecondsToJulianDateTdb, ttFromTdb,
} from '../../propagator/index.ts';
import type { TimeScale } from '../../propagator/index.ts';

describe('calendar arithmetic', () => {
  describe('when converting dates to day counts and back', () => {
    it('should put 2000-01-01 at day 0 and 1970-01-01 at day -10957 (Unix epoch: 30 years incl. 7 leap days)', () => {
      expect(daysFromCivil(2000, 1, 1)).toBe(0);
      expect(daysFromCivil(1970, 1, 1)).toBe(-10957);
    });
    it('should agree with the JS Date calendar on every 17th day over 1600-2400', () => {
      for (let d = -146097; d <= 146097; d += 17) {
        const date = new Date(Date.UTC(2000, 0, 1) + d * 86400000);
        expect(civilFromDays(d)).toEqual({ year: date.getUTCFullYear(), month: date.getUTCMonth() + 1, day: date.getUTCDate() });
        expect(daysFromCivil(date.getUTCFullYear(), date.getUTCMonth() + 1, date.getUTCDate())).toBe(d);
      }
    });
  });
});

describe('parseEpoch', () => {
  describe('when the text is in TDB', () => {
    it('should return 0 for J2000.0 itself', () => {
      expect(parseEpoch('2000-01-01T12:00:00 TDB')).toBe(0);
    });
    it('should count whole days exactly', () => {
      expect(parseEpoch('2000-01-02T12:00:00.000 TDB')).toBe(86400);
      expect(parseEpoch('1999-12-31 12:00:00 TDB')).toBe(-86400);
    });
  });
  describe('when the text names UTC with Z or a suffix', () => {
    it('should give the same epoch for both spellings', () => {
      expect(parseEpoch('2026-03-14T05:06:07.123Z')).toBe(parseEpoch('2026-03-14T05:06:07.123 UTC'));
    });
    it('should use the default scale only when none is written', () => {
      expect(parseEpoch('2026-03-14T05:06:07', 'TT')).toBe(parseEpoch('2026-03-14T05:06:07 TT'));
      expect(parseEpoch('2026-03-14T05:06:07 TDB', 'UTC')).toBe(parseEpoch('2026-03-14T05:06:07 TDB'));
    });
    it('should put a UTC reading 69.184 s (37 + 32.184, ± TDB−TT) after the same reading in TDB in 2026', () => {
      const utc = parseEpoch('2026-03-14T05:06:07Z');
      const tdb = parseEpoch('2026-03-14T05:06:07 TDB');
      expect(Math.abs(utc - tdb - 69.184)).toBeLessThan(2e-3);
    });
  });
  describe('when the text holds a leap second', () => {
    it('should make 2016-12-31T23:59:60 one second after :59 and one before 2017-01-01T00:00:00', () => {
      const a = parseEpoch('2016-12-31T23:59:59Z');
      const leap = parseEpoch('2016-12-31T23:59:60Z');
      const b = parseEpoch('2017-01-01T00:00:00Z');
      expect(leap - a).toBeCloseTo(1, 6);
      expect(b - leap).toBeCloseTo(1, 6);
    });
    it('should refuse 23:59:60 on a day without a leap second', () => {
      expect(() => parseEpoch('2017-12-31T23:59:60Z')).toThrow(/no leap second/);
    });
    it('should refuse 23:59:60 past the table\'s expiry, pointing to a newer list, and read :59.5 as usual', () => {
      expect(() => parseEpoch('2026-06-30T23:59:60Z')).toThrow(InvalidInputError);
      expect(() => parseEpoch('2026-06-30T23:59:60Z')).toThrow(/expires 2026-06-28.*VEER_LEAP_SECONDS/);
      expect(parseEpoch('2026-06-30T23:59:59.5Z')).toBeGreaterThan(parseEpoch('2026-06-30T23:59:59Z'));
    });
  });
  describe('when the text is wrong', () => {
    const cases: Array<[string, RegExp]> = [
      ['2026-13-01T00:00:00Z', /month 13/],
      ['2026-02-29T00:00:00Z', /day 29 does not exist/],
      ['2026-01-01T24:00:00Z', /hour 24/],
      ['2026-01-01T00:60:00Z', /minute 60/],
      ['2026-01-01T00:00:61Z', /second 61/],
      ['2026-01-01T00:00:60 TT', /second 60/],
      ['2026-01-01', /not an ISO-8601 epoch/],
      ['2026-01-01T00:00:00 GPS', /not an ISO-8601 epoch/],
      ['2026-01-01T00:00:00', /names no time scale/],
    ];
    for (const [text, message] of cases) {
      it(`should throw InvalidInputError naming the problem for '${text}'`, () => {
        expect(() => parseEpoch(text, undefined, 'burns[0].epoch')).toThrow(InvalidInputError);
        expect(() => parseEpoch(text, undefined, 'burns[0].epoch')).toThrow(message);
        expect(() => parseEpoch(text, undefined, 'burns[0].epoch')).toThrow(/^burns\[0\]\.epoch: /);
      });
    }
  });
  describe('when a UTC epoch is outside the leap-second table', () => {
    it('should throw OutOfSpanError before 1972', () => {
      expect(() => parseEpoch('1971-12-31T23:59:59Z')).toThrow(OutOfSpanError);
      expect(() => parseEpoch('1971-12-31T23:59:59Z')).toThrow(/before 1972-01-01 UTC/);
    });
    it('should read a date past the expiry with the last TAI − UTC (37 s), not refuse it', () => {
      // TAI − UTC = 37 s assumed: the UTC reading lies 37 s before the same reading in TAI.
      expect(parseEpoch('2027-08-11T00:00:00Z')).toBe(parseEpoch('2027-08-11T00:00:37 TAI'));
      expect(formatEpoch(parseEpoch('2027-08-11T10:20:30.250Z'), 'UTC')).toBe('2027-08-11T10:20:30.250 UTC');
    });
    it('should still accept the same readings in TDB, TT and TAI (no table needed)', () => {
      expect(Number.isFinite(parseEpoch('1960-01-01T00:00:00 TAI'))).toBe(true);
      expect(Number.isFinite(parseEpoch('2040-01-01T00:00:00 TT'))).toBe(true);
    });
  });
});

describe('formatEpoch', () => {
  describe('when formatting in each scale', () => {
    it('should print the example epoch back as written', () => {
      expect(formatEpoch(parseEpoch('2026-03-14T05:06:07.123Z'), 'UTC')).toBe('2026-03-14T05:06:07.123 UTC');
      expect(formatEpoch(0, 'TDB', 0)).toBe('2000-01-01T12:00:00 TDB');
    });
    it('should print a leap second as 23:59:60', () => {
      expect(formatEpoch(parseEpoch('2016-12-31T23:59:60.250Z'), 'UTC')).toBe('2016-12-31T23:59:60.250 UTC');
      expect(formatEpoch(parseEpoch('1994-06-30T23:59:60.9Z'), 'UTC', 1)).toBe('1994-06-30T23:59:60.9 UTC');
    });
    it('should round just before a leap second up to 23:59:60.000 and the end of one to midnight', () => {
      expect(formatEpoch(parseEpoch('2016-12-31T23:59:59.9999Z'), 'UTC')).toBe('2016-12-31T23:59:60.000 UTC');
      expect(formatEpoch(parseEpoch('2016-12-31T23:59:60.9999Z'), 'UTC')).toBe('2017-01-01T00:00:00.000 UTC');
    });
    it('should reject fraction digits outside [0, 6] and non-finite epochs', () => {
      expect(() => formatEpoch(0, 'TDB', 7)).toThrow(InvalidInputError);
      expect(() => formatEpoch(Number.NaN, 'TDB')).toThrow(InvalidInputError);
    });
  });
  describe('when round-tripping parse(format(x))', () => {
    const scales: TimeScale[] = ['UTC', 'TAI', 'TT', 'TDB'];
    it('should return within half a unit of the last printed digit (plus float64 rounding)', () => {
      // Pseudo-random epochs over 1972-2026 from a fixed linear congruential sequence (reproducible).
      let seed = 12345;
      const lo = parseEpoch('1972-01-01T00:00:01Z');
      const hi = parseEpoch('2026-06-30T00:00:00Z');
      for (let i = 0; i < 400; i++) {
        seed = (seed * 1103515245 + 12345) % 2147483648;
        const x = lo + (hi - lo) * (seed / 2147483648);
        const scale = scales[i % 4];
        const digits = i % 7;
        const back = parseEpoch(formatEpoch(x, scale, digits));
        expect(Math.abs(back - x)).toBeLessThanOrEqual(0.5 * 10 ** -digits + 3e-7);
        expect(formatEpoch(back, scale, digits)).toBe(formatEpoch(x, scale, digits));
      }
    });
  });
});

describe('scale conversions', () => {
  describe('when converting TT to TDB and back', () => {
    it('should invert to float64 round-off over 1900-2100', () => {
      for (let t = -3.2e9; t <= 3.2e9; t += 1.37e7) {
        expect(Math.abs(ttFromTdb(tdbFromTt(t)) - t)).toBeLessThan(1e-6);
      }
    });
  });
  describe('when reading TAI from TDB', () => {
    it('should differ from TT by exactly 32.184 s (to float64 rounding)', () => {
      expect(ttFromTdb(1e8) - taiFromTdb(1e8)).toBeCloseTo(32.184, 9);
    });
  });
  describe('when asking TAI−UTC', () => {
    it('should step on the table dates and accept Date objects', () => {
      expect(taiMinusUtcS('1972-01-01')).toBe(10);
      expect(taiMinusUtcS('1972-06-30T23:59:60')).toBe(10);
      expect(taiMinusUtcS('1972-07-01')).toBe(11);
      expect(taiMinusUtcS(new Date(Date.UTC(2012, 5, 30, 12)))).toBe(34);
      expect(taiMinusUtcS(new Date(Date.UTC(2012, 6, 1)))).toBe(35);
    });
    it('should throw OutOfSpanError before the table and keep the last offset past its expiry', () => {
      expect(() => taiMinusUtcS('1971-12-31')).toThrow(OutOfSpanError);
      expect(taiMinusUtcS('2027-01-01')).toBe(37);
    });
  });
  describe('when using Julian dates', () => {
    it('should map J2000 to JD 2451545.0 and back', () => {
      expect(tdbSecondsToJulianDateTdb(0)).toBe(2451545);
      expect(julianDateTdbToSeconds(2451545.5)).toBe(43200);
      expect(julianDateTdbToSeconds(tdbSecondsToJulianDateTdb(8.1e8))).toBeCloseTo(8.1e8, 3);
    });
  });
});
