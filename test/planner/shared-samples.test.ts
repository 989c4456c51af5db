/**
 * The in-process Monte Carlo shared with helper lanes (PlanOptions.sampleRunners, planner/plan/shared-samples.ts):
 * the plan must equal the one-lane plan exactly (sample i depends on the seed and i only, the invariance the
 * queue's fan-out relies on too; the reference here is the same planner on one lane), and a helper's failure,
 * a short answer or a cancellation must fail the plan, never yield a partial sample set.
 */
import { describe, expect, it } from 'vitest';
import {
  parseProblem, planManeuvers, runDispersionSamples, type CheckedProblem, type ManeuverPlan, type SampleRangeRunner,
} from '../../planner/index.ts';
import { CancelledError, InvalidInputError } from '../../propagator/index.ts';
import { twoBodyProblem } from './two-body-fixture.ts';

const SAMPLES = 24;
const problem: CheckedProblem = parseProblem(twoBodyProblem({ dispersion: { samples: SAMPLES, seed: 11 } }));

/** A helper lane in this thread: runs its batches with the planner's queue fan-out entry. */
function inProcessRunner(calls: { firstIndex: number; count: number }[] = []): SampleRangeRunner {
  return {
    run: async (plan, range, options) => {
      calls.push(range);
      return runDispersionSamples(problem, plan, { seed: problem.dispersion.seed, ...range, signal: options.signal, onSample: options.onSample });
    },
  };
}

describe('planManeuvers with sample runners', () => {
  describe('when two helper lanes share the samples', () => {
    it('should give exactly the one-lane plan, with batches dealt to the helpers', async () => {
      const alone = await planManeuvers(problem);
      const calls: { firstIndex: number; count: number }[] = [];
      const progress: number[] = [];
      const shared = await planManeuvers(problem, {
        sampleRunners: [inProcessRunner(calls), inProcessRunner(calls)],
        onProgress: (p) => { if (p.samplesDone !== undefined) progress.push(p.samplesDone); },
      });
      expect(alone.dispersion.monteCarlo?.samples).toBe(SAMPLES);
      expect(shared).toEqual(alone);
      expect(JSON.stringify(shared)).toBe(JSON.stringify(alone));
      expect(calls.length).toBeGreaterThan(0);
      expect(progress.at(-1)).toBe(SAMPLES);
    });
  });

  describe('when a helper fails', () => {
    it('should reject with the helper\'s failure, not a partial plan', async () => {
      const failing: SampleRangeRunner = { run: async () => { throw new InvalidInputError('ephemeris', 'the files here differ'); } };
      await expect(planManeuvers(problem, { sampleRunners: [failing] })).rejects.toMatchObject({ name: 'InvalidInputError', field: 'ephemeris' });
    });
  });

  describe('when a helper answers with fewer samples than asked', () => {
    it('should refuse the incomplete set', async () => {
      const short: SampleRangeRunner = { run: async (plan, range, o) => (await inProcessRunner().run(plan, range, o)).slice(1) };
      await expect(planManeuvers(problem, { sampleRunners: [short] })).rejects.toThrow(/expected 24 samples|missing sample index/);
    });
  });

  describe('when the run is cancelled during the samples', () => {
    it('should reject with CancelledError and stop every lane', async () => {
      const controller = new AbortController();
      const signals: AbortSignal[] = [];
      const watching: SampleRangeRunner = {
        run: (plan, range, o) => { if (o.signal) signals.push(o.signal); return inProcessRunner().run(plan, range, o); },
      };
      const run = planManeuvers(problem, {
        sampleRunners: [watching], signal: controller.signal,
        onProgress: (p) => { if ((p.samplesDone ?? 0) >= 5) controller.abort(); },
      });
      await expect(run).rejects.toBeInstanceOf(CancelledError);
      expect(signals.length).toBeGreaterThan(0);
      expect(signals.every((s) => s.aborted)).toBe(true);
    });
  });

  it('should leave the plan of a problem without samples untouched by runners', async () => {
    const none = parseProblem(twoBodyProblem({ dispersion: { samples: 0, seed: 11 } }));
    const calls: { firstIndex: number; count: number }[] = [];
    const plan: ManeuverPlan = await planManeuvers(none, { sampleRunners: [inProcessRunner(calls)] });
    expect(plan.dispersion.monteCarlo).toBeNull();
    expect(calls).toEqual([]);
  });
});
