/** Messages between the worker process and its planner threads (structured-clone plain data only). */
import type { EphemerisSetFileRef } from '../config/ephemeris-sets.ts';
import type {
  BudgetNominal, BudgetProgress, BudgetRequest, BudgetResult, BudgetSample, DispersionSample, ManeuverPlan, PlanLeapSeconds, PlanningProblem, PlanProgress,
} from '../../planner/index.ts';
import type { FailureData } from '../../contract/errors.ts';

/** Progress a task reports: the plan's stages for plan tasks, the budget's own for budget tasks. */
export type TaskProgress = PlanProgress | BudgetProgress;

export type PlannerTask =
  /** `ephemerisFiles`: the files of the problem's ephemeris set, with the SHA-256 each had when the set was checked. */
  | { kind: 'plan'; problem: PlanningProblem; monteCarlo: 'in-process' | 'skip'; leapSeconds: PlanLeapSeconds; ephemerisFiles?: EphemerisSetFileRef[] }
  | { kind: 'samples'; problem: PlanningProblem; plan: ManeuverPlan; seed: number; firstIndex: number; count: number; ephemerisFiles?: EphemerisSetFileRef[] }
  | { kind: 'combine'; problem: PlanningProblem; plan: ManeuverPlan; samples: DispersionSample[] }
  | { kind: 'budget-prepare'; request: BudgetRequest; leapSeconds: PlanLeapSeconds; ephemerisFiles?: EphemerisSetFileRef[] }
  | { kind: 'budget-samples'; request: BudgetRequest; nominal: BudgetNominal; firstIndex: number; count: number; ephemerisFiles?: EphemerisSetFileRef[] }
  /** Runs the linear path (fast) and assembles the result with the fanned-out non-linear samples. */
  | { kind: 'budget-assemble'; request: BudgetRequest; plan: ManeuverPlan; nominal: BudgetNominal | null; nonlinear: BudgetSample[] };

export type PlannerTaskResult<T extends PlannerTask> =
  T extends { kind: 'samples' } ? DispersionSample[]
    : T extends { kind: 'budget-prepare' } ? { plan: ManeuverPlan; nominal: BudgetNominal | null }
    : T extends { kind: 'budget-samples' } ? BudgetSample[]
    : T extends { kind: 'budget-assemble' } ? BudgetResult
    : ManeuverPlan;

export type ToThread =
  | { type: 'run'; taskId: number; task: PlannerTask }
  | { type: 'cancel'; taskId: number; reason: string };

export type FromThread =
  | { type: 'ready' }
  | { type: 'progress'; taskId: number; progress: TaskProgress }
  | { type: 'done'; taskId: number; result: unknown }
  | { type: 'failed'; taskId: number; error: FailureData };
