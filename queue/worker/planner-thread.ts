/**
 * Runs inside a worker thread: executes planner tasks so the worker process's event loop stays free for
 * lock renewal, progress and cancellation. One task at a time per thread.
 */
import { parentPort } from 'node:worker_threads';
import * as plannerModule from '../../planner/index.ts';
import type {
  BudgetNominal, BudgetProgress, BudgetRequest, BudgetResult, BudgetSample, DispersionSample, EphemerisCache, ManeuverPlan, MonteCarloSummary, PlanLeapSeconds, PlanningProblem, PlanProgress,
} from '../../planner/index.ts';
import type { LeapSecondTable } from '../../propagator/index.ts';
import { failureOf } from '../../contract/errors.ts';
import type { FromThread, PlannerTask, ToThread } from './planner-task.ts';

/** The planner functions this thread calls (names and signatures fixed by the planner's contract). */
interface PlannerFunctions {
  planManeuvers(problem: PlanningProblem, options?: {
    onProgress?: (p: PlanProgress) => void; signal?: AbortSignal; monteCarlo?: 'in-process' | 'skip';
    ephemerisCache?: EphemerisCache;
    leapSeconds?: LeapSecondTable;
  }): Promise<ManeuverPlan>;
  leapSecondTableOfPlan(record: PlanLeapSeconds): LeapSecondTable;
  runDispersionSamples(problem: PlanningProblem, plan: ManeuverPlan, options: {
    seed: number; firstIndex: number; count: number; signal?: AbortSignal; ephemerisCache?: EphemerisCache;
  }): Promise<DispersionSample[]>;
  summariseDispersion(problem: PlanningProblem, plan: ManeuverPlan, samples: DispersionSample[]): MonteCarloSummary;
  attachMonteCarlo(plan: ManeuverPlan, summary: MonteCarloSummary): ManeuverPlan;
  prepareBudget(request: BudgetRequest, options?: { onProgress?: (p: BudgetProgress) => void; signal?: AbortSignal; leapSeconds?: LeapSecondTable }): Promise<{ plan: ManeuverPlan; nominal: BudgetNominal | null }>;
  runBudgetSamples(request: BudgetRequest, nominal: BudgetNominal, options: {
    path: 'linear' | 'nonlinear'; firstIndex: number; count: number; signal?: AbortSignal;
  }): Promise<BudgetSample[]>;
  assembleBudget(request: BudgetRequest, plan: ManeuverPlan, nominal: BudgetNominal | null, linear: readonly BudgetSample[], nonlinear: readonly BudgetSample[]): BudgetResult;
}
const {
  assembleBudget, attachMonteCarlo, leapSecondTableOfPlan, planManeuvers, prepareBudget, runBudgetSamples, runDispersionSamples,
  summariseDispersion,
} = plannerModule as unknown as PlannerFunctions;

// This thread's ephemeris cache, shared by every task it runs: a queue of jobs over the same span and
// bodies fits each block once (bounded: EphemerisCache evicts the least recently used blocks).
const ephemerisCache = new plannerModule.EphemerisCache();

const port = parentPort;
if (!port) throw new Error('planner-thread.ts must run in a worker thread');
const controllers = new Map<number, AbortController>();
const send = (message: FromThread): void => port.postMessage(message);

async function run(taskId: number, task: PlannerTask, signal: AbortSignal): Promise<unknown> {
  switch (task.kind) {
    case 'plan':
      return planManeuvers(task.problem, {
        signal, monteCarlo: task.monteCarlo, ephemerisCache, leapSeconds: leapSecondTableOfPlan(task.leapSeconds),
        onProgress: (progress) => send({ type: 'progress', taskId, progress }),
      });
    case 'samples':
      return runDispersionSamples(task.problem, task.plan, {
        seed: task.seed, firstIndex: task.firstIndex, count: task.count, signal, ephemerisCache,
      });
    case 'combine':
      return attachMonteCarlo(task.plan, summariseDispersion(task.problem, task.plan, task.samples));
    case 'budget-prepare':
      return prepareBudget(task.request, {
        signal, leapSeconds: leapSecondTableOfPlan(task.leapSeconds), onProgress: (progress) => send({ type: 'progress', taskId, progress }),
      });
    case 'budget-samples':
      return runBudgetSamples(task.request, task.nominal, { path: 'nonlinear', firstIndex: task.firstIndex, count: task.count, signal });
    case 'budget-assemble': {
      const linear = task.nominal && task.request.linearSamples > 0
        ? await runBudgetSamples(task.request, task.nominal, { path: 'linear', firstIndex: 0, count: task.request.linearSamples, signal }) : [];
      return assembleBudget(task.request, task.plan, task.nominal, linear, task.nonlinear);
    }
  }
}

port.on('message', (message: ToThread) => {
  if (message.type === 'cancel') {
    controllers.get(message.taskId)?.abort(message.reason);
    return;
  }
  const controller = new AbortController();
  controllers.set(message.taskId, controller);
  run(message.taskId, message.task, controller.signal).then(
    (result) => send({ type: 'done', taskId: message.taskId, result }),
    (error: unknown) => send({ type: 'failed', taskId: message.taskId, error: failureOf(error) }),
  ).finally(() => controllers.delete(message.taskId));
});
send({ type: 'ready' });
