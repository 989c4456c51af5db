/**
 * planManeuvers: the whole planning job — validate, correct, evaluate the solution with sensitivities,
 * cross-check with the other method, disperse (linear + Monte Carlo), assemble the plan with caveats.
 * Pure: the same problem gives the same plan. Every propagation awaits the event loop, so progress and
 * AbortSignal flow; cancellation rejects with CancelledError. Not converging resolves to a plan with
 * status 'not-converged', no burns to execute and the diagnostics.
 */
import { BUILTIN_LEAP_SECONDS, CancelledError, planLeapSeconds } from '../../propagator/index.ts';
import type { EphemerisCache, LeapSecondTable, Vec3 } from '../../propagator/index.ts';
import { finiteDifferenceJacobian, runCorrector } from '../corrector/differential-corrector.ts';
import type { CorrectorResult } from '../corrector/differential-corrector.ts';
import type { IterationRecord, ManeuverPlan, PlanProgress, Sensitivities } from '../../contract/plan-types.ts';
import { parseProblem } from '../problem-checks.ts';
import { problemHash, targetSetKey } from '../problem-hash.ts';
import type { EphemerisFileTable } from '../ephemeris-files.ts';
import type { PlanningProblem } from '../../contract/problem-schema.ts';
import { controlSettings, finiteControlLayout } from '../targeting/finite-controls.ts';
import type { FiniteSeed } from '../targeting/finite-types.ts';
import { attachFiniteDetails, finiteSeeds, hasFiniteBurns } from './finite-stage.ts';
import { lambertSeeds } from '../targeting/lambert-seed.ts';
import { evaluateTrajectory } from '../targeting/evaluate-trajectory.ts';
import type { TrajectoryEvaluation } from '../targeting/evaluate-trajectory.ts';
import { runCrossCheck } from './cross-check.ts';
import { approachImpactRadiusKm, linearDispersion } from './linear-dispersion.ts';
import { attachMonteCarlo, runDispersionSamplesWithContext, summariseDispersion } from './monte-carlo.ts';
import { planCaveats } from './plan-caveats.ts';
import { bodyPositions, forceModelSummary, planEpoch, plannedBurns, targetResults, trajectoryPoints } from './plan-parts.ts';
import { planningContext } from './planning-context.ts';
import { SOFTWARE_VERSION } from '../../contract/software-version.ts';
import { radiusOf } from '../targeting/target-components.ts';

export interface PlanOptions {
  onProgress?: (p: PlanProgress) => void;
  signal?: AbortSignal;
  /** 'in-process' (default) runs the Monte Carlo samples here; 'skip' leaves them to the caller (queue
   * fan-out through runDispersionSamples / summariseDispersion / attachMonteCarlo). */
  monteCarlo?: 'in-process' | 'skip';
  /** Also form the central finite-difference Jacobian at the solution and record its largest relative
   * difference from the STM one in sensitivities.stmVersusFiniteDifference (2n extra propagations).
   * @defaultValue false */
  verifyJacobian?: boolean;
  /** The process's shared ephemeris cache (propagator EphemerisCache), owned where plans are made (CLI,
   * planner thread); without it the plan fits its own. The plan is the same either way. */
  ephemerisCache?: EphemerisCache;
  /** The leap-second table for every UTC epoch read or written (the door loads a leap-seconds.list from
   * VEER_LEAP_SECONDS or --leap-seconds); recorded in the plan and covered by its problem hash.
   * @defaultValue BUILTIN_LEAP_SECONDS */
  leapSeconds?: LeapSecondTable;
  /** Bodies tabulated by ephemeris files the door read (CCSDS OEM): each replaces the built-in series for
   * its body; the plan records every body's source and the problem hash covers the files. @defaultValue [] */
  ephemerisFiles?: readonly EphemerisFileTable[];
}

const yieldToLoop = (): Promise<void> => new Promise((resolve) => setImmediate(resolve));

/** Plans the correction burns of a problem (validated again here); see the file comment. */
export async function planManeuvers(input: PlanningProblem, options: PlanOptions = {}): Promise<ManeuverPlan> {
  const { signal } = options;
  const progress = (p: PlanProgress): void => options.onProgress?.(p);
  const checkAbort = (): void => {
    if (signal?.aborted) throw new CancelledError();
  };
  progress({ stage: 'validating', fraction: 0, message: 'checking the problem' });
  const leapSeconds = options.leapSeconds ?? BUILTIN_LEAP_SECONDS;
  const problem = parseProblem(input, leapSeconds);
  let ctx = planningContext(problem, leapSeconds, options.ephemerisCache, options.ephemerisFiles);
  const leapRecord = planLeapSeconds(leapSeconds);
  const epochOf = (tdbS: number): ReturnType<typeof planEpoch> => planEpoch(tdbS, leapSeconds);
  checkAbort();
  await yieldToLoop();
  const fm = problem.forceModel;
  let propagations = 0;
  let evaluations = 0;
  const count = (ev: { propagations: number; evaluations: number }): void => {
    propagations += ev.propagations;
    evaluations += ev.evaluations;
  };
  const primary = { method: fm.method, relativeTolerance: fm.relativeTolerance, signal } as const;
  const m = ctx.targetCount;

  // 1. Differential correction (from Lambert seeds where the problem asks).
  const seeded = await lambertSeeds(problem, ctx.epochs, ctx.layout, ctx.evaluation, signal);
  const maxIter = problem.corrector.maxIterations;
  progress({ stage: 'correcting', fraction: 0.02, message: 'differential correction', iteration: 0 });
  const correct = (initial: number[], stage: string): Promise<CorrectorResult> => runCorrector({
    initial, tolerances: ctx.components.slice(0, m).map((c) => c.tolerance),
    controlScales: ctx.layout.scales, maxStep: ctx.layout.maxStep, finiteDifferenceStep: ctx.layout.finiteDifferenceStep,
    lower: ctx.layout.lower, upper: ctx.layout.upper, maxIterations: maxIter,
    evaluate: async (x, withJacobian) => {
      const ev = await evaluateTrajectory(ctx.evaluation, controlSettings(problem, ctx.epochs, ctx.layout, x), { ...primary, withStm: withJacobian });
      if (!ev.ok) return { ok: false, reason: ev.reason };
      count(ev);
      return { ok: true, residuals: ev.values.slice(0, m).map((v, i) => v - ctx.components[i].requested), jacobian: ev.jacobian ? ev.jacobian.slice(0, m) : undefined };
    },
    onIteration: (rec) => progress({
      stage: 'correcting', fraction: 0.02 + 0.5 * Math.min(1, (rec.iteration + 1) / Math.min(maxIter, 8)),
      message: `${stage}iteration ${rec.iteration}: largest |residual|/tolerance ${rec.maxScaledResidual.toPrecision(3)}`, iteration: rec.iteration,
    }),
  });
  let result: CorrectorResult = await correct(seeded.initial, '');
  // 1b. Finite burns: from the converged impulsive solution, solve for pointing, duration (and ignition).
  let seeds: (FiniteSeed | undefined)[] = problem.burns.map(() => undefined);
  const earlierIterations: CorrectorResult['iterations'] = [];
  if (hasFiniteBurns(problem) && result.outcome === 'converged') {
    const impulsive = await evaluateTrajectory(ctx.evaluation, controlSettings(problem, ctx.epochs, ctx.layout, result.controls), { ...primary, withStm: false });
    const seeded2 = impulsive.ok ? finiteSeeds(problem, impulsive.burns) : { seeds, error: impulsive.ok ? null : impulsive.reason };
    if (seeded2.error !== null) {
      result = { ...result, outcome: 'evaluation-failed', message: `finite-burn stage not started: ${seeded2.error}` };
    } else {
      seeds = seeded2.seeds;
      const layout = finiteControlLayout(problem, ctx.epochs, ctx.layout, result.controls, seeds);
      ctx = { ...ctx, layout, evaluation: { ...ctx.evaluation, controlMap: layout.descriptors.map((d) => ({ burnIndex: d.burnIndex, kind: d.kind })) } };
      earlierIterations.push(...result.iterations.map((it) => ({ ...it, note: `impulsive stage${it.note ? `: ${it.note}` : ''}` })));
      const finite = await correct(layout.initial, 'finite burns: ');
      result = { ...finite, iterations: [...earlierIterations, ...finite.iterations], message: `finite burns: ${finite.message}` };
    }
  }
  checkAbort();
  const iterations: IterationRecord[] = result.iterations.map((it) => ({
    ...it, jacobianSource: it.jacobianSource === 'analytic' ? 'stm' : it.jacobianSource,
  }));
  const conds = iterations.flatMap((it) => (it.conditionNumber === null ? [] : [it.conditionNumber]));
  const converged = result.outcome === 'converged';
  const settings = controlSettings(problem, ctx.epochs, ctx.layout, result.controls);

  // 2. The solution (or last iterate) evaluated with sensitivities and samples for the plot.
  const spanS = ctx.epochs.endTdbS - ctx.epochs.initialTdbS;
  const final = await evaluateTrajectory(ctx.evaluation, settings, { ...primary, withStm: true, outputStepS: spanS / 400 });
  const ok: TrajectoryEvaluation | null = final.ok ? final : null;
  if (ok) count(ok);
  const freeEpoch = problem.burns.map((_, i) => ctx.epochs.burnWindowTdbS[i] !== undefined);
  const targetEpochs = ctx.components.slice(0, m).map((c) => (c.station.kind === 'epoch' ? c.station.epochTdbS
    : ok?.approaches.find((a) => a.body === (c.station.kind === 'approach' ? c.station.body : null))?.epochTdbS ?? null));
  const after = (t: number): number | null => {
    const later = targetEpochs.filter((x): x is number => x !== null && x > t);
    return later.length ? Math.min(...later) : null;
  };
  const idx = ctx.bPlaneIndex;
  const sensitivities: Sensitivities | null = ok?.jacobian ? {
    controls: ctx.layout.descriptors, components: ctx.components.slice(0, m).map((c) => c.component),
    jacobian: ok.jacobian.slice(0, m), source: 'stm', stmVersusFiniteDifference: null,
  } : null;
  if (sensitivities && options.verifyJacobian && converged) {
    const fd = await finiteDifferenceJacobian(async (x) => {
      const ev = await evaluateTrajectory(ctx.evaluation, controlSettings(problem, ctx.epochs, ctx.layout, x), { ...primary, withStm: false });
      if (!ev.ok) return { ok: false, reason: ev.reason };
      count(ev);
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
  const lastIterateBurns: Vec3[] = ok ? ok.burns.map((b) => b.deltaVInertialKmS) : [];

  const plan: ManeuverPlan = {
    planFormatVersion: 1,
    status: converged && ok ? 'converged' : 'not-converged',
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
    burns: converged && ok ? plannedBurns(problem, ok.burns, freeEpoch, after, leapSeconds) : [],
    totalDeltaVMS: 0,
    totalPropellantKg: 0,
    propellantLoadKg: problem.spacecraft.propellantKg ?? null,
    targets: targetResults(ctx.components, m, ok ? ok.values : ctx.components.slice(0, m).map(() => null), leapSeconds),
    iterations,
    convergence: {
      outcome: converged && !ok ? 'evaluation-failed' : result.outcome,
      message: converged && !ok ? `the solution could not be re-evaluated: ${(final as { reason: string }).reason}` : result.message,
      leastSquares: result.leastSquares,
      maxConditionNumber: conds.length ? Math.max(...conds) : null,
      lastIterate: converged && ok ? null : { controls: result.controls, burnsInertialKmS: lastIterateBurns },
      seeds: seeded.seeds,
    },
    sensitivities,
    crossCheck: {
      passed: false, primaryMethod: fm.method, method: fm.method === 'cowell' ? 'encke' : 'cowell',
      primarySwitching: fm.switching, switching: !fm.switching,
      relativeTolerance: Math.max(1e-13, fm.relativeTolerance / 100), toleranceFraction: problem.limits.crossCheckToleranceFraction,
      differences: [], message: 'not run: the plan did not converge',
    },
    dispersion: { executionModel: problem.executionErrors ?? null, linear: null, monteCarlo: null, notes: [] },
    caveats: [],
    trajectory: ok ? trajectoryPoints(ok.samples, fm.centralBody, ctx.ephemeris) : [],
    bPlane: null,
    approaches: ok ? ok.approaches.map((a) => ({ body: a.body, epoch: epochOf(a.epochTdbS), distanceKm: a.distanceKm, altitudeKm: a.distanceKm - radiusOf(a.body) })) : [],
    bodyPositions: ok ? bodyPositions(ctx.ephemeris, fm.centralBody, fm.perturbingBodies, ok.approaches, ctx.epochs.initialTdbS, epochOf) : [],
    limits: { ...problem.limits },
    effort: { propagations: 0, evaluations: 0 },
  };
  if (ok) attachFiniteDetails(problem, plan.burns, ok.burns, seeds, ctx.ephemeris, leapSeconds);
  plan.totalDeltaVMS = plan.burns.reduce((s, b) => s + b.magnitudeMS, 0);
  plan.totalPropellantKg = plan.burns.reduce((s, b) => s + b.propellantKg, 0);
  if (idx && ok) {
    const t = problem.targets[ctx.components[idx.bDotT].targetIndex];
    plan.bPlane = {
      body: idx.body, referencePlane: t.kind === 'b-plane' ? t.referencePlane : 'ecliptic',
      targetBDotTKm: ctx.components[idx.bDotT].requested, targetBDotRKm: ctx.components[idx.bDotR].requested,
      achievedBDotTKm: ok.values[idx.bDotT], achievedBDotRKm: ok.values[idx.bDotR],
      ellipse: null, bodyRadiusKm: radiusOf(idx.body), impactRadiusKm: approachImpactRadiusKm(ctx, ok), samples: [],
    };
  }

  if (plan.status === 'converged' && ok) {
    // 3. Cross-check with the other method at a tighter tolerance.
    progress({ stage: 'cross-checking', fraction: 0.55, message: `re-propagating with ${plan.crossCheck.method}` });
    await yieldToLoop();
    const cc = await runCrossCheck(ctx, settings, ok.values.slice(0, m), signal);
    count(cc);
    plan.crossCheck = cc.check;
    checkAbort();

    // 4. Linear dispersion, then Monte Carlo.
    progress({ stage: 'dispersion', fraction: 0.65, message: 'linear dispersion' });
    const lin = linearDispersion(ctx, ok);
    plan.dispersion.linear = lin.linear;
    plan.dispersion.notes.push(...lin.notes);
    if (plan.bPlane) plan.bPlane.ellipse = lin.linear?.total.bPlane ?? null;
    const n = problem.dispersion.samples;
    const hasErrors = problem.executionErrors !== undefined || ctx.initialCovariance !== null;
    if (options.monteCarlo === 'skip' || n === 0 || !hasErrors) {
      plan.dispersion.notes.push(`Monte Carlo not run here (${!hasErrors ? 'nothing to disperse' : n === 0 ? 'dispersion.samples is 0' : 'left to the caller'})`);
    } else {
      const samples = await runDispersionSamplesWithContext(ctx, plan, {
        seed: problem.dispersion.seed, firstIndex: 0, count: n, signal,
        onSample: (done) => {
          if (done % 5 === 0 || done === n) {
            progress({ stage: 'dispersion', fraction: 0.7 + 0.29 * (done / n), message: `Monte Carlo sample ${done}/${n}`, samplesDone: done, samplesTotal: n });
          }
        },
      });
      plan.effort = { propagations, evaluations };
      const withMc = attachMonteCarlo(plan, summariseDispersion(problem, plan, samples));
      Object.assign(plan, withMc);
    }
  } else {
    plan.dispersion.notes.push('not computed: the plan did not converge');
  }
  plan.effort = { propagations, evaluations };
  plan.caveats = planCaveats(plan);
  progress({ stage: 'done', fraction: 1, message: plan.status === 'converged' ? 'plan ready for review' : 'not converged' });
  return plan;
}
