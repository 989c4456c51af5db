/**
 * One validation for every door: numbers the worker would refuse, or would turn into a not-converged plan
 * through overflow (|r|² of 1e308 km is infinite), are refused by the API with 400 naming the field — and the
 * planner's own parser (what the worker and the CLI run) refuses the same input naming the same field, since
 * both use contract/problem-bounds.ts. Values at the edge of each range are accepted by both. Real Redis.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PROBLEM_BOUNDS, RELATIVE_TOLERANCE_RANGE } from '../../contract/problem-bounds.ts';
import { parseProblem } from '../../planner/index.ts';
import { startService, type TestService } from '../harness/service.ts';
import { reachableProblem, submission } from '../queue/fixtures.ts';

let svc: TestService;
beforeAll(async () => { svc = await startService(); });
afterAll(async () => { await svc?.close(); });

type Edit = (p: Record<string, any>) => void;

/** Each case: what is changed, and the field (inside the problem) that must be named. */
const REFUSED: [string, Edit, string][] = [
  ['relativeTolerance 1e-300', (p) => { p.forceModel.relativeTolerance = 1e-300; }, 'forceModel.relativeTolerance'],
  ['initial positionKm 1e308', (p) => { p.initialState.positionKm = [1e308, 0, 0]; }, 'initialState.positionKm[0]'],
  ['initial velocityKmS 1e308', (p) => { p.initialState.velocityKmS = [0, 1e308, 0]; }, 'initialState.velocityKmS[1]'],
  ['target positionKm 1e308', (p) => { p.targets[0].positionKm = [1e308, 0, 0]; }, 'targets[0].positionKm[0]'],
  ['Δv guess 1e308 km/s', (p) => { p.burns[0].deltaVGuessKmS = [0, 1e308, 0]; }, 'burns[0].deltaVGuessKmS[1]'],
  ['toleranceKm 1e-300', (p) => { p.targets[0].toleranceKm = 1e-300; }, 'targets[0].toleranceKm'],
  ['massKg 1e308', (p) => { p.spacecraft.massKg = 1e308; }, 'spacecraft.massKg'],
  ['corrector maxStepKmS 1e308', (p) => { p.corrector = { maxStepKmS: 1e308 }; }, 'corrector.maxStepKmS'],
  ['covariance entry 1e308', (p) => { p.initialState.covarianceKmKmS = Array.from({ length: 6 }, (_, i) => Array.from({ length: 6 }, (_, j) => (i === j ? 1e308 : 0))); }, 'initialState.covarianceKmKmS[0][0]'],
];

function workerField(problem: unknown): string | null {
  try {
    parseProblem(problem);
    return null;
  } catch (e) {
    return (e as { field?: string }).field ?? '(no field)';
  }
}

describe('the door refuses what the worker would refuse', () => {
  describe.each(REFUSED)('when the problem has %s', (_name, edit, field) => {
    it('should answer 400 naming the field, as the planner\'s parser does', async () => {
      const problem = reachableProblem();
      problem.forceModel = { centralBody: 'earth', ...problem.forceModel };
      edit(problem);
      expect(workerField(problem)).toBe(field);
      const res = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(problem) });
      expect(res.status, res.text).toBe(400);
      expect(res.body.error.issues.map((i: { path: string }) => i.path)).toContain(`body.problem.${field}`);
    });
  });

  describe('when every bounded number sits at the edge of its range', () => {
    it('should be accepted by both the API and the planner\'s parser', async () => {
      const problem = reachableProblem();
      problem.forceModel = { centralBody: 'earth', relativeTolerance: RELATIVE_TOLERANCE_RANGE.min };
      problem.targets[0].toleranceKm = PROBLEM_BOUNDS.toleranceKm.min;
      problem.spacecraft.massKg = PROBLEM_BOUNDS.massKg;
      problem.corrector = { maxStepKmS: PROBLEM_BOUNDS.deltaVKmS };
      expect(workerField(problem)).toBeNull();
      const res = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(problem) });
      expect(res.status, res.text).toBe(202);
    });
  });
});
