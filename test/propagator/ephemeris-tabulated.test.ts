import { describe, expect, it } from 'vitest';
import {
  createBuiltinEphemeris, createTabulatedEphemeris, InvalidInputError, layerEphemerides, OutOfSpanError, parseEpoch,
} from '../../propagator/index.ts';
import type { TabulatedStateRecord, Vec3 } from '../../propagator/index.ts';

// A circular orbit has a closed-form state at any time, so interpolation errors are measured exactly.
const GM = 398600.4418;
const RADIUS_KM = 7000;
const n = Math.sqrt(GM / RADIUS_KM ** 3);
function circular(t: number): { p: Vec3; v: Vec3 } {
  const a = n * t;
  return {
    p: [RADIUS_KM * Math.cos(a), RADIUS_KM * Math.sin(a) * 0.8, RADIUS_KM * Math.sin(a) * 0.6],
    v: [-RADIUS_KM * n * Math.sin(a), RADIUS_KM * n * Math.cos(a) * 0.8, RADIUS_KM * n * Math.cos(a) * 0.6],
  };
}
const STEP_S = 60;
const records: TabulatedStateRecord[] = Array.from({ length: 101 }, (_, i) => {
  const s = circular(i * STEP_S);
  return { epochTdbS: i * STEP_S, positionKm: s.p, velocityKmS: s.v };
});

function maxError(interpolation: 'lagrange' | 'hermite', degree: number): [number, number] {
  const eph = createTabulatedEphemeris({ name: 'circle', target: 'moon', centre: 'earth', records, interpolation, degree });
  const out = new Float64Array(6);
  let dp = 0;
  let dv = 0;
  for (let t = 0; t <= 100 * STEP_S; t += 7.3) {
    eph.stateInto('moon', 'earth', t, out);
    const s = circular(t);
    dp = Math.max(dp, Math.hypot(out[0] - s.p[0], out[1] - s.p[1], out[2] - s.p[2]));
    dv = Math.max(dv, Math.hypot(out[3] - s.v[0], out[4] - s.v[1], out[5] - s.v[2]));
  }
  return [dp, dv];
}

describe('tabulated ephemeris', () => {
  describe('when interpolating a circular orbit sampled every 60 s (~1/97 of a period)', () => {
    it('should reach ~mm with Lagrange degree 7 and improve with degree (error ∝ (nh)^(d+1))', () => {
      const [dp7] = maxError('lagrange', 7);
      const [dp3] = maxError('lagrange', 3);
      expect(dp7).toBeLessThan(1e-6);
      expect(dp3).toBeLessThan(1e-2);
      expect(dp7).toBeLessThan(dp3 / 100);
    });
    it('should reach ~mm with Hermite degree 5 and give a velocity consistent with the position', () => {
      const [dp, dv] = maxError('hermite', 5);
      expect(dp).toBeLessThan(1e-6);
      expect(dv).toBeLessThan(1e-8);
    });
    it('should return the records exactly at their epochs', () => {
      const eph = createTabulatedEphemeris({ name: 'circle', target: 'moon', centre: 'earth', records, interpolation: 'hermite', degree: 3 });
      const out = new Float64Array(6);
      eph.stateInto('moon', 'earth', 50 * STEP_S, out);
      expect(out[0]).toBeCloseTo(records[50].positionKm[0], 9);
      expect(out[4]).toBeCloseTo(records[50].velocityKmS[1], 12);
    });
    it('should negate the state when asked the other way round', () => {
      const eph = createTabulatedEphemeris({ name: 'circle', target: 'moon', centre: 'earth', records });
      const a = new Float64Array(6);
      const b = new Float64Array(6);
      eph.stateInto('moon', 'earth', 1000, a);
      eph.stateInto('earth', 'moon', 1000, b);
      for (let c = 0; c < 6; c++) expect(a[c]).toBe(-b[c]);
    });
  });
  describe('when the epoch lies outside the records', () => {
    it('should throw OutOfSpanError, never extrapolate', () => {
      const eph = createTabulatedEphemeris({ name: 'circle', target: 'moon', centre: 'earth', records });
      expect(() => eph.stateInto('moon', 'earth', -0.001, new Float64Array(6))).toThrow(OutOfSpanError);
      expect(() => eph.stateInto('moon', 'earth', 6000.001, new Float64Array(6))).toThrow(OutOfSpanError);
    });
  });
  describe('when the records are bad', () => {
    it('should name the offending record or option', () => {
      const unsorted = [records[1], records[0], ...records.slice(2)];
      expect(() => createTabulatedEphemeris({ name: 'x', target: 'moon', centre: 'earth', records: unsorted }))
        .toThrow(/records\[1\]\.epochTdbS/);
      const nan = [...records];
      nan[3] = { ...records[3], positionKm: [Number.NaN, 0, 0] };
      expect(() => createTabulatedEphemeris({ name: 'x', target: 'moon', centre: 'earth', records: nan })).toThrow(/records\[3\]/);
      expect(() => createTabulatedEphemeris({ name: 'x', target: 'moon', centre: 'earth', records: records.slice(0, 4) }))
        .toThrow(/at least 8 records/);
      expect(() => createTabulatedEphemeris({ name: 'x', target: 'moon', centre: 'earth', records, interpolation: 'hermite', degree: 4 }))
        .toThrow(InvalidInputError);
      expect(() => createTabulatedEphemeris({ name: 'x', target: 'moon', centre: 'moon', records })).toThrow(/centre/);
    });
  });
});

describe('layerEphemerides', () => {
  const builtin = createBuiltinEphemeris();
  const t0 = parseEpoch('2027-03-01T00:00:00 TDB');
  // The built-in Moon tabulated hourly, shifted by a known 1000 km along x so the layer's effect shows.
  const moonRecords: TabulatedStateRecord[] = Array.from({ length: 49 }, (_, i) => {
    const s = new Float64Array(6);
    builtin.stateInto('moon', 'earth', t0 + i * 3600, s);
    return { epochTdbS: t0 + i * 3600, positionKm: [s[0] + 1000, s[1], s[2]], velocityKmS: [s[3], s[4], s[5]] };
  });
  const moonTable = createTabulatedEphemeris({ name: 'moon table', target: 'moon', centre: 'earth', records: moonRecords });
  const layered = layerEphemerides(moonTable, builtin);

  describe('when a tabulated Moon stands in for the built-in one', () => {
    it('should use the table for the Moon relative to any centre, chained through the Earth', () => {
      const a = new Float64Array(6);
      const b = new Float64Array(6);
      for (const centre of ['earth', 'sun', 'mars'] as const) {
        layered.stateInto('moon', centre, t0 + 5000, a);
        builtin.stateInto('moon', centre, t0 + 5000, b);
        expect(a[0] - b[0]).toBeCloseTo(1000, 3);
        expect(Math.abs(a[1] - b[1])).toBeLessThan(1e-3);
        layered.positionInto(centre, 'moon', t0 + 5000, a);
        expect(a[0] + b[0]).toBeCloseTo(-1000, 3); // centre relative to the Moon is the negation
      }
    });
    it('should leave other pairs to the fallback', () => {
      const a = new Float64Array(6);
      const b = new Float64Array(6);
      layered.stateInto('venus', 'earth', t0 + 5000, a);
      builtin.stateInto('venus', 'earth', t0 + 5000, b);
      expect([...a]).toEqual([...b]);
    });
    it('should refuse a table whose span does not overlap the fallback', () => {
      const early = createTabulatedEphemeris({ name: 'early', target: 'moon', centre: 'earth', records: moonRecords
        .map((r) => ({ ...r, epochTdbS: r.epochTdbS - 1e10 })) });
      expect(() => layerEphemerides(early, builtin)).toThrow(/do not overlap/);
    });
    it('should take the intersection of spans and refuse epochs outside it', () => {
      expect(layered.span).toEqual({ startTdbS: t0, endTdbS: t0 + 48 * 3600 });
      expect(() => layered.stateInto('venus', 'earth', t0 - 1, new Float64Array(6))).toThrow(OutOfSpanError);
    });
  });
});
