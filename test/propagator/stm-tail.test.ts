/**
 * The stepper's linear tail (integrator-types.ts LinearTail): with the STM split off, a trial step's STM is
 * integrated only once the step is accepted. The split must change nothing — same steps, same state, same Φ
 * to the last bit — which this checks against the full right-hand side on a Mars flyby, whose approach
 * rejects many trial steps (common practice: equivalence to the formulation it replaces). Dense output
 * likewise readies the STM's part only when a caller asks for more than the state.
 */
import { describe, expect, it } from 'vitest';
import { createCowellDynamics } from '../../propagator/cowell.ts';
import { InvalidInputError } from '../../contract/errors.ts';
import { ForceModel } from '../../propagator/forces/index.ts';
import { Dop853Stepper } from '../../propagator/integrators/index.ts';
import { flybyEphemeris, flybyStart, forcesAbout, PERIAPSIS_EPOCH } from './flyby-fixture.ts';

function integrate(split: boolean): Dop853Stepper {
  const { helio } = flybyStart(2.5);
  const model = new ForceModel(forcesAbout('sun'), flybyEphemeris);
  const dynamics = createCowellDynamics(model, [...helio.positionKm, ...helio.velocityKmS], true);
  expect(dynamics.linearTail).toBeDefined();
  const end = PERIAPSIS_EPOCH + 86400;
  const stepper = new Dop853Stepper(dynamics.rhs, helio.epochTdbS, dynamics.initialY, 1, {
    relativeTolerance: 1e-12, absoluteTolerance: 1e-9, errorComponents: dynamics.errorComponents, endTime: end,
    linearTail: split ? dynamics.linearTail : undefined,
  });
  while (stepper.t < end) expect(stepper.step(end)).toBe('accepted');
  return stepper;
}

describe('the STM as a linear tail of the integration', () => {
  describe('when a flyby is integrated with and without the split', () => {
    const whole = integrate(false);
    const split = integrate(true);

    it('should reject trial steps on the approach (so the split has work to skip)', () => {
      expect(whole.counts.rejectedSteps).toBeGreaterThan(5);
    });

    it('should take the same steps to the same state and STM, to the last bit', () => {
      expect(split.counts).toEqual(whole.counts);
      expect(Array.from(split.y)).toEqual(Array.from(whole.y));
      const out = new Float64Array(42);
      const ref = new Float64Array(42);
      const mid = (split.tPrevious + split.t) / 2;
      split.denseOutput(mid, out);
      whole.denseOutput(mid, ref);
      expect(Array.from(out)).toEqual(Array.from(ref));
    });

    it('should interpolate the state alone first and the STM later, to the same numbers', () => {
      const a = integrate(true);
      const b = integrate(false);
      const t = a.tPrevious + 0.3 * (a.t - a.tPrevious);
      const head = new Float64Array(42).fill(Number.NaN);
      a.denseOutput(t, head, 6);
      const full = new Float64Array(42);
      b.denseOutput(t, full);
      expect(Array.from(head.subarray(0, 6))).toEqual(Array.from(full.subarray(0, 6)));
      expect(head.subarray(6).every(Number.isNaN)).toBe(true);
      const later = new Float64Array(42);
      a.denseOutput(t, later);
      expect(Array.from(later)).toEqual(Array.from(full));
      expect(a.counts).toEqual(b.counts);
    });
  });

  describe('when the tail would start inside the error components', () => {
    it('should refuse it, naming the option', () => {
      const { helio } = flybyStart(2.5);
      const dynamics = createCowellDynamics(new ForceModel(forcesAbout('sun'), flybyEphemeris), [...helio.positionKm, ...helio.velocityKmS], true);
      const make = (errorComponents?: number) => new Dop853Stepper(dynamics.rhs, helio.epochTdbS, dynamics.initialY, 1, {
        relativeTolerance: 1e-12, absoluteTolerance: 1e-9, errorComponents, linearTail: dynamics.linearTail,
      });
      expect(() => make()).toThrow(InvalidInputError);
      expect(() => make(7)).toThrow(/linearTail\.offset/);
      expect(() => make(6)).not.toThrow();
    });
  });
});
