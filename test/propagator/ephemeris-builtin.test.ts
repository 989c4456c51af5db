import * as Astronomy from 'astronomy-engine';
import { describe, expect, it } from 'vitest';
import {
  BODY_NAMES, BUILTIN_EPHEMERIS_SPAN, createBuiltinEphemeris, InvalidInputError, OutOfSpanError, parseEpoch,
  ttFromTdb,
} from '../../propagator/index.ts';
import type { BodyName } from '../../propagator/index.ts';

const ephemeris = createBuiltinEphemeris();
const epoch = parseEpoch('2027-05-01T00:00:00 TDB');

describe('built-in ephemeris (astronomy-engine)', () => {
  describe('when asked for a heliocentric planet state', () => {
    it('should equal astronomy-engine HelioState at the matching TT, converted to km and km/s', () => {
      const out = new Float64Array(6);
      ephemeris.stateInto('mars', 'sun', epoch, out);
      const s = Astronomy.HelioState(Astronomy.Body.Mars, Astronomy.AstroTime.FromTerrestrialTime(ttFromTdb(epoch) / 86400));
      const au = Astronomy.KM_PER_AU;
      expect(out[0]).toBeCloseTo(s.x * au, 6);
      expect(out[2]).toBeCloseTo(s.z * au, 6);
      expect(out[4]).toBeCloseTo((s.vy * au) / 86400, 12);
    });
    it('should give a heliocentric Earth distance within the orbit limits 0.983-1.017 au (common practice)', () => {
      const out = new Float64Array(3);
      ephemeris.positionInto('earth', 'sun', epoch, out);
      const au = Math.hypot(out[0], out[1], out[2]) / 149597870.7;
      expect(au).toBeGreaterThan(0.983);
      expect(au).toBeLessThan(1.017);
    });
  });
  describe('when asked for the Moon relative to the Earth', () => {
    it('should lie 356,000-407,000 km away moving near 1 km/s (perigee/apogee extremes, common practice)', () => {
      const out = new Float64Array(6);
      ephemeris.stateInto('moon', 'earth', epoch, out);
      const d = Math.hypot(out[0], out[1], out[2]);
      expect(d).toBeGreaterThan(356000);
      expect(d).toBeLessThan(407000);
      expect(Math.hypot(out[3], out[4], out[5])).toBeGreaterThan(0.9);
      expect(Math.hypot(out[3], out[4], out[5])).toBeLessThan(1.1);
    });
    it('should agree with the difference of the heliocentric Moon and Earth to 1 mm', () => {
      const direct = new Float64Array(6);
      const moon = new Float64Array(6);
      const earth = new Float64Array(6);
      ephemeris.stateInto('moon', 'earth', epoch, direct);
      ephemeris.stateInto('moon', 'sun', epoch, moon);
      ephemeris.stateInto('earth', 'sun', epoch, earth);
      for (let c = 0; c < 3; c++) expect(Math.abs(moon[c] - earth[c] - direct[c])).toBeLessThan(1e-6);
    });
  });
  describe('when target and centre swap', () => {
    it('should negate the state for every pair with the Sun and the Earth', () => {
      const a = new Float64Array(6);
      const b = new Float64Array(6);
      for (const body of BODY_NAMES) {
        for (const centre of ['sun', 'earth'] as BodyName[]) {
          ephemeris.stateInto(body, centre, epoch, a);
          ephemeris.stateInto(centre, body, epoch, b);
          for (let c = 0; c < 6; c++) expect(a[c] + b[c]).toBe(0);
        }
      }
    });
    it('should write at the given offset and give zero for a body relative to itself', () => {
      const out = new Float64Array(12).fill(7);
      ephemeris.stateInto('venus', 'venus', epoch, out, 6);
      expect([...out]).toEqual([7, 7, 7, 7, 7, 7, 0, 0, 0, 0, 0, 0]);
    });
  });
  describe('when the epoch or body is bad', () => {
    it('should throw OutOfSpanError just outside its span, never extrapolate', () => {
      const out = new Float64Array(6);
      expect(() => ephemeris.stateInto('mars', 'sun', BUILTIN_EPHEMERIS_SPAN.endTdbS + 1, out)).toThrow(OutOfSpanError);
      expect(() => ephemeris.positionInto('mars', 'sun', BUILTIN_EPHEMERIS_SPAN.startTdbS - 1, out)).toThrow(OutOfSpanError);
      expect(() => ephemeris.stateInto('mars', 'sun', BUILTIN_EPHEMERIS_SPAN.endTdbS, out)).not.toThrow();
    });
    it('should throw InvalidInputError for an unknown body or a non-finite epoch', () => {
      const out = new Float64Array(6);
      expect(() => ephemeris.stateInto('pluto' as BodyName, 'sun', epoch, out)).toThrow(InvalidInputError);
      expect(() => ephemeris.stateInto('mars', 'sun', Number.NaN, out)).toThrow(InvalidInputError);
    });
  });
});
