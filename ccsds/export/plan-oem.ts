/**
 * The predicted post-burn trajectory of a proposed plan as an Orbit Ephemeris Message: the problem's
 * initial state propagated with the plan's burns (the problem's force model, the plan's OEM files if it was made
 * on files, else the built-in ephemeris —
 * through the caller's shared Chebyshev cache when one is given, as the planner does),
 * sampled at a chosen step, one segment per arc between burns (an ephemeris must not be interpolated
 * across a velocity jump). When the problem has an initial covariance, each segment ends with that
 * covariance mapped linearly through the state transition matrix — orbit-determination uncertainty only;
 * execution errors of the burns are not in it (said in the block's comment). States and covariances are
 * always written in EME2000 (the standard's frame table has no ecliptic frame).
 */
import type { ManeuverPlan } from '../../contract/plan-types.ts';
import type { PlanningProblem } from '../../contract/problem-schema.ts';
import {
  type BodyName, CancelledError, changeCentre, congruence, covarianceBetweenFrames, createBuiltinEphemeris, type Ephemeris, type EphemerisCache, type EphemerisFileTable,
  ephemerisWithFiles,
  type ForceModelSpec, InvalidInputError,
  type LeapSecondTable, leapSecondTableOfPlan, parseEpoch, propagateAsync, rowsOf6, type StateVector, stateToFrame,
} from '../../propagator/index.ts';
import { ephemerisSourceMismatch } from '../../contract/ephemeris-sets.ts';
import { CENTRE_NAME_OF_BODY, type MessageFrame, WRITTEN_FRAME_NAME } from '../messages/frames.ts';
import type { InterpolationMethod, Oem, OemCovariance, OemSegment, OemState } from '../messages/odm-types.ts';
import { assertExportable, type PlanExportOptions, planEpochComment, planHeader } from './plan-opm.ts';
import { formatCcsdsEpoch } from '../syntax/values.ts';

export interface PlanOemOptions extends PlanExportOptions {
  /** Time between ephemeris lines, s (> 0); each segment also holds its first and last epoch. */
  stepS: number;
  /** Interpolation recommended in the metadata. @defaultValue { method: 'HERMITE', degree: 7 } */
  interpolation?: { method: InterpolationMethod; degree: number };
  /** Source of body positions; when absent, the built-in one (through `ephemerisCache` when given). */
  ephemeris?: Ephemeris;
  /** The OEM files a plan made on files needs again (checked body by body against the plan's record). */
  ephemerisFiles?: readonly EphemerisFileTable[];
  /** The process's shared ephemeris cache (propagator EphemerisCache); used when `ephemeris` is absent. */
  ephemerisCache?: EphemerisCache;
  /** Write mapped covariance blocks when the problem has an initial covariance. @defaultValue true */
  covariance?: boolean;
  signal?: AbortSignal;
  onProgress?: (fraction: number) => void;
}

/** The built-in source, or a view of the shared cache over the span (±1 day) for the bodies the export uses. */
function exportEphemeris(problem: PlanningProblem, startTdbS: number, endTdbS: number, cache?: EphemerisCache): Ephemeris {
  const builtin = createBuiltinEphemeris();
  const f = problem.forceModel;
  const bodies = [...new Set<BodyName>([f.centralBody, ...f.perturbingBodies, problem.initialState.centre])];
  if (cache === undefined || bodies.length === 1) return builtin;
  const marginS = 86400;
  return cache.ephemerisFor(builtin, bodies, {
    startTdbS: Math.max(builtin.span.startTdbS, Math.min(startTdbS, endTdbS) - marginS),
    endTdbS: Math.min(builtin.span.endTdbS, Math.max(startTdbS, endTdbS) + marginS),
  });
}

/**
 * The ephemeris the plan was made on: the built-in series (through the cache), or — for a plan that recorded
 * OEM files — `options.ephemerisFiles` layered over it, refused (field `ephemeris`) when absent or when any
 * body's source differs from the plan's record (re-propagating on other positions would export another
 * trajectory than the one planned and reviewed).
 */
function planEphemeris(problem: PlanningProblem, plan: ManeuverPlan, startTdbS: number, endTdbS: number,
  options: Pick<PlanOemOptions, 'ephemerisCache' | 'ephemerisFiles'>): Ephemeris {
  const recorded = plan.ephemerisSources ?? [];
  const files = recorded.filter((e) => e.source === 'oem');
  const given = options.ephemerisFiles ?? [];
  if (files.length === 0 && given.length === 0) return exportEphemeris(problem, startTdbS, endTdbS, options.ephemerisCache);
  if (given.length === 0) {
    throw new InvalidInputError('ephemeris', `the plan was made with ephemeris files (${files.map((e) => `${e.body}: ${e.file}`).join(', ')}); `
      + 'its OEM export needs the same files (the CLI: veer export --ephemeris FILE; the service: the problem\'s ephemeris set)');
  }
  const span = { startTdbS: Math.min(startTdbS, endTdbS), endTdbS: Math.max(startTdbS, endTdbS) };
  const { source, sources } = ephemerisWithFiles(given, span, recorded.map((e) => e.body), 'ephemeris');
  const mismatch = ephemerisSourceMismatch(recorded, sources);
  if (mismatch !== null) throw new InvalidInputError('ephemeris', `the files given are not the ones the plan was made on: ${mismatch}`);
  return source;
}

/** Most lines one export may write (a guard against a step far too small for the span). */
export const MAX_OEM_LINES = 200_000;

/** What every arc of one export shares: the problem's force model and epochs, the output frame and scale. */
interface OemExportRun {
  plan: ManeuverPlan;
  options: PlanOemOptions;
  /** Start and end of the exported span, TDB s from J2000. */
  startTdbS: number;
  endTdbS: number;
  leap: LeapSecondTable;
  scale: PlanOemOptions['timeSystem'];
  frame: MessageFrame;
  ephemeris: Ephemeris;
  forces: ForceModelSpec;
  interpolation: { method: InterpolationMethod; degree: number };
  withCovariance: boolean;
  /** A propagated state in the problem's initial centre and the output frame. */
  toOutput: (x: StateVector) => StateVector;
}

/** Checks the export's options against the plan and builds what the arcs share (errors name the field). */
function exportRun(problem: PlanningProblem, plan: ManeuverPlan, options: PlanOemOptions): OemExportRun {
  if (!(options.stepS > 0) || !Number.isFinite(options.stepS)) {
    throw new InvalidInputError('stepS', `step ${options.stepS} s must be a finite number > 0`);
  }
  const s = problem.initialState;
  const leap = leapSecondTableOfPlan(plan.leapSeconds);
  const startTdbS = parseEpoch(s.epoch, undefined, 'initialState.epoch', leap);
  const endTdbS = parseEpoch(problem.endEpoch, undefined, 'endEpoch', leap);
  const lines = Math.abs(endTdbS - startTdbS) / options.stepS + plan.burns.length * 2 + 2;
  if (lines > MAX_OEM_LINES) {
    throw new InvalidInputError('stepS', `step ${options.stepS} s gives about ${Math.round(lines)} lines `
      + `(limit ${MAX_OEM_LINES}); choose a larger step`);
  }
  const scale = options.timeSystem ?? 'TDB';
  const frame: MessageFrame = 'J2000_EQUATORIAL';
  const ephemeris = options.ephemeris ?? planEphemeris(problem, plan, startTdbS, endTdbS, options);
  const interpolation = options.interpolation ?? { method: 'HERMITE', degree: 7 };
  const withCovariance = (options.covariance ?? true) && s.covarianceKmKmS !== undefined;
  const toOutput = (x: StateVector): StateVector => stateToFrame(x.centre === s.centre ? x : changeCentre(x, s.centre, ephemeris), frame);
  return {
    plan, options, startTdbS, endTdbS, leap, scale, frame, ephemeris, forces: exportForces(problem), interpolation, withCovariance, toOutput,
  };
}

/** The problem's force model as the propagator takes it (solar pressure with the spacecraft's mass). */
function exportForces(problem: PlanningProblem): ForceModelSpec {
  const f = problem.forceModel;
  return {
    centralBody: f.centralBody,
    perturbingBodies: f.perturbingBodies,
    centralJ2: f.centralJ2,
    ...(f.solarPressure && problem.spacecraft.solarPressure ? {
      solarPressure: { ...problem.spacecraft.solarPressure, massKg: problem.spacecraft.massKg },
    } : {}),
  };
}

/** Propagates the plan arc by arc and builds the OEM (throws InvalidInputError for a plan that did not
 * converge or failed its cross-check). */
export async function planToOem(problem: PlanningProblem, plan: ManeuverPlan, options: PlanOemOptions): Promise<Oem> {
  assertExportable(plan);
  const run = exportRun(problem, plan, options);
  const s = problem.initialState;
  let covariance = s.covarianceKmKmS && covarianceBetweenFrames(s.covarianceKmKmS, s.frame, 'J2000_EQUATORIAL');
  let state: StateVector = {
    epochTdbS: run.startTdbS, centre: s.centre, frame: s.frame, positionKm: [...s.positionKm], velocityKmS: [...s.velocityKmS],
  };
  const burns = [...plan.burns].sort((a, b) => a.epoch.tdbS - b.epoch.tdbS);
  const arcEnds = [...burns.map((b) => b.epoch.tdbS), run.endTdbS];
  const segments: OemSegment[] = [];
  for (let arc = 0; arc < arcEnds.length; arc++) {
    if (options.signal?.aborted) throw new CancelledError('OEM export cancelled');
    const arcEnd = arcEnds[arc];
    if (arcEnd > state.epochTdbS) {
      const flown = await propagateArc(run, problem.forceModel, arc, arcEnds.length, state, arcEnd, covariance);
      segments.push(flown.segment);
      state = flown.final;
      covariance = flown.covariance;
    }
    const burn = burns[arc];
    if (burn) {
      // Burns are inertial J2000 equatorial; apply in those axes.
      const eq = stateToFrame(state, 'J2000_EQUATORIAL');
      const v = eq.velocityKmS;
      const dv = burn.deltaVInertialKmS;
      state = { ...eq, velocityKmS: [v[0] + dv[0], v[1] + dv[1], v[2] + dv[2]] };
    }
  }
  return { header: planHeader(plan, options), segments };
}

/** Arc `arc` (of `arcs`) from `state` to `arcEnd` (TDB s): its segment, its end state and the covariance
 * (J2000 equatorial, km and km/s) mapped to its end through the arc's STM. */
async function propagateArc(run: OemExportRun, f: PlanningProblem['forceModel'], arc: number, arcs: number,
  state: StateVector, arcEnd: number, covariance: number[][] | undefined,
): Promise<{ segment: OemSegment; final: StateVector; covariance: number[][] | undefined }> {
  const { options, leap, scale } = run;
  const result = await propagateAsync({
    initial: state, endEpochTdbS: arcEnd, forces: run.forces, ephemeris: run.ephemeris, method: f.method,
    relativeTolerance: f.relativeTolerance, outputStepS: options.stepS, withStm: run.withCovariance,
    switching: { enabled: f.switching },
  }, {
    ...(options.signal ? { signal: options.signal } : {}),
    onProgress: (x) => options.onProgress?.((arc + x) / arcs),
  });
  if (result.outcome === 'cancelled') throw new CancelledError('OEM export cancelled');
  if (result.outcome !== 'finished') {
    throw new InvalidInputError('plan', `propagation of arc ${arc + 1} ended '${result.outcome}': ${result.message ?? ''}`);
  }
  const samples = result.samples.map(run.toOutput);
  const covariances: OemCovariance[] = [];
  let mapped = covariance;
  if (run.withCovariance && covariance && result.stm) {
    if (arc === 0) covariances.push(covarianceBlock(run.startTdbS, covariance, scale, leap, 'Initial-state covariance'));
    mapped = congruence(rowsOf6(result.stm), covariance);
    covariances.push(covarianceBlock(arcEnd, mapped, scale, leap,
      'Initial-state covariance mapped linearly (STM); burn execution errors not included'));
  }
  const seg = segment(run.plan, options, samples, covariances, arc, run.interpolation, run.frame, scale, leap);
  return { segment: seg, final: result.final, covariance: mapped };
}

/** A covariance block; `matrix` is in J2000 equatorial axes, written as EME2000. */
function covarianceBlock(epochTdbS: number, matrix: number[][], scale: PlanOemOptions['timeSystem'], leap: LeapSecondTable,
  comment: string): OemCovariance {
  return {
    comments: [comment], epoch: formatCcsdsEpoch(epochTdbS, scale ?? 'TDB', 6, leap), epochTdbS,
    covRefFrame: WRITTEN_FRAME_NAME, matrix: matrix.map((row) => [...row]),
  };
}

function segment(plan: ManeuverPlan, options: PlanOemOptions, samples: StateVector[], covariances: OemCovariance[],
  arc: number, interpolation: { method: InterpolationMethod; degree: number }, frame: MessageFrame,
  scale: PlanOemOptions['timeSystem'], leap: LeapSecondTable): OemSegment {
  const ts = scale ?? 'TDB';
  const written: OemState[] = samples.map((x) => ({
    epoch: formatCcsdsEpoch(x.epochTdbS, ts, 6, leap), epochTdbS: x.epochTdbS,
    positionKm: [...x.positionKm], velocityKmS: [...x.velocityKmS], line: 0,
  }));
  // Epochs are printed to the microsecond: a sample that would print like its successor is dropped (the
  // arc's end state is always kept), so the file's epochs increase strictly.
  const states = written.filter((x, i) => i === written.length - 1 || x.epoch !== written[i + 1].epoch);
  // Never recommend more points than the segment holds.
  const n = states.length;
  const degree = interpolation.method === 'HERMITE' ? Math.min(interpolation.degree, 2 * n - 1)
    : interpolation.method === 'LINEAR' ? 1 : Math.min(interpolation.degree, n - 1);
  const centre = samples[0].centre;
  const first = states[0];
  const last = states[n - 1];
  const burnBefore = arc > 0 ? plan.burns[arc - 1] : undefined;
  return {
    metadata: {
      comments: [burnBefore ? `Arc ${arc + 1}: after ${burnBefore.label} at ${planEpochComment(plan, burnBefore.epoch.tdbS)}`
        : `Arc 1: from the initial state`, `from ${planEpochComment(plan, first.epochTdbS)} to ${planEpochComment(plan, last.epochTdbS)}`],
      objectName: plan.spacecraftName,
      objectId: options.objectId ?? 'UNKNOWN',
      centerName: CENTRE_NAME_OF_BODY[centre],
      centre,
      refFrame: WRITTEN_FRAME_NAME,
      frame,
      timeSystem: ts,
      startTime: first.epoch, startTdbS: first.epochTdbS,
      stopTime: last.epoch, stopTdbS: last.epochTdbS,
      ...(n > 1 ? { interpolation: interpolation.method, interpolationDegree: Math.max(1, degree) } : {}),
    },
    dataComments: [],
    states,
    covariances,
  };
}
