/**
 * Time scales against published values and independent implementations.
 * Sources: IERS Bulletin C (TAI − UTC steps; from memory), IAU 1991 Resolution A4 (TT − TAI = 32.184 s),
 * the test program of ERFA (t_erfa_c.c: eraDat, eraD2dtf and eraDtdb cases; ERFA is the open copy of the
 * IAU SOFA library), and the Astronomical Almanac's short TDB formula (from memory).
 * astronomy-engine does not expose TDB; its TT − UT (a ΔT model that treats UTC as UT1) was tried as a
 * cross-check of TT − UTC but differs by up to 1.9 s over 1990–2025 with no stated bound, so it is not used.
 */
import { describe, expect, it } from 'vitest';
import {
  formatEpoch, julianDateTdbToSeconds, parseEpoch, taiFromTdb, tdbFromTai, taiMinusUtcS, tdbMinusTtS, ttFromTdb,
} from '../../propagator/index.ts';

describe('UTC and TAI', () => {
  describe('when reading TAI − UTC around 2017-01-01 (IERS Bulletin C 52: leap second end of 2016)', () => {
    it('should be 37 s from 2017-01-01 and 36 s before', () => {
      expect(taiMinusUtcS('2017-01-01T00:00:00')).toBe(37);
      expect(taiMinusUtcS('2016-12-31T23:59:59')).toBe(36);
      expect(taiMinusUtcS('2015-07-01')).toBe(36);
      expect(taiMinusUtcS('2025-06-01')).toBe(37);
    });
    it('should make 2017-01-01T00:00:00 UTC equal 2017-01-01T00:00:37 TAI', () => {
      expect(parseEpoch('2017-01-01T00:00:00Z')).toBe(parseEpoch('2017-01-01T00:00:37 TAI'));
    });
  });
  describe('when compared with the ERFA test program (eraDat cases)', () => {
    it('should give 32 s on 2003-06-01, 33 s on 2008-01-17 and 37 s on 2017-09-01', () => {
      expect(taiMinusUtcS('2003-06-01')).toBe(32);
      expect(taiMinusUtcS('2008-01-17')).toBe(33);
      expect(taiMinusUtcS('2017-09-01')).toBe(37);
    });
  });
  describe('when a leap second is counted (ERFA eraD2dtf case: MJD 49533.99999 UTC → 1994-06-30 23:59:60.13599)', () => {
    it('should read 86400.13599 SI seconds after 1994-06-30T00:00 UTC as 23:59:60.13599', () => {
      // ERFA's quasi-JD for UTC stretches a leap-second day over 86401 s: 0.99999 × 86401 = 86400.13599 s.
      // SI seconds are counted in TAI (adding them to TDB would add the ~28 µs/day drift of TDB − TT).
      const dayStartTai = taiFromTdb(parseEpoch('1994-06-30T00:00:00Z'));
      expect(formatEpoch(tdbFromTai(dayStartTai + 0.99999 * 86401), 'UTC', 5)).toBe('1994-06-30T23:59:60.13599 UTC');
    });
  });
});

describe('TT and TAI', () => {
  describe('when converting (IAU 1991 Resolution A4: TT = TAI + 32.184 s)', () => {
    it('should place a TT reading 32.184 s after the same TAI reading', () => {
      const tt = parseEpoch('2026-01-01T00:00:00 TT');
      const tai = parseEpoch('2026-01-01T00:00:00 TAI');
      expect(tai - tt).toBeCloseTo(32.184, 6);
      expect(ttFromTdb(tt) - taiFromTdb(tt)).toBeCloseTo(32.184, 6);
    });
  });
});

describe('TDB − TT', () => {
  describe('when sampled every 3.1 days over 1980–2050', () => {
    it('should stay below 2 ms in size (the periodic terms sum to < 1.7 ms)', () => {
      let worst = 0;
      for (let t = parseEpoch('1980-01-01T00:00:00 TT'); t < parseEpoch('2050-01-01T00:00:00 TT'); t += 3.1 * 86400) {
        worst = Math.max(worst, Math.abs(tdbMinusTtS(t)));
      }
      expect(worst).toBeLessThan(2e-3);
      expect(worst).toBeGreaterThan(1.6e-3); // the annual term's 1.657 ms amplitude is reached
    });
  });
  describe('when compared with ERFA eraDtdb (full Fairhead & Bretagnon series, t_erfa_c.c case)', () => {
    it('should agree within 12 µs at TDB JD 2448939.5 + 0.123', () => {
      // ERFA: eraDtdb(2448939.5, 0.123, 0.76543, 5.0123, 5525.242, 3190.0) = -0.1280368005936998991e-2 s,
      // which includes a topocentric part (≤ ~2 µs for u = 5525 km); the truncated series is good to ~10 µs.
      const ours = tdbMinusTtS(julianDateTdbToSeconds(2448939.623));
      expect(Math.abs(ours - -0.1280368005936998991e-2)).toBeLessThan(12e-6);
    });
  });
  describe('when compared with the Astronomical Almanac short formula (from memory)', () => {
    it('should agree within 50 µs over 1980–2050 (the short formula omits terms summing to ~40 µs)', () => {
      // TDB − TT ≈ 0.001657 sin g + 0.000014 sin 2g, g = 357.53° + 0.98560028° (JD − 2451545.0).
      let worst = 0;
      for (let jd = 2444239.5; jd < 2469807.5; jd += 1.7) {
        const g = (357.53 + 0.98560028 * (jd - 2451545)) * (Math.PI / 180);
        const almanac = 0.001657 * Math.sin(g) + 0.000014 * Math.sin(2 * g);
        worst = Math.max(worst, Math.abs(almanac - tdbMinusTtS(julianDateTdbToSeconds(jd))));
      }
      expect(worst).toBeLessThan(50e-6);
    });
  });
});
