/**
 * What a planner thread does with one task. Task data arrives by structured clone from the worker process,
 * which read it from Redis: data from outside this process, so each task's problem (or budget request) is
 * parsed here exactly once, with the leap-second table the job carries (the API's, or the plan's own for a
 * sample batch), and the planner then takes the checked value without checking again. This is the only parse
 * on the worker side: a checked problem cannot cross the thread boundary as one (its check record does not
 * survive a structured clone, by design), and Redis data may come from an older API or another writer.
 */
import {
  assembleBudget, attachMonteCarlo, leapSecondTableOfPlan, parseBudgetRequest, parseProblem, planManeuvers, prepareBudget,
  runBudgetSamples, runDispersionSamples, summariseDispersion,
} from '../../planner/index.ts';
import type { EphemerisCache } from '../../planner/index.ts';
import type { PlannerTask, TaskProgress } from './planner-task.ts';

/** Runs one task; `ephemerisCache` is the thread's own, shared by its tasks. */
export async function runPlannerTask(task: PlannerTask, signal: AbortSignal, onProgress: (p: TaskProgress) => void,
  ephemerisCache: EphemerisCache): Promise<unknown> {
  switch (task.kind) {
    case 'plan':
      return planManeuvers(parseProblem(task.problem, leapSecondTableOfPlan(task.leapSeconds)), {
        signal, monteCarlo: task.monteCarlo, ephemerisCache, onProgress,
      });
    case 'samples':
      // The samples fly the plan's problem with the plan's own leap-second table.
      return runDispersionSamples(parseProblem(task.problem, leapSecondTableOfPlan(task.plan.leapSeconds)), task.plan, {
        seed: task.seed, firstIndex: task.firstIndex, count: task.count, signal, ephemerisCache,
      });
    case 'combine':
      // Combining reads the samples and the problem's dispersion seed only: nothing to check or plan.
      return attachMonteCarlo(task.plan, summariseDispersion(task.problem, task.plan, task.samples));
    case 'budget-prepare':
      return prepareBudget(parseBudgetRequest(task.request, leapSecondTableOfPlan(task.leapSeconds)), { signal, onProgress });
    case 'budget-samples':
      return runBudgetSamples(parseBudgetRequest(task.request, leapSecondTableOfPlan(task.nominal.plan.leapSeconds)), task.nominal, {
        path: 'nonlinear', firstIndex: task.firstIndex, count: task.count, signal,
      });
    case 'budget-assemble': {
      const request = parseBudgetRequest(task.request, leapSecondTableOfPlan(task.plan.leapSeconds));
      const linear = task.nominal && request.linearSamples > 0
        ? await runBudgetSamples(request, task.nominal, { path: 'linear', firstIndex: 0, count: request.linearSamples, signal }) : [];
      return assembleBudget(request, task.plan, task.nominal, linear, task.nonlinear);
    }
  }
}
