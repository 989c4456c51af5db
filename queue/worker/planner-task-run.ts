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
import { loadEphemerisFiles } from '../../ccsds/index.ts';
import type { EphemerisFileTable, LeapSecondTable } from '../../propagator/index.ts';
import { EPHEMERIS_SET_FIELD, type EphemerisSetFileRef } from '../config/ephemeris-sets.ts';
import type { PlannerTask, TaskProgress } from './planner-task.ts';

// Ephemeris-set files this thread has read, by path and SHA-256: a queue of jobs on one set reads each file once.
const fileTables = new Map<string, EphemerisFileTable[]>();

/** The tables of a set's files, read here (each refused if its SHA-256 is no longer the one checked at start-up). */
async function setTables(refs: readonly EphemerisSetFileRef[], leapSeconds: LeapSecondTable): Promise<EphemerisFileTable[]> {
  const tables: EphemerisFileTable[] = [];
  for (const ref of refs) {
    const key = `${ref.path}\n${ref.sha256}`;
    let loaded = fileTables.get(key);
    if (loaded === undefined) {
      loaded = await loadEphemerisFiles([ref.path], leapSeconds, EPHEMERIS_SET_FIELD, [ref.sha256]);
      fileTables.set(key, loaded);
    }
    tables.push(...loaded);
  }
  return tables;
}

/** Runs one task; `ephemerisCache` is the thread's own, shared by its tasks. */
export async function runPlannerTask(task: PlannerTask, signal: AbortSignal, onProgress: (p: TaskProgress) => void,
  ephemerisCache: EphemerisCache): Promise<unknown> {
  switch (task.kind) {
    case 'plan': {
      const leapSeconds = leapSecondTableOfPlan(task.leapSeconds);
      return planManeuvers(parseProblem(task.problem, leapSeconds), {
        signal, monteCarlo: task.monteCarlo, ephemerisCache, onProgress, ephemerisFiles: await setTables(task.ephemerisFiles ?? [], leapSeconds),
      });
    }
    case 'samples': {
      // The samples fly the plan's problem with the plan's own leap-second table, on the plan's own files.
      const leapSeconds = leapSecondTableOfPlan(task.plan.leapSeconds);
      return runDispersionSamples(parseProblem(task.problem, leapSeconds), task.plan, {
        seed: task.seed, firstIndex: task.firstIndex, count: task.count, signal, ephemerisCache,
        ephemerisFiles: await setTables(task.ephemerisFiles ?? [], leapSeconds),
      });
    }
    case 'combine':
      // Combining reads the samples and the problem's dispersion seed only: nothing to check or plan.
      return attachMonteCarlo(task.plan, summariseDispersion(task.problem, task.plan, task.samples));
    case 'budget-prepare': {
      const leapSeconds = leapSecondTableOfPlan(task.leapSeconds);
      return prepareBudget(parseBudgetRequest(task.request, leapSeconds), {
        signal, onProgress, ephemerisFiles: await setTables(task.ephemerisFiles ?? [], leapSeconds),
      });
    }
    case 'budget-samples': {
      // Re-plans fly the nominal plan's problem with its leap-second table, on the set's files as checked.
      const leapSeconds = leapSecondTableOfPlan(task.nominal.plan.leapSeconds);
      return runBudgetSamples(parseBudgetRequest(task.request, leapSeconds), task.nominal, {
        path: 'nonlinear', firstIndex: task.firstIndex, count: task.count, signal, ephemerisFiles: await setTables(task.ephemerisFiles ?? [], leapSeconds),
      });
    }
    case 'budget-assemble': {
      const request = parseBudgetRequest(task.request, leapSecondTableOfPlan(task.plan.leapSeconds));
      const linear = task.nominal && request.linearSamples > 0
        ? await runBudgetSamples(request, task.nominal, { path: 'linear', firstIndex: 0, count: request.linearSamples, signal }) : [];
      return assembleBudget(request, task.plan, task.nominal, linear, task.nonlinear);
    }
  }
}
