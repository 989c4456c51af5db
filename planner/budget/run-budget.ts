/**
 * The statistical Δv budget of a sequence of correction burns. Three steps, each usable on its own so the
 * queue can fan the samples out:
 * 1. prepareBudget: plan the nominal sequence (planManeuvers, cross-checked, no Monte Carlo) and build its
 *    linear model (budget-nominal.ts);
 * 2. runBudgetSamples: samples [firstIndex, firstIndex + count) of one path; sample i depends on
 *    (seed, i) only, so any batching gives the same samples;
 * 3. assembleBudget: statistics of both paths, their per-burn agreement, caveats.
 * runBudget does all three in this process. A budget is a study: never a plan to approve.
 */
import { BUILTIN_LEAP_SECONDS, CancelledError, InvalidInputError, planLeapSeconds, type EphemerisFileTable } from '../../propagator/index.ts';
import { caveat, orderCaveats, reviewCaveat } from '../caveats.ts';
import type { Caveat, ManeuverPlan, PlanProgress } from '../../contract/plan-types.ts';
import { planManeuvers } from '../plan/plan-maneuvers.ts';
import { planningContext } from '../plan/planning-context.ts';
import { SOFTWARE_VERSION } from '../../contract/software-version.ts';
import { canonicalSha256, problemHash } from '../problem-hash.ts';
import type { BudgetRequest } from '../../contract/budget-schema.ts';
import { compareBudgetPaths } from './budget-agreement.ts';
import type { CheckedBudgetRequest } from './budget-checks.ts';
import { createBudgetSampler } from './budget-draws.ts';
import { linearBudgetSample } from './budget-linear.ts';
import { budgetNominal } from './budget-nominal.ts';
import { nonlinearBudgetSample } from './budget-nonlinear.ts';
import { summariseBudgetSamples } from './budget-statistics.ts';
import type { BudgetNominal, BudgetPath, BudgetProgress, BudgetResult, BudgetSample, BudgetSummary } from '../../contract/budget-types.ts';

export interface BudgetRunOptions {
  onProgress?: (p: BudgetProgress) => void;
  signal?: AbortSignal;
  /** OEM tables replacing the built-in series for the bodies they tabulate (a problem's ephemeris set, as for a plan). */
  ephemerisFiles?: readonly EphemerisFileTable[];
}

export interface BudgetSampleOptions {
  path: BudgetPath;
  firstIndex: number;
  count: number;
  signal?: AbortSignal;
  /** Called after each sample with the number done in this range. */
  onSample?: (done: number) => void;
  /** The nominal plan's ephemeris files (see BudgetRunOptions); the re-plans fly on them too. */
  ephemerisFiles?: readonly EphemerisFileTable[];
}

const yieldToLoop = (): Promise<void> => new Promise((resolve) => setImmediate(resolve));

/** Step 1: the nominal plan, and its linear model when it converged (null otherwise). UTC epochs go through
 * the table the request's problem was checked with (parseBudgetRequest). */
export async function prepareBudget(request: CheckedBudgetRequest, options: BudgetRunOptions = {}): Promise<{ plan: ManeuverPlan; nominal: BudgetNominal | null }> {
  const plan = await planManeuvers(request.problem, {
    monteCarlo: 'skip', signal: options.signal, ephemerisFiles: options.ephemerisFiles,
    onProgress: (p: PlanProgress) => options.onProgress?.({ stage: 'nominal', fraction: 0.1 * p.fraction, message: `nominal plan: ${p.message}` }),
  });
  if (plan.status !== 'converged') return { plan, nominal: null };
  return { plan, nominal: await budgetNominal(request, planningContext(request.problem, undefined, options.ephemerisFiles), plan, options.signal) };
}

/** Step 2: samples of one path; see the file comment. Checks `signal` before each sample. */
export async function runBudgetSamples(request: CheckedBudgetRequest, nominal: BudgetNominal, options: BudgetSampleOptions): Promise<BudgetSample[]> {
  const { firstIndex, count, signal } = options;
  if (!Number.isInteger(firstIndex) || firstIndex < 0) throw new InvalidInputError('firstIndex', `must be an integer >= 0, got ${firstIndex}`);
  if (!Number.isInteger(count) || count < 0) throw new InvalidInputError('count', `must be an integer >= 0, got ${count}`);
  const sampler = createBudgetSampler(nominal.burns.length, nominal.initialCovariance, nominal.knowledgeCovariances);
  const ctx = options.path === 'nonlinear' ? planningContext(request.problem, undefined, options.ephemerisFiles) : null;
  const out: BudgetSample[] = [];
  for (let k = 0; k < count; k++) {
    if (signal?.aborted) throw new CancelledError(`budget cancelled after ${k} of ${count} ${options.path} samples`);
    const draw = sampler.draw(request.seed, firstIndex + k);
    out.push(ctx ? await nonlinearBudgetSample(request, ctx, nominal, draw, signal) : linearBudgetSample(request, nominal, draw));
    options.onSample?.(k + 1);
    // The linear path is microseconds per sample: yield every 500 so cancellation and progress flow.
    if (ctx || (k + 1) % 500 === 0) await yieldToLoop();
  }
  return out;
}

function budgetCaveats(request: BudgetRequest, plan: ManeuverPlan, parts: { linear: BudgetSummary | null; nonlinear: BudgetSummary | null; agreement: BudgetResult['agreement'] }): Caveat[] {
  const out: Caveat[] = [reviewCaveat(), caveat('BUDGET_IS_A_STUDY',
    'Δv budget study: statistics of simulated correction sequences around the nominal plan — not a plan, never to be approved or commanded.')];
  out.push(...plan.caveats.filter((c) => c.code !== 'PROPOSAL_REQUIRES_REVIEW' && c.code !== 'MONTE_CARLO_NOT_RUN'));
  for (const s of [parts.linear, parts.nonlinear]) {
    if (!s) continue;
    if (s.notConverged.count > 0) {
      out.push(caveat('BUDGET_REPLAN_NOT_CONVERGED', `${s.notConverged.count} of ${s.samples} ${s.path} samples had a re-plan that did not converge; they are left out of the Δv statistics (indices ${s.notConverged.indices.slice(0, 10).join(', ')}${s.notConverged.count > 10 ? ', ...' : ''}).`));
    }
    const limit = request.problem.limits.impactProbabilityLimit;
    if (s.limits.impact.upper95 > limit && s.limits.impact.count > 0) {
      out.push(caveat('BUDGET_LIMIT_CROSSING', `${s.path}: impact in ${s.limits.impact.count} of ${s.limits.impact.evaluated} samples (95 % up to ${s.limits.impact.upper95.toPrecision(3)}; limit ${limit}).`));
    }
    const low = s.limits.belowSafeAltitude;
    if (low && low.count > 0) {
      out.push(caveat('BUDGET_LIMIT_CROSSING', `${s.path}: closest approach below ${s.limits.safeAltitudeKm} km in ${low.count} of ${low.evaluated} samples.`));
    }
  }
  if (parts.agreement && !parts.agreement.passed) out.push(caveat('BUDGET_PATHS_DISAGREE', parts.agreement.message));
  return orderCaveats(out);
}

/** Step 3: the result from the samples of each path (either may be empty); see the file comment. */
export function assembleBudget(request: BudgetRequest, plan: ManeuverPlan, nominal: BudgetNominal | null,
  linearSamples: readonly BudgetSample[], nonlinearSamples: readonly BudgetSample[]): BudgetResult {
  const notes: string[] = ['Burn epochs are the nominal plan\'s; each re-plan solves the burn\'s free Δv components only (later burns held as planned: impulses at their nominal inertial Δv, finite burns at their planned pointing and duration).',
    'A finite burn is re-planned on its pointing and duration (ignition as planned) and counted by its equivalent Δv (rocket-equation Δv along its direction at ignition); its execution errors act on that Δv as duration and pointing errors.',
    `Re-plans return every target component to the nominal sequence's value within ${request.replanToleranceFraction} × its tolerance.`,
    'Δv counts the commanded magnitude; propellant uses the executed Δv with the mass carried through each sample (rocket equation, g0 = 9.80665 m/s²).'];
  const linear = nominal && linearSamples.length > 0 ? summariseBudgetSamples(request, nominal, 'linear', linearSamples) : null;
  const nonlinear = nominal && nonlinearSamples.length > 0 ? summariseBudgetSamples(request, nominal, 'nonlinear', nonlinearSamples) : null;
  const agreement = nominal && linear && nonlinear ? compareBudgetPaths(request, nominal, linearSamples, nonlinearSamples) : null;
  if (!nominal) notes.push(`no budget: the nominal plan did not converge (${plan.convergence.message})`);
  if (!agreement) notes.push('no linear/non-linear comparison: only one path ran');
  return {
    budgetFormatVersion: 1, kind: 'delta-v-budget', problemHash: problemHash(request.problem, plan.leapSeconds ?? planLeapSeconds(BUILTIN_LEAP_SECONDS), plan.ephemerisSources), requestHash: budgetRequestHash(request),
    softwareVersion: SOFTWARE_VERSION, spacecraftName: request.problem.spacecraft.name, title: request.problem.title ?? null,
    nominal: {
      status: plan.status, crossCheckPassed: plan.crossCheck.passed,
      burns: plan.burns.map((b) => ({ label: b.label, epochTdbS: b.epoch.tdbS, epochTdb: b.epoch.tdb, epochUtc: b.epoch.utc, magnitudeMS: b.magnitudeMS })),
      totalDeltaVMS: plan.totalDeltaVMS,
    },
    ...(plan.ephemerisSources ? { ephemerisSources: plan.ephemerisSources } : {}),
    linear, nonlinear, agreement,
    caveats: budgetCaveats(request, plan, { linear, nonlinear, agreement }),
    notes,
  };
}

/** SHA-256 (hex) of the canonical JSON of a validated budget request. */
export function budgetRequestHash(request: BudgetRequest): string {
  return canonicalSha256(request);
}

/** The whole budget in this process, for a request parseBudgetRequest checked; see the file comment. */
export async function runBudget(request: CheckedBudgetRequest, options: BudgetRunOptions = {}): Promise<BudgetResult> {
  const progress = (p: BudgetProgress): void => options.onProgress?.(p);
  progress({ stage: 'nominal', fraction: 0, message: 'planning the nominal sequence' });
  const { plan, nominal } = await prepareBudget(request, options);
  if (!nominal) return assembleBudget(request, plan, null, [], []);
  const nl = request.linearSamples;
  const nn = request.nonlinearSamples;
  const linear = await runBudgetSamples(request, nominal, {
    path: 'linear', firstIndex: 0, count: nl, signal: options.signal, ephemerisFiles: options.ephemerisFiles,
    onSample: (done) => { if (done % 1000 === 0 || done === nl) progress({ stage: 'linear', fraction: 0.1 + 0.1 * (done / nl), message: `linear sample ${done}/${nl}`, samplesDone: done, samplesTotal: nl }); },
  });
  const nonlinear = await runBudgetSamples(request, nominal, {
    path: 'nonlinear', firstIndex: 0, count: nn, signal: options.signal, ephemerisFiles: options.ephemerisFiles,
    onSample: (done) => progress({ stage: 'nonlinear', fraction: 0.2 + 0.79 * (done / nn), message: `non-linear sample ${done}/${nn}`, samplesDone: done, samplesTotal: nn }),
  });
  progress({ stage: 'summary', fraction: 0.99, message: 'statistics' });
  const result = assembleBudget(request, plan, nominal, linear, nonlinear);
  progress({ stage: 'done', fraction: 1, message: 'budget ready for review' });
  return result;
}
