/**
 * Parse once per door. Calls into the problem checks (planner/problem-checks.ts) from outside that module are
 * counted by wrapping its exports: the CLI door parses the problem file once and the planner never checks
 * again; the HTTP door runs the relation checks once after the body schema; the worker side parses each
 * task's problem once, at the thread boundary; a spread copy of a checked problem is refused, so an edited
 * problem cannot reach the planner with stale epochs. (Project rule, ARCHITECTURE.md "One schema, three doors".)
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeEach, describe, expect, it, vi } from 'vitest';
import * as checks from '../../planner/problem-checks.ts';
import { EphemerisCache, parseProblem, planLeapSeconds, planManeuvers } from '../../planner/index.ts';
import { BUILTIN_LEAP_SECONDS } from '../../propagator/index.ts';
import { jobRequestSchema } from '../../contract/job-types.ts';
import { planCommand } from '../../cli/commands/plan.ts';
import { findProblemIssue } from '../../queue/producer/job-request-check.ts';
import { runPlannerTask } from '../../queue/worker/planner-task-run.ts';
import { twoBodyProblem } from './two-body-fixture.ts';

vi.mock('../../planner/problem-checks.ts', async (importOriginal) => {
  const actual = await importOriginal<typeof import('../../planner/problem-checks.ts')>();
  return {
    ...actual,
    parseProblem: vi.fn(actual.parseProblem),
    checkParsedProblem: vi.fn(actual.checkParsedProblem),
    checkProblem: vi.fn(actual.checkProblem),
    problemEpochs: vi.fn(actual.problemEpochs),
  };
});

const dir = mkdtempSync(join(tmpdir(), 'veer-parse-once-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const fast = () => twoBodyProblem({ dispersion: { samples: 0, seed: 1 } });

/** Calls into the checks since the last reset, by function. */
function counts(): Record<string, number> {
  const n = (f: unknown): number => vi.mocked(f as () => unknown).mock.calls.length;
  return {
    parseProblem: n(checks.parseProblem), checkParsedProblem: n(checks.checkParsedProblem),
    checkProblem: n(checks.checkProblem), problemEpochs: n(checks.problemEpochs),
  };
}
const NONE = { parseProblem: 0, checkParsedProblem: 0, checkProblem: 0, problemEpochs: 0 };

beforeEach(() => { vi.clearAllMocks(); });

describe('parse once', () => {
  describe('when the CLI plans a problem file', () => {
    it('should parse it once and plan without checking again', async () => {
      const path = join(dir, 'problem.json');
      writeFileSync(path, JSON.stringify(fast()));
      const stdout = vi.spyOn(process.stdout, 'write').mockImplementation(() => true);
      const stderr = vi.spyOn(process.stderr, 'write').mockImplementation(() => true);
      try {
        expect(await planCommand.run([path, '--out', join(dir, 'plan.json')])).toBe(0);
      } finally {
        stdout.mockRestore();
        stderr.mockRestore();
      }
      expect(counts()).toEqual({ ...NONE, parseProblem: 1 });
    }, 120_000);
  });

  describe('when the planner is given a checked problem', () => {
    it('should not call any check', async () => {
      const problem = parseProblem(fast());
      vi.clearAllMocks();
      const plan = await planManeuvers(problem, { monteCarlo: 'skip' });
      expect(plan.status).toBe('converged');
      expect(counts()).toEqual(NONE);
    }, 120_000);
  });

  describe('when the HTTP door takes a job request', () => {
    it('should run the relation checks once after the body schema, and parse nothing else', () => {
      const body = jobRequestSchema.parse({ problem: fast(), reason: 'parse-once test: count the checks at the door' });
      expect(findProblemIssue(body.problem, BUILTIN_LEAP_SECONDS)).toBeNull();
      expect(counts()).toEqual({ ...NONE, checkProblem: 1 });
    });
  });

  describe('when a planner thread runs a plan task from job data', () => {
    it('should parse the problem once at the thread boundary', async () => {
      const plan = await runPlannerTask(
        { kind: 'plan', problem: jobRequestSchema.parse({ problem: fast(), reason: 'parse-once test: job data' }).problem, monteCarlo: 'skip', leapSeconds: planLeapSeconds(BUILTIN_LEAP_SECONDS) },
        new AbortController().signal, () => undefined, new EphemerisCache(),
      );
      expect((plan as { status: string }).status).toBe('converged');
      expect(counts()).toEqual({ ...NONE, parseProblem: 1 });
    }, 120_000);
  });

  describe('when a checked problem is copied by spreading', () => {
    it('should refuse the copy rather than plan with epochs checked for another problem', async () => {
      const problem = parseProblem(fast());
      await expect(planManeuvers({ ...problem, endEpoch: '2030-01-01T00:00:00 TDB' })).rejects.toThrow(/not a checked problem/);
    });
  });
});
