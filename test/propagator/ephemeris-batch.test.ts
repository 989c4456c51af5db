/**
 * The batch look-up (planBodyPositions): all perturbers relative to one centre per epoch. Checked against
 * the astronomy-engine npm package (the built-in source, an outside reference) and against the same
 * source's one-body look-ups. Limits: the cache's documented accuracy against its source (< 1 m planets,
 * < 0.1 m Moon, as in ephemeris-chebyshev.test.ts).
 */
import { describe, expect, it } from 'vitest';
import {
  buildChebyshevEphemeris, createBuiltinEphemeris, InvalidInputError, OutOfSpanError, parseEpoch, planBodyPositions,
} from '../../propagator/index.ts';
import type { BodyName } from '../../propagator/index.ts';

const source = createBuiltinEphemeris();
const start = parseEpoch('2031-03-01T00:00:00 TDB');
const end = start + 90 * 86400;
const cache = buildChebyshevEphemeris(source, {
  bodies: ['sun', 'mercury', 'venus', 'earth', 'moon', 'mars', 'jupiter', 'saturn', 'uranus', 'neptune'], startTdbS: start, endTdbS: end,
});
const FROM_SUN: BodyName[] = ['mercury', 'venus', 'earth', 'moon', 'mars', 'jupiter', 'saturn', 'uranus', 'neptune'];
const FROM_EARTH: BodyName[] = ['sun', 'moon', 'mars', 'jupiter'];
/** Epochs spread by an irrational step so they fall everywhere within segments (common practice). */
const epochs = Array.from({ length: 200 }, (_, i) => start + (end - start) * ((i * 0.6180339887498949) % 1));

/** Largest distance (km) per target between the batch look-up and one-body look-ups on `reference`. */
function worstPerTarget(targets: BodyName[], centre: BodyName, reference: typeof source): number[] {
  const plan = planBodyPositions(cache, targets, centre);
  const batch = new Float64Array(3 * targets.length + 3);
  const one = new Float64Array(3);
  const worst = targets.map(() => 0);
  for (const t of epochs) {
    plan.positionsInto(t, batch, 3);
    targets.forEach((body, i) => {
      reference.positionInto(body, centre, t, one, 0);
      const o = 3 + 3 * i;
      worst[i] = Math.max(worst[i], Math.hypot(batch[o] - one[0], batch[o + 1] - one[1], batch[o + 2] - one[2]));
    });
  }
  return worst;
}

describe('batch ephemeris look-up', () => {
  describe('when the Chebyshev cache gives nine perturbers from the Sun', () => {
    it('should match astronomy-engine within 1 m for every body (0.1 m for the Moon)', () => {
      const worst = worstPerTarget(FROM_SUN, 'sun', source);
      FROM_SUN.forEach((body, i) => expect(worst[i], body).toBeLessThan(body === 'moon' ? 1e-4 + 1e-3 : 1e-3));
    });

    it('should agree with the cache\'s own one-body look-ups to rounding (1e-15 relative)', () => {
      const worst = worstPerTarget(FROM_SUN, 'sun', cache);
      // Largest distance from the Sun among these bodies is Neptune's, ~4.5e9 km.
      worst.forEach((w) => expect(w).toBeLessThan(4.5e9 * 1e-15));
    });
  });

  describe('when the centre is the Earth', () => {
    it('should give the Moon from its own geocentric series, matching astronomy-engine within 0.1 m', () => {
      const worst = worstPerTarget(FROM_EARTH, 'earth', source);
      expect(worst[1]).toBeLessThan(1e-4);
      [0, 2, 3].forEach((i) => expect(worst[i]).toBeLessThan(1e-3));
    });
  });

  describe('when several propagations ask the same cache for the same bodies', () => {
    it('should share one plan, whose interleaved look-ups equal those of a plan alone', () => {
      const first = planBodyPositions(cache, FROM_EARTH, 'earth');
      const second = planBodyPositions(cache, [...FROM_EARTH], 'earth');
      expect(second).toBe(first);
      expect(planBodyPositions(cache, FROM_EARTH.slice(1), 'earth')).not.toBe(first);
      // Reference: each epoch looked up on its own, before any interleaving (the plan keeps no state between calls).
      const alone = epochs.slice(0, 20).map((t) => { const o = new Float64Array(12); first.positionsInto(t, o); return Array.from(o); });
      const a = new Float64Array(12);
      const b = new Float64Array(12);
      epochs.slice(0, 20).forEach((t, i) => {
        first.positionsInto(t, a);
        second.positionsInto(epochs[19 - i], b);
        expect(Array.from(a)).toEqual(alone[i]);
        expect(Array.from(b)).toEqual(alone[19 - i]);
      });
    });
  });

  describe('when the source has no batch call of its own', () => {
    it('should fall back to one positionInto per body and give exactly those values', () => {
      const plan = planBodyPositions(source, FROM_EARTH, 'earth');
      const batch = new Float64Array(3 * FROM_EARTH.length);
      const one = new Float64Array(3);
      plan.positionsInto(epochs[7], batch);
      FROM_EARTH.forEach((body, i) => {
        source.positionInto(body, 'earth', epochs[7], one, 0);
        expect(Array.from(batch.subarray(3 * i, 3 * i + 3))).toEqual(Array.from(one));
      });
    });
  });

  describe('when asked outside the span or for a body the source lacks', () => {
    it('should throw OutOfSpanError rather than extrapolate, and answer at both ends', () => {
      const plan = planBodyPositions(cache, FROM_SUN, 'sun');
      const out = new Float64Array(27);
      expect(() => plan.positionsInto(end + 1, out)).toThrow(OutOfSpanError);
      expect(() => plan.positionsInto(start - 1, out)).toThrow(OutOfSpanError);
      expect(() => plan.positionsInto(Number.NaN, out)).toThrow(InvalidInputError);
      expect(() => plan.positionsInto(start, out)).not.toThrow();
      expect(() => plan.positionsInto(end, out)).not.toThrow();
    });

    it('should name the field when the plan is made', () => {
      const small = buildChebyshevEphemeris(source, { bodies: ['earth'], startTdbS: start, endTdbS: start + 86400 });
      expect(() => planBodyPositions(small, ['earth', 'mars'], 'sun')).toThrow(/targets\[1\]/);
      expect(() => planBodyPositions(small, ['earth'], 'moon')).toThrow(InvalidInputError);
    });
  });
});
