/**
 * Monte Carlo dispersion with full non-linear propagation. Sample i is drawn by planner/dispersion's
 * sampler from (seed, i) only, so any split of [0, N) into batches (queue fan-out)
 * gives exactly the single-process result. summariseDispersion compares the samples with the plan's linear
 * B-plane covariance; attachMonteCarlo stores the summary and recomputes the dispersion caveats.
 */
import { InvalidInputError } from '../../propagator/index.ts';
import type { EphemerisCache, EphemerisFileTable, StateVector } from '../../propagator/index.ts';
import { ephemerisSourceMismatch } from '../../contract/ephemeris-sets.ts';
import { bPlaneEllipse, compareEllipses } from '../dispersion/ellipse.ts';
import { binomialEstimate } from '../dispersion/impact-probability.ts';
import { createDispersionSampler, runSampleRange } from '../dispersion/monte-carlo.ts';
import { checkLinearity, LINEARITY_CHECK_DEFAULTS } from '../dispersion/linearity-check.ts';
import { mergeSampleBatches, sampleCovariance, sampleMean } from '../dispersion/sample-statistics.ts';
import type { DispersionSample, ManeuverPlan, MonteCarloSummary } from '../../contract/plan-types.ts';
import type { PlanningProblem } from '../../contract/problem-schema.ts';
import type { CheckedProblem } from '../problem-checks.ts';
import type { BurnSetting } from '../targeting/controls.ts';
import { evaluateTrajectory } from '../targeting/evaluate-trajectory.ts';
import { controlSettings } from '../targeting/finite-controls.ts';
import { evaluateComponent } from '../targeting/target-geometry.ts';
import { dispersedSetting } from './finite-stage.ts';
import { planCaveats } from './plan-caveats.ts';
import { planningContext } from './planning-context.ts';
import type { PlanningContext } from './planning-context.ts';

export interface SampleRunOptions {
  seed: number;
  firstIndex: number;
  count: number;
  signal?: AbortSignal;
  /** Called after each sample with the number done in this batch. */
  onSample?: (done: number) => void;
  /** The process's shared ephemeris cache (see PlanOptions.ephemerisCache). */
  ephemerisCache?: EphemerisCache;
  /** The ephemeris files the plan was made on (see PlanOptions.ephemerisFiles); checked against its record. */
  ephemerisFiles?: readonly EphemerisFileTable[];
}

/** Runs samples [firstIndex, firstIndex + count) of a converged plan; see the file comment. */
export async function runDispersionSamplesWithContext(ctx: PlanningContext, plan: ManeuverPlan, options: SampleRunOptions): Promise<DispersionSample[]> {
  if (plan.status !== 'converged') throw new InvalidInputError('plan.status', 'Monte Carlo needs a converged plan');
  const sampler = createDispersionSampler({
    burnDeltaVKmS: plan.burns.map((b) => b.deltaVInertialKmS),
    executionErrors: ctx.problem.executionErrors ?? null,
    initialCovariance: ctx.initialCovariance,
  });
  const idx = ctx.bPlaneIndex;
  const runs = await runSampleRange(sampler, async (drawn): Promise<DispersionSample> => {
    const d = drawn.initialStateOffset;
    const base = ctx.evaluation.initial;
    const initial: StateVector = d ? {
      ...base,
      positionKm: [base.positionKm[0] + d[0], base.positionKm[1] + d[1], base.positionKm[2] + d[2]],
      velocityKmS: [base.velocityKmS[0] + d[3], base.velocityKmS[1] + d[4], base.velocityKmS[2] + d[5]],
    } : base;
    const applied = drawn.burnDeltaVKmS;
    const settings: BurnSetting[] = plan.burns.map((b, i) => dispersedSetting(b, applied[i], ctx.problem.spacecraft.engine.ispS));
    const ev = await evaluateTrajectory({ ...ctx.evaluation, initial }, settings, {
      withStm: false, method: ctx.problem.forceModel.method, relativeTolerance: ctx.problem.forceModel.relativeTolerance,
      signal: options.signal,
    });
    if (ev.ok) {
      const approach = idx ? ev.approaches.find((a) => a.body === idx.body) : ev.approaches[0];
      return {
        index: drawn.index, appliedDeltaVKmS: applied,
        bDotTKm: idx ? ev.values[idx.bDotT] : null, bDotRKm: idx ? ev.values[idx.bDotR] : null,
        closestApproachTdbS: approach ? approach.epochTdbS : null,
        closestApproachRadiusKm: approach ? approach.distanceKm : null,
        impact: false,
        achieved: ev.values.slice(0, ctx.targetCount),
      };
    }
    // An impact still has a B-plane point (the asymptote pierces the plane inside the impact radius).
    let bDotTKm: number | null = null;
    let bDotRKm: number | null = null;
    const rel = ev.impact?.stateRelBody;
    if (idx && ev.impact?.body === idx.body && rel) {
      try {
        bDotTKm = evaluateComponent(ctx.components[idx.bDotT], rel, ev.impact.epochTdbS, { partial: false }).value;
        bDotRKm = evaluateComponent(ctx.components[idx.bDotR], rel, ev.impact.epochTdbS, { partial: false }).value;
      } catch {
        // not hyperbolic about the body: no B-plane point
      }
    }
    return {
      index: drawn.index, appliedDeltaVKmS: applied, bDotTKm, bDotRKm,
      closestApproachTdbS: ev.impact ? ev.impact.epochTdbS : null, closestApproachRadiusKm: null,
      impact: ev.impact !== null, achieved: ctx.components.slice(0, ctx.targetCount).map(() => null),
    };
  }, { seed: options.seed, firstIndex: options.firstIndex, count: options.count, signal: options.signal, onSample: options.onSample });
  return runs.map((r) => r.result);
}

/** Queue fan-out entry: runs samples [firstIndex, firstIndex + count) for a converged plan, on the plan's own
 * ephemeris: a plan made on files needs the same files (options.ephemerisFiles, their SHA-256 checked against
 * the plan's record); any difference is refused under `ephemeris`, naming the bodies. */
export async function runDispersionSamples(problem: CheckedProblem, plan: ManeuverPlan, options: SampleRunOptions): Promise<DispersionSample[]> {
  const ctx = planningContext(problem, options.ephemerisCache, options.ephemerisFiles);
  const mismatch = ephemerisSourceMismatch(plan.ephemerisSources ?? [], ctx.ephemerisSources);
  if (mismatch !== null) {
    throw new InvalidInputError('ephemeris', `the Monte Carlo samples must fly on the plan's own ephemeris, and the files here differ: ${mismatch}`);
  }
  return runDispersionSamplesWithContext(ctx, plan, options);
}

/**
 * Readies a process (a helper thread started before the plan exists) for runDispersionSamples of `problem`:
 * builds its planning context on `ephemerisCache`, so the blocks of the problem's span get fitted, and flies
 * the trajectory of the burns' first guesses once, so the propagator's code is compiled when the samples
 * come. Its result is discarded; nothing a later run computes depends on it (a block's fit depends only on
 * its key and index).
 */
export async function prepareDispersionSamples(problem: CheckedProblem, options: Pick<SampleRunOptions, 'ephemerisCache' | 'ephemerisFiles' | 'signal'>): Promise<void> {
  const ctx = planningContext(problem, options.ephemerisCache, options.ephemerisFiles);
  const fm = problem.forceModel;
  await evaluateTrajectory(ctx.evaluation, controlSettings(problem, ctx.epochs, ctx.layout, ctx.layout.initial), {
    withStm: false, method: fm.method, relativeTolerance: fm.relativeTolerance, signal: options.signal,
  });
}

function std(values: number[]): number | null {
  if (values.length < 2) return null;
  const m = values.reduce((s, v) => s + v, 0) / values.length;
  return Math.sqrt(values.reduce((s, v) => s + (v - m) ** 2, 0) / (values.length - 1));
}

/** Combines samples (any order, any batching) into the Monte Carlo summary of a plan. */
export function summariseDispersion(problem: PlanningProblem, plan: ManeuverPlan, samples: DispersionSample[]): MonteCarloSummary {
  const merged = mergeSampleBatches([samples]);
  const n = merged.length;
  const impacts = merged.filter((s) => s.impact).length;
  const failedSamples = merged.filter((s) => !s.impact && s.achieved.every((a) => a === null)).length;
  const est = binomialEstimate(impacts, Math.max(1, n));
  const bRows = merged.filter((s) => s.bDotTKm !== null && s.bDotRKm !== null).map((s) => [s.bDotTKm as number, s.bDotRKm as number]);
  let ellipse = null;
  let mean: number[] | null = null;
  let linearAgreement: MonteCarloSummary['linearAgreement'] = null;
  if (bRows.length >= 3) {
    mean = sampleMean(bRows);
    const sc = sampleCovariance(bRows, mean);
    ellipse = bPlaneEllipse(sc);
    const lin = plan.dispersion.linear?.total.bPlane;
    const nominal = plan.bPlane && plan.bPlane.achievedBDotTKm !== null && plan.bPlane.achievedBDotRKm !== null
      ? [plan.bPlane.achievedBDotTKm, plan.bPlane.achievedBDotRKm] : null;
    if (lin && nominal && lin.semiMinorKm > 0 && bRows.length >= 4) {
      const cmp = compareEllipses(lin, ellipse, bRows.length);
      const check = checkLinearity(bRows, nominal, lin.covarianceKm2);
      linearAgreement = {
        axisRatioError: cmp.axisRatioError, orientationErrorDeg: cmp.orientationErrorDeg,
        orientationStandardErrorDeg: cmp.orientationStandardErrorDeg, passed: check.passed,
        limit: LINEARITY_CHECK_DEFAULTS.significance, meanPValue: check.meanPValue, covariancePValue: check.covariancePValue,
        message: check.message,
      };
    }
  }
  const targetCount = plan.targets.length;
  const targetSigmas = Array.from({ length: targetCount }, (_, i) => std(merged.flatMap((s) => (s.achieved[i] === null || s.achieved[i] === undefined ? [] : [s.achieved[i] as number]))));
  return {
    samples: n, seed: problem.dispersion.seed, bPlane: ellipse,
    meanBDotTKm: mean ? mean[0] : null, meanBDotRKm: mean ? mean[1] : null,
    closestApproachSigmaS: std(merged.flatMap((s) => (s.closestApproachTdbS !== null && !s.impact ? [s.closestApproachTdbS] : []))),
    impacts, impactProbability: n > 0 ? impacts / n : 0,
    impactProbabilityInterval: { lower95: est.lower95, upper95: est.upper95 },
    linearAgreement, targetSigmas,
    bPlanePoints: bRows.slice(0, 500).map(([t, r]) => ({ bDotTKm: t, bDotRKm: r })),
    failedSamples,
  };
}

const NO_LINEARITY_CHECK = 'no linearity check of the linear dispersion against the samples';

/** A copy of the plan with the Monte Carlo summary attached and its caveats recomputed. */
export function attachMonteCarlo(plan: ManeuverPlan, summary: MonteCarloSummary): ManeuverPlan {
  const notes = plan.dispersion.notes.filter((s) => !s.startsWith('Monte Carlo') && !s.startsWith(NO_LINEARITY_CHECK));
  // The χ² linearity check runs on the B-plane only; say so rather than let its absence read as a pass.
  if (summary.samples > 0 && !summary.linearAgreement) {
    notes.push(`${NO_LINEARITY_CHECK}: it covers a B-plane target only; compare the linear and Monte Carlo target σ yourself`);
  }
  const next: ManeuverPlan = {
    ...plan,
    dispersion: { ...plan.dispersion, monteCarlo: summary, notes },
    bPlane: plan.bPlane ? { ...plan.bPlane, samples: summary.bPlanePoints } : null,
  };
  next.caveats = planCaveats(next);
  return next;
}
