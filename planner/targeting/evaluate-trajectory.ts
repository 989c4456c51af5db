/**
 * One evaluation of the trajectory for a set of controls: propagates segment by segment (initial epoch →
 * each burn → each target epoch / closest approach), applies the burns, reads every target component and,
 * when asked, chains the segment STMs into
 *   G = d(state)/d(controls), P = d(state)/d(initial state), B_i = d(state)/d(Δv_i inertial),
 * so that d(component)/d(controls) = (∂component/∂state) · G. A burn's local frame is held fixed in the
 * chain (its turn with earlier controls is second order). A free epoch moves the burn: the post-burn
 * state, carried back to the nominal epoch, changes by [−Δv; 0] per second.
 * All states J2000 equatorial relative to the integration centre; km, s, km/s; TDB s from J2000.
 */
import { CancelledError, changeCentre, propagateAsync } from '../../propagator/index.ts';
import type {
  BodyName, Ephemeris, EventSpec, FiniteBurnRecord, FiniteBurnSpec, PropagationMethod, PropagationRequest, PropagationResult, StateVector, Vec3,
} from '../../propagator/index.ts';
import { exhaustVelocityKmS } from '../maneuver-math.ts';
import type { PlanningProblem } from '../../contract/problem-schema.ts';
import type { ControlDescriptor } from '../../contract/plan-types.ts';
import type { BurnSetting } from './controls.ts';
import { chainFiniteArc, equivalentDeltaVKmS, finiteSpec, type ChainState } from './finite-arc.ts';
import type { TargetComponent } from './target-components.ts';
import { forcesFor } from './propagate-segment.ts';
import type { StartLeg, StartLegMemo } from './start-leg-memo.ts';
import { evaluateComponent } from './target-geometry.ts';
import { type Rotation3, axesToInertial, localAxes } from '../../propagator/index.ts';
import { identity, multiply, rowsOf6, zeros } from '../../propagator/index.ts';

type M = number[][];

export interface EvaluationContext {
  problem: PlanningProblem;
  /** Initial state, J2000 equatorial, relative to the central body. */
  initial: StateVector;
  endTdbS: number;
  components: TargetComponent[];
  ephemeris: Ephemeris;
  /** Number of controls and, per control, which burn and what it is. */
  controlMap: { burnIndex: number; kind: ControlDescriptor['kind'] }[];
}

export interface EvaluationOptions {
  withStm: boolean;
  method: PropagationMethod;
  /** Method of finite-burn thrust arcs; @defaultValue `method` (the cross-check sets it; arcs with the STM
   * run in Cowell form whatever is asked). */
  arcMethod?: PropagationMethod;
  /** Central-body switching; @defaultValue the problem's forceModel.switching (the cross-check flips it). */
  switching?: boolean;
  relativeTolerance: number;
  /** Collect states every this many seconds for the plot. */
  outputStepS?: number;
  signal?: AbortSignal;
  /** Where the coast from the start to the first burn is kept and found again (start-leg-memo.ts); a kept
   * coast is not counted as a propagation. @defaultValue none */
  startLegMemo?: StartLegMemo;
}

export interface BurnRecord {
  epochTdbS: number;
  /** State just before the burn (J2000 equatorial, integration centre). */
  preBurn: StateVector;
  axes: Rotation3;
  /** Impulsive: the Δv. Finite: the ideal (rocket-equation) Δv along the thrust direction at ignition. */
  deltaVInertialKmS: Vec3;
  deltaVLocalKmS: Vec3;
  /** A finite burn as flown (epochTdbS is its ignition, preBurn the state there). */
  finite?: { spec: FiniteBurnSpec; record: FiniteBurnRecord };
}

export interface ApproachRecord {
  body: BodyName;
  epochTdbS: number;
  /** State relative to the body, J2000 equatorial: [r km, v km/s]. */
  stateRelBody: number[];
  distanceKm: number;
}

export interface TrajectoryEvaluation {
  ok: true;
  values: number[];
  /** components × controls, when withStm. */
  jacobian: M | null;
  /** components × 6: d(component)/d(initial state), when withStm. */
  initialStateJacobian: M | null;
  /** Per burn, components × 3: d(component)/d(Δv inertial), when withStm. */
  burnJacobians: M[] | null;
  burns: BurnRecord[];
  approaches: ApproachRecord[];
  samples: StateVector[];
  final: StateVector;
  propagations: number;
  evaluations: number;
  /** Warnings of the propagations (e.g. a method fallback), deduplicated. */
  warnings: string[];
}

export interface EvaluationFailure {
  ok: false;
  reason: string;
  /** The run ended on the surface of a body (for dispersion samples). */
  impact: { body: BodyName | null; epochTdbS: number; stateRelBody: number[] | null } | null;
  burns: BurnRecord[];
}

function vec(s: StateVector): number[] {
  return [...s.positionKm, ...s.velocityKmS];
}

/** The running state handed from stage to stage: where the spacecraft is, its mass, the chained partials
 * (ChainState) and the counts of the propagations so far. */
interface Walk extends ChainState {
  readonly ctx: EvaluationContext;
  readonly opts: EvaluationOptions;
  readonly stm: boolean;
  /** Whether the next leg carries the STM: false past the last station, where no partial is read (the
   * state-only leg takes the same steps to the same states: step control sees the state alone). */
  carryStm: boolean;
  /** Exhaust velocity of the engine, km/s. */
  readonly exhaust: number;
  mass: number;
  state: StateVector;
  readonly burns: BurnRecord[];
  readonly samples: StateVector[];
  propagations: number;
  evaluations: number;
  readonly warnings: Set<string>;
}

/** A station's snapshot: the state there, the partials chained so far, the bodies' relative states. */
interface Station { rel: Map<BodyName, number[]>; epochTdbS: number; G: M; P: M; B: M[]; state: StateVector }

interface StationsReached { ok: true; stations: Map<string, Station>; approaches: ApproachRecord[] }

type TargetReadings = Pick<TrajectoryEvaluation, 'ok' | 'values' | 'jacobian' | 'initialStateJacobian' | 'burnJacobians'>;

function startWalk(ctx: EvaluationContext, opts: EvaluationOptions): Walk {
  const n = ctx.controlMap.length;
  const stm = opts.withStm;
  return {
    ctx, opts, stm, carryStm: stm, exhaust: exhaustVelocityKmS(ctx.problem.spacecraft.engine.ispS), mass: ctx.problem.spacecraft.massKg,
    state: ctx.initial, G: stm ? zeros(6, n) : [], P: stm ? identity(6) : [], B: [],
    // d(mass)/d(controls) and d(mass)/d(Δv) of each burn: a finite burn's acceleration depends on the mass.
    massRow: new Array<number>(n).fill(0), massB: [],
    burns: [], samples: [], propagations: 0, evaluations: 0, warnings: new Set<string>(),
  };
}

function failure(walk: Walk, reason: string, impact: EvaluationFailure['impact'] = null): EvaluationFailure {
  return { ok: false, reason, impact, burns: walk.burns };
}

/** Where and on what a run that ended in an impact hit, relative to that body; null for other outcomes. */
function impactOf(walk: Walk, res: PropagationResult): EvaluationFailure['impact'] {
  if (res.outcome !== 'impact') return null;
  const ev = res.events.find((e) => e.kind === 'impact');
  const body = ev?.body ?? null;
  let rel: number[] | null = null;
  if (ev && body) rel = ev.state.centre === body ? vec(ev.state) : vec(changeCentre(ev.state, body, walk.ctx.ephemeris));
  return { body, epochTdbS: res.final.epochTdbS, stateRelBody: rel };
}

/** The coast to `endTdbS` when the walk has not moved yet and the options carry a memo, else null. */
function startLegOf(walk: Walk, endTdbS: number, events: EventSpec[], extra: Partial<PropagationRequest>): StartLeg | null {
  const { ctx, opts } = walk;
  if (!opts.startLegMemo || walk.state !== ctx.initial || events.length > 0 || Object.keys(extra).length > 0) return null;
  return {
    initial: walk.state, problem: ctx.problem, ephemeris: ctx.ephemeris, endTdbS, massKg: walk.mass, method: opts.method,
    arcMethod: opts.arcMethod, relativeTolerance: opts.relativeTolerance, withStm: walk.carryStm,
    switching: opts.switching ?? ctx.problem.forceModel.switching, outputStepS: opts.outputStepS,
  };
}

/** Propagates from the walk's state to `endTdbS` (TDB s) with the current mass; counts and collects. */
async function propagateLeg(walk: Walk, endTdbS: number, events: EventSpec[],
  extra: Partial<PropagationRequest> = {}): Promise<PropagationResult> {
  const { ctx, opts, ctx: { problem } } = walk;
  if (opts.signal?.aborted) throw new CancelledError();
  const startLeg = startLegOf(walk, endTdbS, events, extra);
  const kept = startLeg ? opts.startLegMemo?.find(startLeg) : undefined;
  const result = kept ?? await propagateAsync({
    ...extra,
    initial: walk.state, endEpochTdbS: endTdbS, forces: forcesFor(problem, walk.mass), ephemeris: ctx.ephemeris,
    method: opts.method, arcMethod: opts.arcMethod, relativeTolerance: opts.relativeTolerance, withStm: walk.carryStm, events,
    switching: (opts.switching ?? problem.forceModel.switching) ? { enabled: true } : undefined,
    outputStepS: opts.outputStepS,
  }, { signal: opts.signal });
  if (!kept) {
    walk.propagations += 1;
    walk.evaluations += result.stats.evaluations;
    if (startLeg) opts.startLegMemo?.keep(startLeg, result);
  }
  result.warnings.forEach((w) => walk.warnings.add(w));
  if (result.outcome === 'cancelled') throw new CancelledError();
  if (opts.outputStepS) walk.samples.push(...result.samples);
  return result;
}

/** Moves the walk to the end of a coast, carrying the partials through its Φ. */
function advance(walk: Walk, result: PropagationResult): void {
  if (walk.carryStm) {
    const phi = rowsOf6(result.stm as number[]);
    walk.G = multiply(phi, walk.G);
    walk.P = multiply(phi, walk.P);
    walk.B = walk.B.map((b) => multiply(phi, b));
  }
  walk.state = result.final;
}

/** Stage 1: coasts to each burn and flies it; null when every burn was flown. */
async function flyBurns(walk: Walk, settings: BurnSetting[]): Promise<EvaluationFailure | null> {
  for (let i = 0; i < settings.length; i++) {
    const s = settings[i];
    if (s.epochTdbS < walk.state.epochTdbS) return failure(walk, `burn ${i + 1} epoch precedes the previous burn (free epochs crossed)`);
    if (s.epochTdbS > walk.state.epochTdbS) {
      const res = await propagateLeg(walk, s.epochTdbS, []);
      if (res.outcome !== 'finished') {
        return failure(walk, `propagation to burn ${i + 1} ended '${res.outcome}': ${res.message ?? ''}`.trim(), impactOf(walk, res));
      }
      advance(walk, res);
    }
    const axes = localAxes(s.frame, walk.state.positionKm, walk.state.velocityKmS);
    if (s.finite) {
      const failed = await flyFiniteBurn(walk, s, i, axes);
      if (failed) return failed;
    } else {
      applyImpulse(walk, s, i, axes);
    }
  }
  return null;
}

/** Flies finite burn `i` from its ignition (the walk's state); its arc's sensitivities join the chain. */
async function flyFiniteBurn(walk: Walk, s: BurnSetting, i: number, axes: Rotation3): Promise<EvaluationFailure | null> {
  const spec = finiteSpec(s);
  const res = await propagateLeg(walk, spec.startTdbS + spec.durationS, [], { finiteBurns: [spec], initialMassKg: walk.mass });
  if (res.outcome !== 'finished') return failure(walk, `finite burn ${i + 1} ended '${res.outcome}': ${res.message ?? ''}`.trim(), impactOf(walk, res));
  const record = res.finiteBurns![0];
  const eq = equivalentDeltaVKmS(record, s);
  walk.burns.push({ epochTdbS: spec.startTdbS, preBurn: walk.state, axes, deltaVInertialKmS: eq.inertial, deltaVLocalKmS: eq.local, finite: { spec, record } });
  if (walk.stm) chainFiniteArc(walk, res, s, axes, walk.ctx.controlMap, i);
  walk.state = res.final;
  walk.mass = res.finalMassKg!;
  return null;
}

/** Applies impulsive burn `i` at the walk's state: velocity, mass and (with the STM) the partials. */
function applyImpulse(walk: Walk, s: BurnSetting, i: number, axes: Rotation3): void {
  const dv = axesToInertial(axes, s.deltaVLocalKmS);
  const state = walk.state;
  walk.burns.push({ epochTdbS: s.epochTdbS, preBurn: state, axes, deltaVInertialKmS: dv, deltaVLocalKmS: [...s.deltaVLocalKmS] as Vec3 });
  walk.state = { ...state, velocityKmS: [state.velocityKmS[0] + dv[0], state.velocityKmS[1] + dv[1], state.velocityKmS[2] + dv[2]] };
  const massFactor = Math.exp(-Math.hypot(...dv) / walk.exhaust);
  walk.mass *= massFactor;
  // m_after = m·exp(−|Δv|/v_e): dm_after = exp(·)·dm − (m_after/v_e)·Δv̂·dΔv.
  const dvHat = dv.map((x) => x / Math.max(Math.hypot(...dv), 1e-300));
  walk.massRow = walk.massRow.map((v) => v * massFactor);
  walk.massB = walk.massB.map((row) => row.map((v) => v * massFactor));
  walk.massB.push(dvHat.map((x) => (-walk.mass / walk.exhaust) * x));
  if (walk.stm) chainImpulse(walk, dv, dvHat, i, axes);
}

/** The impulse's columns: a free epoch moves the post-burn state by [−Δv; 0] per second, a Δv component
 * adds its axis to the velocity rows; B gains [0; I] for this burn. */
function chainImpulse(walk: Walk, dv: Vec3, dvHat: number[], i: number, axes: Rotation3): void {
  const { G, massRow } = walk;
  walk.ctx.controlMap.forEach((c, j) => {
    if (c.burnIndex !== i) return;
    if (c.kind === 'epoch') {
      for (let k = 0; k < 3; k++) G[k][j] -= dv[k];
    } else if (c.kind === 'dv0' || c.kind === 'dv1' || c.kind === 'dv2') {
      const axis = axes[Number(c.kind[2])];
      for (let k = 0; k < 3; k++) G[3 + k][j] += axis[k];
      massRow[j] += (-walk.mass / walk.exhaust) * (dvHat[0] * axis[0] + dvHat[1] * axis[1] + dvHat[2] * axis[2]);
    }
  });
  const b = zeros(6, 3);
  for (let k = 0; k < 3; k++) b[3 + k][k] = 1;
  walk.B.push(b);
}

/** Stage 2: after the last burn, the fixed target epochs in order, closest approaches found on the way. */
async function reachStations(walk: Walk): Promise<StationsReached | EvaluationFailure> {
  const { ctx } = walk;
  const fixed = [...new Set(ctx.components.flatMap((c) => (c.station.kind === 'epoch' ? [c.station.epochTdbS] : [])))].sort((a, b) => a - b);
  const pending = new Set(ctx.components.flatMap((c) => (c.station.kind === 'approach' ? [c.station.body] : [])));
  const stations = new Map<string, Station>();
  const approaches: ApproachRecord[] = [];
  const snapshot = (key: string, rel: Map<BodyName, number[]>): void => {
    stations.set(key, { rel, epochTdbS: walk.state.epochTdbS, G: walk.G, P: walk.P, B: walk.B, state: walk.state });
  };
  for (const stopAt of [...fixed, ctx.endTdbS]) {
    while (walk.state.epochTdbS < stopAt) {
      walk.carryStm = walk.stm && (pending.size > 0 || stopAt !== ctx.endTdbS || fixed.includes(stopAt));
      const events: EventSpec[] = [...pending].map((body) => ({ kind: 'closest-approach', body, stop: true }));
      const res = await propagateLeg(walk, stopAt, events);
      if (res.outcome === 'stopped-by-event') {
        const approach = approachAt(walk, res, pending);
        if (approach === null) return failure(walk, `propagation stopped at ${res.final.epochTdbS} without a closest-approach record`);
        approaches.push(approach);
        snapshot(`approach:${approach.body}`, new Map([[approach.body, approach.stateRelBody]]));
        pending.delete(approach.body);
        continue;
      }
      if (res.outcome !== 'finished') {
        return failure(walk, `propagation ended '${res.outcome}' at TDB ${res.final.epochTdbS.toFixed(3)} s: ${res.message ?? ''}`.trim(), impactOf(walk, res));
      }
      advance(walk, res);
    }
    if (stopAt !== ctx.endTdbS || fixed.includes(stopAt)) snapshot(`epoch:${stopAt}`, new Map());
  }
  if (pending.size > 0) return failure(walk, `no closest approach to ${[...pending].join(', ')} found between the last burn and the end of the span`);
  return { ok: true, stations, approaches };
}

/** The closest approach to a pending body that stopped `res`: advances the walk to it and returns its
 * record (state relative to the body); null when the run stopped without one. */
function approachAt(walk: Walk, res: PropagationResult, pending: Set<BodyName>): ApproachRecord | null {
  const ev = res.events.find((e) => e.kind === 'closest-approach' && e.body !== undefined && pending.has(e.body)
    && Math.abs(e.epochTdbS - res.final.epochTdbS) < 1e-3);
  if (!ev || !ev.body) return null;
  advance(walk, res);
  const relState = ev.state.centre === ev.body ? vec(ev.state) : vec(changeCentre(ev.state, ev.body, walk.ctx.ephemeris));
  return { body: ev.body, epochTdbS: ev.epochTdbS, stateRelBody: relState, distanceKm: Math.hypot(relState[0], relState[1], relState[2]) };
}

/** Stage 3: every target component's value at its station and, with the STM, its rows of the Jacobians. */
function readTargets(walk: Walk, stations: Map<string, Station>, settings: BurnSetting[]): TargetReadings | EvaluationFailure {
  const { ctx, stm } = walk;
  const values: number[] = [];
  const jacobian: M | null = stm ? [] : null;
  const initialStateJacobian: M | null = stm ? [] : null;
  const burnJacobians: M[] | null = stm ? settings.map(() => []) : null;
  for (const c of ctx.components) {
    const key = c.station.kind === 'epoch' ? `epoch:${c.station.epochTdbS}` : `approach:${c.station.body}`;
    const st = stations.get(key);
    if (!st) return failure(walk, `internal: no station ${key}`);
    let rel: number[];
    if (c.station.kind === 'approach') rel = st.rel.get(c.station.body) as number[];
    else {
      const centre = c.quantity.q === 'state' ? c.quantity.centre : st.state.centre;
      rel = centre === st.state.centre ? vec(st.state) : vec(changeCentre(st.state, centre, ctx.ephemeris));
    }
    let ev;
    try {
      ev = evaluateComponent(c, rel, st.epochTdbS, { partial: stm });
    } catch (error) {
      return failure(walk, `target ${c.targetIndex} (${c.component}): ${(error as Error).message}`);
    }
    values.push(ev.value);
    if (stm && jacobian && initialStateJacobian && burnJacobians) {
      const row = [ev.partial ?? [0, 0, 0, 0, 0, 0]];
      jacobian.push(multiply(row, st.G)[0]);
      initialStateJacobian.push(multiply(row, st.P)[0]);
      st.B.forEach((b, i) => burnJacobians[i].push(multiply(row, b)[0]));
    }
  }
  return { ok: true, values, jacobian, initialStateJacobian, burnJacobians };
}

/** Evaluates the trajectory for the given burn settings (see the file comment): burns, then stations, then
 * the target components read there. */
export async function evaluateTrajectory(
  ctx: EvaluationContext, settings: BurnSetting[], opts: EvaluationOptions,
): Promise<TrajectoryEvaluation | EvaluationFailure> {
  const walk = startWalk(ctx, opts);
  const burnFailure = await flyBurns(walk, settings);
  if (burnFailure) return burnFailure;
  const reached = await reachStations(walk);
  if (!reached.ok) return reached;
  const read = readTargets(walk, reached.stations, settings);
  if (!read.ok) return read;
  return {
    ...read, burns: walk.burns, approaches: reached.approaches, samples: walk.samples, final: walk.state,
    propagations: walk.propagations, evaluations: walk.evaluations, warnings: [...walk.warnings],
  };
}
