/**
 * planManeuvers: the whole planning job on a checked problem (parseProblem; never re-checked here), in named
 * stages that each return a typed part: correct (Lambert seeds, differential correction, the finite-burn
 * stage) → evaluate the solution with sensitivities → assemble the plan → cross-check with the other method
 * and disperse (linear + Monte Carlo) → caveats. Pure: the same problem gives the same plan. Every
 * propagation awaits the event loop, so progress and AbortSignal flow; cancellation rejects with
 * CancelledError. Not converging resolves to a plan with status 'not-converged', no burns to execute and the
 * diagnostics.
 */
import { CancelledError, planLeapSeconds } from '../../propagator/index.ts';
import type { EphemerisCache, Vec3 } from '../../propagator/index.ts';
import { finiteDifferenceJacobian, runCorrector } from '../corrector/differential-corrector.ts';
import type { CorrectorResult } from '../corrector/differential-corrector.ts';
import type { IterationRecord, ManeuverPlan, PlanProgress, Sensitivities } from '../../contract/plan-types.ts';
import { checksOf, type CheckedProblem } from '../problem-checks.ts';
import { problemHash, targetSetKey } from '../problem-hash.ts';
import type { EphemerisFileTable } from '../ephemeris-files.ts';
import { controlSettings, finiteControlLayout } from '../targeting/finite-controls.ts';
import type { FiniteSeed } from '../targeting/finite-types.ts';
import { attachFiniteDetails, finiteSeeds, hasFiniteBurns } from './finite-stage.ts';
import { lambertSeeds } from '../targeting/lambert-seed.ts';
import { evaluateTrajectory } from '../targeting/evaluate-trajectory.ts';
import type { TrajectoryEvaluation } from '../targeting/evaluate-trajectory.ts';
import { StartLegMemo } from '../targeting/start-leg-memo.ts';
import type { BurnSetting } from '../targeting/controls.ts';
import type { LambertSeed } from '../targeting/lambert-seed.ts';
import { runCrossCheck } from './cross-check.ts';
import { approachImpactRadiusKm, linearDispersion } from './linear-dispersion.ts';
import { attachMonteCarlo, summariseDispersion } from './monte-carlo.ts';
import { runSamplesShared, type SampleRangeRunner } from './shared-samples.ts';
import { planCaveats } from './plan-caveats.ts';
import { bodyPositions, forceModelSummary, planEpoch, plannedBurns, targetResults, trajectoryPoints } from './plan-parts.ts';
import { planningContext, type PlanningContext } from './planning-context.ts';
import { SOFTWARE_VERSION } from '../../contract/software-version.ts';
import { radiusOf } from '../targeting/target-components.ts';

export interface PlanOptions {
  onProgress?: (p: PlanProgress) => void;
  signal?: AbortSignal;
  /** 'in-process' (default) runs the Monte Carlo samples here; 'skip' leaves them to the caller (queue
   * fan-out through runDispersionSamples / summariseDispersion / attachMonteCarlo). */
  monteCarlo?: 'in-process' | 'skip';
  /** Helpers that take batches of the in-process Monte Carlo samples beside this thread (the CLI's threads);
   * the plan is the same with or without them (shared-samples.ts). @defaultValue [] */
  sampleRunners?: readonly SampleRangeRunner[];
  /** Also form the central finite-difference Jacobian at the solution and record its largest relative
   * difference from the STM one in sensitivities.stmVersusFiniteDifference (2n extra propagations).
   * @defaultValue false */
  verifyJacobian?: boolean;
  /** The process's shared ephemeris cache (propagator EphemerisCache), owned where plans are made (CLI,
   * planner thread); without it the plan fits its own. The plan is the same either way. */
  ephemerisCache?: EphemerisCache;
  /** Bodies tabulated by ephemeris files the door read (CCSDS OEM): each replaces the built-in series for
   * its body; the plan records every body's source and the problem hash covers the files. @defaultValue [] */
  ephemerisFiles?: readonly EphemerisFileTable[];
}

const yieldToLoop = (): Promise<void> => new Promise((resolve) => setImmediate(resolve));

/** What one run shares between its stages: the problem, its context, the primary propagation settings,
 * progress, cancellation and the effort counts. */
interface PlanRun {
  problem: CheckedProblem;
  ctx: PlanningContext;
  options: PlanOptions;
  /** Number of target components the corrector drives (the first ones in ctx.components). */
  m: number;
  /** Settings of the run's own evaluations; the start-leg memo serves every one of them. */
  primary: { method: CheckedProblem['forceModel']['method']; relativeTolerance: number; signal?: AbortSignal; startLegMemo: StartLegMemo };
  progress: (p: PlanProgress) => void;
  checkAbort: () => void;
  effort: { propagations: number; evaluations: number };
  count: (ev: { propagations: number; evaluations: number }) => void;
}

/** The correction stage's part: the corrector's result, the context it ended with (the finite stage
 * replaces the control layout), the finite-burn seeds and the Lambert seeds. */
interface Correction {
  result: CorrectorResult;
  ctx: PlanningContext;
  seeds: (FiniteSeed | undefined)[];
  lambertSeeds: LambertSeed[];
  /** The corrector's last evaluation with the STM and plot samples (null when it formed none). */
  lastWithStm: EvaluatedControls | null;
}

/** One evaluation and the controls it was made at. */
interface EvaluatedControls {
  controls: number[];
  evaluation: TrajectoryEvaluation;
}

/** The evaluation kept at exactly `controls`, else null. */
function evaluatedAt(kept: EvaluatedControls | null, controls: readonly number[]): TrajectoryEvaluation | null {
  if (kept === null || kept.controls.length !== controls.length) return null;
  return kept.controls.every((v, i) => v === controls[i]) ? kept.evaluation : null;
}

/** Output step of the plot samples: 400 intervals over the span, s. */
function sampleStepS(ctx: PlanningContext): number {
  return (ctx.epochs.endTdbS - ctx.epochs.initialTdbS) / 400;
}

/** The solution stage's part: the solution (or last iterate) evaluated with the STM and plot samples. */
interface Solution {
  settings: BurnSetting[];
  final: Awaited<ReturnType<typeof evaluateTrajectory>>;
  /** The evaluation when it succeeded, else null. */
  ok: TrajectoryEvaluation | null;
  sensitivities: Sensitivities | null;
}

/** Plans the correction burns of a checked problem (parseProblem; not checked again); see the file comment. */
export async function planManeuvers(problem: CheckedProblem, options: PlanOptions = {}): Promise<ManeuverPlan> {
  const run = startRun(problem, options);
  run.checkAbort();
  await yieldToLoop();
  const correction = await correctStage(run);
  run.checkAbort();
  run.ctx = correction.ctx;
  const solution = await solutionStage(run, correction);
  const plan = assemblePlan(run, correction, solution);
  if (plan.status === 'converged' && solution.ok) await checkAndDisperseStage(run, plan, solution.settings, solution.ok);
  else plan.dispersion.notes.push('not computed: the plan did not converge');
  plan.effort = { ...run.effort };
  plan.caveats = planCaveats(plan);
  run.progress({ stage: 'done', fraction: 1, message: plan.status === 'converged' ? 'plan ready for review' : 'not converged' });
  return plan;
}

/** The run's shared state; the context comes from the checked problem's epochs (no re-check). */
function startRun(problem: CheckedProblem, options: PlanOptions): PlanRun {
  const { signal } = options;
  const progress = (p: PlanProgress): void => options.onProgress?.(p);
  progress({ stage: 'validating', fraction: 0, message: 'checking the problem' });
  const ctx = planningContext(problem, options.ephemerisCache, options.ephemerisFiles);
  const effort = { propagations: 0, evaluations: 0 };
  const fm = problem.forceModel;
  return {
    problem, ctx, options, m: ctx.targetCount, progress, effort,
    primary: { method: fm.method, relativeTolerance: fm.relativeTolerance, signal, startLegMemo: new StartLegMemo() },
    checkAbort: () => { if (signal?.aborted) throw new CancelledError(); },
    count: (ev) => { effort.propagations += ev.propagations; effort.evaluations += ev.evaluations; },
  };
}

/** One differential correction from `initial` over the run's current control layout. Its evaluations
 * with the STM also collect the plot samples (dense output: the steps and the states are those of an
 * evaluation without them), so the last one can stand for the solution's evaluation; it is returned. */
async function correct(run: PlanRun, ctx: PlanningContext, initial: number[], stage: string):
  Promise<{ result: CorrectorResult; lastWithStm: EvaluatedControls | null }> {
  const { problem, m, progress } = run;
  const maxIter = problem.corrector.maxIterations;
  let lastWithStm: EvaluatedControls | null = null;
  const result = await runCorrector({
    initial, tolerances: ctx.components.slice(0, m).map((c) => c.tolerance),
    controlScales: ctx.layout.scales, maxStep: ctx.layout.maxStep, finiteDifferenceStep: ctx.layout.finiteDifferenceStep,
    lower: ctx.layout.lower, upper: ctx.layout.upper, maxIterations: maxIter,
    evaluate: async (x, withJacobian) => {
      const ev = await evaluateTrajectory(ctx.evaluation, controlSettings(problem, ctx.epochs, ctx.layout, x),
        { ...run.primary, withStm: withJacobian, outputStepS: withJacobian ? sampleStepS(ctx) : undefined });
      if (!ev.ok) return { ok: false, reason: ev.reason };
      run.count(ev);
      if (withJacobian) lastWithStm = { controls: x.slice(), evaluation: ev };
      return { ok: true, residuals: ev.values.slice(0, m).map((v, i) => v - ctx.components[i].requested), jacobian: ev.jacobian ? ev.jacobian.slice(0, m) : undefined };
    },
    onIteration: (rec) => progress({
      stage: 'correcting', fraction: 0.02 + 0.5 * Math.min(1, (rec.iteration + 1) / Math.min(maxIter, 8)),
      message: `${stage}iteration ${rec.iteration}: largest |residual|/tolerance ${rec.maxScaledResidual.toPrecision(3)}`, iteration: rec.iteration,
    }),
  });
  return { result, lastWithStm };
}

/** Stage 1: differential correction from the Lambert seeds where asked, then the finite-burn stage. */
async function correctStage(run: PlanRun): Promise<Correction> {
  const { problem } = run;
  let ctx = run.ctx;
  const seeded = await lambertSeeds(problem, ctx.epochs, ctx.layout, ctx.evaluation, run.primary.signal);
  run.progress({ stage: 'correcting', fraction: 0.02, message: 'differential correction', iteration: 0 });
  let { result, lastWithStm } = await correct(run, ctx, seeded.initial, '');
  let seeds: (FiniteSeed | undefined)[] = problem.burns.map(() => undefined);
  // Finite burns: from the converged impulsive solution, solve for pointing, duration (and ignition).
  if (hasFiniteBurns(problem) && result.outcome === 'converged') {
    const impulsive = evaluatedAt(lastWithStm, result.controls) ?? await evaluateTrajectory(ctx.evaluation,
      controlSettings(problem, ctx.epochs, ctx.layout, result.controls), { ...run.primary, withStm: false });
    const finiteSeeded = impulsive.ok ? finiteSeeds(problem, impulsive.burns) : { seeds, error: impulsive.ok ? null : impulsive.reason };
    if (finiteSeeded.error !== null) {
      result = { ...result, outcome: 'evaluation-failed', message: `finite-burn stage not started: ${finiteSeeded.error}` };
    } else {
      seeds = finiteSeeded.seeds;
      const layout = finiteControlLayout(problem, ctx.epochs, ctx.layout, result.controls, seeds);
      ctx = { ...ctx, layout, evaluation: { ...ctx.evaluation, controlMap: layout.descriptors.map((d) => ({ burnIndex: d.burnIndex, kind: d.kind })) } };
      const earlierIterations = result.iterations.map((it) => ({ ...it, note: `impulsive stage${it.note ? `: ${it.note}` : ''}` }));
      const finite = await correct(run, ctx, layout.initial, 'finite burns: ');
      lastWithStm = finite.lastWithStm;
      result = { ...finite.result, iterations: [...earlierIterations, ...finite.result.iterations], message: `finite burns: ${finite.result.message}` };
    }
  }
  return { result, ctx, seeds, lambertSeeds: seeded.seeds, lastWithStm };
}

/** Stage 2: the solution (or last iterate) evaluated with sensitivities and samples for the plot — the
 * corrector's own evaluation there when it made one with the STM, which is the same propagation; with
 * verifyJacobian, the central finite-difference Jacobian beside the STM one. */
async function solutionStage(run: PlanRun, correction: Correction): Promise<Solution> {
  const { problem, ctx, m } = run;
  const { result } = correction;
  const settings = controlSettings(problem, ctx.epochs, ctx.layout, result.controls);
  const kept = evaluatedAt(correction.lastWithStm, result.controls);
  const final = kept ?? await evaluateTrajectory(ctx.evaluation, settings, { ...run.primary, withStm: true, outputStepS: sampleStepS(ctx) });
  const ok: TrajectoryEvaluation | null = final.ok ? final : null;
  if (ok && !kept) run.count(ok);
  const sensitivities: Sensitivities | null = ok?.jacobian ? {
    controls: ctx.layout.descriptors, components: ctx.components.slice(0, m).map((c) => c.component),
    jacobian: ok.jacobian.slice(0, m), source: 'stm', stmVersusFiniteDifference: null,
  } : null;
  if (sensitivities && run.options.verifyJacobian && result.outcome === 'converged') {
    const fd = await finiteDifferenceJacobian(async (x) => {
      const ev = await evaluateTrajectory(ctx.evaluation, controlSettings(problem, ctx.epochs, ctx.layout, x), { ...run.primary, withStm: false });
      if (!ev.ok) return { ok: false, reason: ev.reason };
      run.count(ev);
      return { ok: true, residuals: ev.values.slice(0, m) };
    }, result.controls, ctx.layout.finiteDifferenceStep, undefined, true);
    if (!('failed' in fd)) {
      sensitivities.stmVersusFiniteDifference = Math.max(...sensitivities.jacobian.map((row, i) => {
        const scale = Math.max(...fd.jacobian[i].map(Math.abs), 1e-300);
        return Math.max(...row.map((v, j) => Math.abs(v - fd.jacobian[i][j]) / scale));
      }));
      sensitivities.finiteDifferenceJacobian = fd.jacobian;
    }
  }
  return { settings, final, ok, sensitivities };
}

/** The epoch of each driven target (its own, or its body's closest approach in the evaluation), and the
 * first of them after a given epoch (where a burn's effect is reported). */
function targetEpochAfter(run: PlanRun, ok: TrajectoryEvaluation | null): (t: number) => number | null {
  const targetEpochs = run.ctx.components.slice(0, run.m).map((c) => (c.station.kind === 'epoch' ? c.station.epochTdbS
    : ok?.approaches.find((a) => a.body === (c.station.kind === 'approach' ? c.station.body : null))?.epochTdbS ?? null));
  return (t: number): number | null => {
    const later = targetEpochs.filter((x): x is number => x !== null && x > t);
    return later.length ? Math.min(...later) : null;
  };
}

/** The convergence record: the corrector's outcome, or evaluation-failed when the converged solution could
 * not be re-evaluated; the last iterate when there is no plan to fly. */
function convergenceOf(correction: Correction, solution: Solution): ManeuverPlan['convergence'] {
  const { result } = correction;
  const { ok } = solution;
  const converged = result.outcome === 'converged';
  const conds = result.iterations.flatMap((it) => (it.conditionNumber === null ? [] : [it.conditionNumber]));
  const lastIterateBurns: Vec3[] = ok ? ok.burns.map((b) => b.deltaVInertialKmS) : [];
  return {
    outcome: converged && !ok ? 'evaluation-failed' : result.outcome,
    message: converged && !ok ? `the solution could not be re-evaluated: ${(solution.final as { reason: string }).reason}` : result.message,
    leastSquares: result.leastSquares,
    maxConditionNumber: conds.length ? Math.max(...conds) : null,
    lastIterate: converged && ok ? null : { controls: result.controls, burnsInertialKmS: lastIterateBurns },
    seeds: correction.lambertSeeds,
  };
}

/** Stage 3: the plan from the correction and the solution (cross-check and dispersion not yet run). */
function assemblePlan(run: PlanRun, correction: Correction, solution: Solution): ManeuverPlan {
  const { problem, ctx, m } = run;
  const { leapSeconds } = checksOf(problem);
  const leapRecord = planLeapSeconds(leapSeconds);
  const epochOf = (tdbS: number): ReturnType<typeof planEpoch> => planEpoch(tdbS, leapSeconds);
  const { ok } = solution;
  const fm = problem.forceModel;
  const flyable = correction.result.outcome === 'converged' && ok !== null;
  const freeEpoch = problem.burns.map((_, i) => ctx.epochs.burnWindowTdbS[i] !== undefined);
  const iterations: IterationRecord[] = correction.result.iterations.map((it) => ({
    ...it, jacobianSource: it.jacobianSource === 'analytic' ? 'stm' : it.jacobianSource,
  }));
  const plan: ManeuverPlan = {
    planFormatVersion: 1,
    status: flyable ? 'converged' : 'not-converged',
    problemHash: problemHash(problem, leapRecord, ctx.ephemerisSources),
    softwareVersion: SOFTWARE_VERSION,
    spacecraftName: problem.spacecraft.name,
    targetSetKey: targetSetKey(problem),
    title: problem.title ?? null,
    createdFrom: {
      initialEpoch: epochOf(ctx.epochs.initialTdbS), endEpoch: epochOf(ctx.epochs.endTdbS),
      centre: problem.initialState.centre, frame: problem.initialState.frame,
      hasCovariance: problem.initialState.covarianceKmKmS !== undefined,
    },
    leapSeconds: leapRecord,
    ephemerisSources: ctx.ephemerisSources,
    forceModel: forceModelSummary(problem, ctx.ephemerisName),
    burns: flyable && ok ? plannedBurns(problem, ok.burns, freeEpoch, targetEpochAfter(run, ok), leapSeconds) : [],
    totalDeltaVMS: 0,
    totalPropellantKg: 0,
    propellantLoadKg: problem.spacecraft.propellantKg ?? null,
    targets: targetResults(ctx.components, m, ok ? ok.values : ctx.components.slice(0, m).map(() => null), leapSeconds),
    iterations,
    convergence: convergenceOf(correction, solution),
    sensitivities: solution.sensitivities,
    crossCheck: {
      passed: false, primaryMethod: fm.method, method: fm.method === 'cowell' ? 'encke' : 'cowell',
      primarySwitching: fm.switching, switching: !fm.switching,
      relativeTolerance: Math.max(1e-13, fm.relativeTolerance / 100), toleranceFraction: problem.limits.crossCheckToleranceFraction,
      differences: [], message: 'not run: the plan did not converge',
    },
    dispersion: { executionModel: problem.executionErrors ?? null, linear: null, monteCarlo: null, notes: [] },
    caveats: [],
    trajectory: ok ? trajectoryPoints(ok.samples, fm.centralBody, ctx.ephemeris) : [],
    bPlane: ok ? bPlaneOf(run, ok) : null,
    approaches: ok ? ok.approaches.map((a) => ({ body: a.body, epoch: epochOf(a.epochTdbS), distanceKm: a.distanceKm, altitudeKm: a.distanceKm - radiusOf(a.body) })) : [],
    bodyPositions: ok ? bodyPositions(ctx.ephemeris, fm.centralBody, fm.perturbingBodies, ok.approaches, ctx.epochs.initialTdbS, epochOf) : [],
    limits: { ...problem.limits },
    effort: { propagations: 0, evaluations: 0 },
  };
  if (ok) attachFiniteDetails(problem, plan.burns, ok.burns, correction.seeds, ctx.ephemeris, leapSeconds);
  plan.totalDeltaVMS = plan.burns.reduce((s, b) => s + b.magnitudeMS, 0);
  plan.totalPropellantKg = plan.burns.reduce((s, b) => s + b.propellantKg, 0);
  return plan;
}

/** The B-plane record (requested and achieved B·T, B·R) when the problem targets a B-plane; its ellipse and
 * samples are filled by the dispersion stage. */
function bPlaneOf(run: PlanRun, ok: TrajectoryEvaluation): ManeuverPlan['bPlane'] {
  const { ctx, problem } = run;
  const idx = ctx.bPlaneIndex;
  if (!idx) return null;
  const t = problem.targets[ctx.components[idx.bDotT].targetIndex];
  return {
    body: idx.body, referencePlane: t.kind === 'b-plane' ? t.referencePlane : 'ecliptic',
    targetBDotTKm: ctx.components[idx.bDotT].requested, targetBDotRKm: ctx.components[idx.bDotR].requested,
    achievedBDotTKm: ok.values[idx.bDotT], achievedBDotRKm: ok.values[idx.bDotR],
    ellipse: null, bodyRadiusKm: radiusOf(idx.body), impactRadiusKm: approachImpactRadiusKm(ctx, ok), samples: [],
  };
}

/** Stage 4 (converged plans): cross-check with the other method at a tighter tolerance, then linear
 * dispersion, then Monte Carlo (in-process unless left to the caller). Fills `plan` in place. */
async function checkAndDisperseStage(run: PlanRun, plan: ManeuverPlan, settings: BurnSetting[], ok: TrajectoryEvaluation): Promise<void> {
  const { problem, ctx, options, progress } = run;
  progress({ stage: 'cross-checking', fraction: 0.55, message: `re-propagating with ${plan.crossCheck.method}` });
  await yieldToLoop();
  const cc = await runCrossCheck(ctx, settings, ok.values.slice(0, run.m), run.primary.signal);
  run.count(cc);
  plan.crossCheck = cc.check;
  run.checkAbort();

  progress({ stage: 'dispersion', fraction: 0.65, message: 'linear dispersion' });
  const lin = linearDispersion(ctx, ok);
  plan.dispersion.linear = lin.linear;
  plan.dispersion.notes.push(...lin.notes);
  if (plan.bPlane) plan.bPlane.ellipse = lin.linear?.total.bPlane ?? null;
  const n = problem.dispersion.samples;
  const hasErrors = problem.executionErrors !== undefined || ctx.initialCovariance !== null;
  if (options.monteCarlo === 'skip' || n === 0 || !hasErrors) {
    plan.dispersion.notes.push(`Monte Carlo not run here (${!hasErrors ? 'nothing to disperse' : n === 0 ? 'dispersion.samples is 0' : 'left to the caller'})`);
    return;
  }
  const samples = await runSamplesShared(ctx, plan, options.sampleRunners ?? [], {
    seed: problem.dispersion.seed, count: n, signal: run.primary.signal,
    onSample: (done) => {
      if (done % 5 === 0 || done === n) {
        progress({ stage: 'dispersion', fraction: 0.7 + 0.29 * (done / n), message: `Monte Carlo sample ${done}/${n}`, samplesDone: done, samplesTotal: n });
      }
    },
  });
  plan.effort = { ...run.effort };
  Object.assign(plan, attachMonteCarlo(plan, summariseDispersion(problem, plan, samples)));
}
