import { describe, expect, it } from 'vitest';
import { canonicalJson, parseProblem, planLeapSeconds, problemHash, problemSchema } from '../../planner/index.ts';
import { BUILTIN_LEAP_SECONDS } from '../../propagator/index.ts';
import * as z from 'zod';
import { twoBodyProblem } from './two-body-fixture.ts';

function fieldOf(input: unknown): string {
  try {
    parseProblem(input);
  } catch (error) {
    expect((error as Error).name).toBe('InvalidInputError');
    return (error as { field: string }).field;
  }
  throw new Error('expected InvalidInputError');
}

describe('problem schema', () => {
  describe('when the problem is valid', () => {
    it('should fill the defaults', () => {
      const p = parseProblem(twoBodyProblem());
      expect(p.forceModel.method).toBe('cowell');
      expect(p.burns[0].freeComponents).toEqual([true, true, true]);
      expect(p.limits.safeAltitudeKm).toBe(300);
    });
    it('should convert to JSON Schema for the OpenAPI document', () => {
      const schema = z.toJSONSchema(problemSchema, { io: 'input' }) as { properties?: Record<string, unknown> };
      expect(Object.keys(schema.properties ?? {})).toContain('targets');
    });
  });

  describe('when a field is malformed', () => {
    it('should name a tolerance of the wrong sign', () => {
      const p = twoBodyProblem();
      expect(fieldOf({ ...p, targets: [{ ...(p.targets[0] as object), toleranceKm: -1 }] })).toBe('targets[0].toleranceKm');
    });
    it('should name a non-finite number', () => {
      const p = twoBodyProblem();
      expect(fieldOf({ ...p, spacecraft: { ...p.spacecraft, massKg: Number.POSITIVE_INFINITY } })).toBe('spacecraft.massKg');
      expect(fieldOf({ ...p, initialState: { ...p.initialState, positionKm: [Number.NaN, 0, 0] } })).toBe('initialState.positionKm[0]');
    });
    it('should name an unknown body', () => {
      const p = twoBodyProblem();
      expect(fieldOf({ ...p, forceModel: { centralBody: 'vulcan' } })).toBe('forceModel.centralBody');
    });
    it('should name a malformed epoch', () => {
      expect(fieldOf({ ...twoBodyProblem(), endEpoch: '2026-13-01T00:00:00 TDB' })).toBe('endEpoch');
    });
  });

  describe('when fields contradict each other', () => {
    const p = twoBodyProblem();
    const target = p.targets[0] as Record<string, unknown>;
    it('should reject a target after the end of the span', () => {
      expect(fieldOf({ ...p, targets: [{ ...target, epoch: '2026-01-02T00:00:00 TDB' }] })).toBe('targets[0].epoch');
    });
    it('should name the end of a span that runs past the built-in ephemeris, never clip it', () => {
      // The built-in ephemeris stops at 2200-01-01 TDB (propagator/ephemeris): a later end is refused.
      const beyond = { ...p, endEpoch: '2250-01-01T00:00:00 TDB' };
      expect(() => parseProblem(beyond)).toThrow(expect.objectContaining({
        name: 'OutOfSpanError', field: 'endEpoch', message: expect.stringContaining('[1800-01-01T00:00:00 TDB, 2200-01-01T00:00:00 TDB]'),
      }));
      const early = { ...p, initialState: { ...p.initialState, epoch: '1700-01-01T00:00:00 TDB' } };
      expect(() => parseProblem(early)).toThrow(expect.objectContaining({ name: 'OutOfSpanError', field: 'initialState.epoch' }));
    });
    it('should reject a burn outside the span', () => {
      expect(fieldOf({ ...p, burns: [{ ...p.burns[0], epoch: '2025-12-31T00:00:00 TDB' }] })).toBe('burns[0].epoch');
    });
    it('should reject a burn after its target', () => {
      expect(fieldOf({ ...p, burns: [{ ...p.burns[0], epoch: '2026-01-01T01:30:00 TDB' }] })).toBe('targets[0].epoch');
    });
    it('should reject a periapsis target below the surface', () => {
      expect(fieldOf({ ...p, targets: [{ kind: 'periapsis-radius', body: 'earth', radiusKm: 6000, toleranceKm: 1 }] })).toBe('targets[0].radiusKm');
      expect(fieldOf({ ...p, targets: [{ kind: 'periapsis-altitude', body: 'earth', altitudeKm: -5, toleranceKm: 1 }] })).toBe('targets[0].altitudeKm');
    });
    it('should reject a problem with no free variable', () => {
      expect(fieldOf({ ...p, burns: [{ ...p.burns[0], freeComponents: [false, false, false] }] })).toBe('burns');
    });
    it('should reject a target body that is not in the force model', () => {
      expect(fieldOf({ ...p, targets: [{ kind: 'b-plane', body: 'mars', bDotTKm: 9000, bDotRKm: 0, toleranceKm: 1 }] })).toBe('targets[0].body');
    });
    it('should reject J2 for a body without a J2 constant', () => {
      expect(fieldOf({ ...p, forceModel: { centralBody: 'sun', centralJ2: true } })).toBe('forceModel.centralJ2');
    });
  });

  describe('when hashing', () => {
    it('should give the same hash whatever the key order or written defaults', () => {
      const a = parseProblem(twoBodyProblem());
      const reordered = JSON.parse(canonicalJson(a)) as unknown;
      const b = parseProblem({ ...twoBodyProblem(), forceModel: { relativeTolerance: 1e-12, centralBody: 'earth', method: 'cowell' } });
      const leap = planLeapSeconds(BUILTIN_LEAP_SECONDS);
      expect(problemHash(a, leap)).toMatch(/^[0-9a-f]{64}$/);
      expect(problemHash(parseProblem(reordered), leap)).toBe(problemHash(a, leap));
      expect(problemHash(b, leap)).toBe(problemHash(a, leap));
      expect(problemHash(parseProblem({ ...twoBodyProblem(), title: 'other' }), leap)).not.toBe(problemHash(a, leap));
      // Another leap-second table (here: a later expiry) makes it another problem: its UTC epochs may differ.
      expect(problemHash(a, { ...leap, expiresUtc: '2026-12-28' })).not.toBe(problemHash(a, leap));
    });
    it('should sort keys in canonical JSON', () => {
      expect(canonicalJson({ b: 1, a: [true, null, 'x'], c: undefined })).toBe('{"a":[true,null,"x"],"b":1}');
    });
  });
});
