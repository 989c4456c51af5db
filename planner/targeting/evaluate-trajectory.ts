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
import { evaluateComponent } from './target-geometry.ts';
import { type Rotation3, axesToInertial, localAxes } from '../../propagator/index.ts';

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
  /** Central-body switching; @defaultValue the problem's forceModel.switching (the cross-check flips it). */
  switching?: boolean;
  relativeTolerance: number;
  /** Collect states every this many seconds for the plot. */
  outputStepS?: number;
  signal?: AbortSignal;
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

const zeros = (r: number, c: number): M => Array.from({ length: r }, () => new Array<number>(c).fill(0));
const identity6 = (): M => Array.from({ length: 6 }, (_, i) => Array.from({ length: 6 }, (__, j) => (i === j ? 1 : 0)));

/** Φ (row-major 36) times a 6 x k matrix. */
function phiTimes(phi: readonly number[], a: M): M {
  const k = a[0]?.length ?? 0;
  const out = zeros(6, k);
  for (let i = 0; i < 6; i++) {
    for (let p = 0; p < 6; p++) {
      const f = phi[i * 6 + p];
      if (f === 0) continue;
      for (let j = 0; j < k; j++) out[i][j] += f * a[p][j];
    }
  }
  return out;
}

function rowTimes(row: readonly number[], a: M): number[] {
  const k = a[0]?.length ?? 0;
  const out = new Array<number>(k).fill(0);
  for (let p = 0; p < 6; p++) for (let j = 0; j < k; j++) out[j] += row[p] * a[p][j];
  return out;
}

function vec(s: StateVector): number[] {
  return [...s.positionKm, ...s.velocityKmS];
}

/** Evaluates the trajectory for the given burn settings; see the file comment. */
export async function evaluateTrajectory(
  ctx: EvaluationContext, settings: BurnSetting[], opts: EvaluationOptions,
): Promise<TrajectoryEvaluation | EvaluationFailure> {
  const { problem } = ctx;
  const n = ctx.controlMap.length;
  const stm = opts.withStm;
  const exhaust = exhaustVelocityKmS(problem.spacecraft.engine.ispS);
  let mass = problem.spacecraft.massKg;
  let state: StateVector = ctx.initial;
  let G = stm ? zeros(6, n) : [];
  let P = stm ? identity6() : [];
  let B: M[] = [];
  // d(mass)/d(controls) and d(mass)/d(Δv) of each burn: a finite burn's acceleration depends on the mass.
  let massRow = new Array<number>(n).fill(0);
  let massB: number[][] = [];
  const burns: BurnRecord[] = [];
  const samples: StateVector[] = [];
  let propagations = 0;
  let evaluations = 0;
  const warnings = new Set<string>();

  const fail = (reason: string, impact: EvaluationFailure['impact'] = null): EvaluationFailure => ({ ok: false, reason, impact, burns });
  const impactOf = (res: PropagationResult): EvaluationFailure['impact'] => {
    if (res.outcome !== 'impact') return null;
    const ev = res.events.find((e) => e.kind === 'impact');
    const body = ev?.body ?? null;
    let rel: number[] | null = null;
    if (ev && body) rel = ev.state.centre === body ? vec(ev.state) : vec(changeCentre(ev.state, body, ctx.ephemeris));
    return { body, epochTdbS: res.final.epochTdbS, stateRelBody: rel };
  };
  const run = async (endTdbS: number, events: EventSpec[], extra: Partial<PropagationRequest> = {}): Promise<PropagationResult> => {
    if (opts.signal?.aborted) throw new CancelledError();
    const result = await propagateAsync({
      ...extra,
      initial: state, endEpochTdbS: endTdbS, forces: forcesFor(problem, mass), ephemeris: ctx.ephemeris,
      method: opts.method, relativeTolerance: opts.relativeTolerance, withStm: stm, events,
      switching: (opts.switching ?? problem.forceModel.switching) ? { enabled: true } : undefined,
      outputStepS: opts.outputStepS,
    }, { signal: opts.signal });
    propagations += 1;
    evaluations += result.stats.evaluations;
    result.warnings.forEach((w) => warnings.add(w));
    if (result.outcome === 'cancelled') throw new CancelledError();
    if (opts.outputStepS) samples.push(...result.samples);
    return result;
  };
  const advance = (result: PropagationResult): void => {
    if (stm) {
      const phi = result.stm as number[];
      G = phiTimes(phi, G);
      P = phiTimes(phi, P);
      B = B.map((b) => phiTimes(phi, b));
    }
    state = result.final;
  };

  for (let i = 0; i < settings.length; i++) {
    const s = settings[i];
    if (s.epochTdbS < state.epochTdbS) return fail(`burn ${i + 1} epoch precedes the previous burn (free epochs crossed)`);
    if (s.epochTdbS > state.epochTdbS) {
      const res = await run(s.epochTdbS, []);
      if (res.outcome !== 'finished') {
        return fail(`propagation to burn ${i + 1} ended '${res.outcome}': ${res.message ?? ''}`.trim(), impactOf(res));
      }
      advance(res);
    }
    const axes = localAxes(s.frame, state.positionKm, state.velocityKmS);
    if (s.finite) {
      const spec = finiteSpec(s);
      const res = await run(spec.startTdbS + spec.durationS, [], { finiteBurns: [spec], initialMassKg: mass });
      if (res.outcome !== 'finished') return fail(`finite burn ${i + 1} ended '${res.outcome}': ${res.message ?? ''}`.trim(), impactOf(res));
      const record = res.finiteBurns![0];
      const eq = equivalentDeltaVKmS(record, s);
      burns.push({ epochTdbS: spec.startTdbS, preBurn: state, axes, deltaVInertialKmS: eq.inertial, deltaVLocalKmS: eq.local, finite: { spec, record } });
      if (stm) {
        const chain: ChainState = { G, P, B, massRow, massB };
        chainFiniteArc(chain, res, s, axes, ctx.controlMap, i);
        ({ G, P, B, massRow, massB } = chain);
      }
      state = res.final;
      mass = res.finalMassKg!;
      continue;
    }
    const dv = axesToInertial(axes, s.deltaVLocalKmS);
    burns.push({ epochTdbS: s.epochTdbS, preBurn: state, axes, deltaVInertialKmS: dv, deltaVLocalKmS: [...s.deltaVLocalKmS] as Vec3 });
    state = { ...state, velocityKmS: [state.velocityKmS[0] + dv[0], state.velocityKmS[1] + dv[1], state.velocityKmS[2] + dv[2]] };
    const massFactor = Math.exp(-Math.hypot(...dv) / exhaust);
    mass *= massFactor;
    // m_after = m·exp(−|Δv|/v_e): dm_after = exp(·)·dm − (m_after/v_e)·Δv̂·dΔv.
    const dvHat = dv.map((x) => x / Math.max(Math.hypot(...dv), 1e-300));
    massRow = massRow.map((v) => v * massFactor);
    massB = massB.map((row) => row.map((v) => v * massFactor));
    massB.push(dvHat.map((x) => (-mass / exhaust) * x));
    if (stm) {
      ctx.controlMap.forEach((c, j) => {
        if (c.burnIndex !== i) return;
        if (c.kind === 'epoch') {
          for (let k = 0; k < 3; k++) G[k][j] -= dv[k];
        } else if (c.kind === 'dv0' || c.kind === 'dv1' || c.kind === 'dv2') {
          const axis = axes[Number(c.kind[2])];
          for (let k = 0; k < 3; k++) G[3 + k][j] += axis[k];
          massRow[j] += (-mass / exhaust) * (dvHat[0] * axis[0] + dvHat[1] * axis[1] + dvHat[2] * axis[2]);
        }
      });
      const b = zeros(6, 3);
      for (let k = 0; k < 3; k++) b[3 + k][k] = 1;
      B.push(b);
    }
  }

  // After the last burn: fixed target epochs in order, closest approaches found on the way.
  const fixed = [...new Set(ctx.components.flatMap((c) => (c.station.kind === 'epoch' ? [c.station.epochTdbS] : [])))].sort((a, b) => a - b);
  const pending = new Set(ctx.components.flatMap((c) => (c.station.kind === 'approach' ? [c.station.body] : [])));
  const atStation = new Map<string, { rel: Map<BodyName, number[]>; epochTdbS: number; G: M; P: M; B: M[]; state: StateVector }>();
  const approaches: ApproachRecord[] = [];
  const snapshot = (key: string, rel: Map<BodyName, number[]>): void => {
    atStation.set(key, { rel, epochTdbS: state.epochTdbS, G, P, B, state });
  };
  const stops = [...fixed, ctx.endTdbS];
  for (const stopAt of stops) {
    while (state.epochTdbS < stopAt) {
      const events: EventSpec[] = [...pending].map((body) => ({ kind: 'closest-approach', body, stop: true }));
      const res = await run(stopAt, events);
      if (res.outcome === 'stopped-by-event') {
        const ev = res.events.find((e) => e.kind === 'closest-approach' && e.body !== undefined && pending.has(e.body)
          && Math.abs(e.epochTdbS - res.final.epochTdbS) < 1e-3);
        if (!ev || !ev.body) return fail(`propagation stopped at ${res.final.epochTdbS} without a closest-approach record`);
        advance(res);
        const relState = ev.state.centre === ev.body ? vec(ev.state) : vec(changeCentre(ev.state, ev.body, ctx.ephemeris));
        approaches.push({ body: ev.body, epochTdbS: ev.epochTdbS, stateRelBody: relState, distanceKm: Math.hypot(relState[0], relState[1], relState[2]) });
        snapshot(`approach:${ev.body}`, new Map([[ev.body, relState]]));
        pending.delete(ev.body);
        continue;
      }
      if (res.outcome !== 'finished') {
        return fail(`propagation ended '${res.outcome}' at TDB ${res.final.epochTdbS.toFixed(3)} s: ${res.message ?? ''}`.trim(), impactOf(res));
      }
      advance(res);
    }
    if (stopAt !== ctx.endTdbS || fixed.includes(stopAt)) snapshot(`epoch:${stopAt}`, new Map());
  }
  if (pending.size > 0) return fail(`no closest approach to ${[...pending].join(', ')} found between the last burn and the end of the span`);

  const values: number[] = [];
  const jacobian: M | null = stm ? [] : null;
  const initialStateJacobian: M | null = stm ? [] : null;
  const burnJacobians: M[] | null = stm ? settings.map(() => []) : null;
  for (const c of ctx.components) {
    const key = c.station.kind === 'epoch' ? `epoch:${c.station.epochTdbS}` : `approach:${c.station.body}`;
    const st = atStation.get(key);
    if (!st) return fail(`internal: no station ${key}`);
    let rel: number[];
    if (c.station.kind === 'approach') rel = st.rel.get(c.station.body) as number[];
    else {
      const centre = c.quantity.q === 'state' ? c.quantity.centre : st.state.centre;
      rel = centre === st.state.centre ? vec(st.state) : vec(changeCentre(st.state, centre, ctx.ephemeris));
    }
    let ev;
    try {
      ev = evaluateComponent(c, rel, st.epochTdbS);
    } catch (error) {
      return fail(`target ${c.targetIndex} (${c.component}): ${(error as Error).message}`);
    }
    values.push(ev.value);
    if (stm && jacobian && initialStateJacobian && burnJacobians) {
      const row = ev.partial ?? [0, 0, 0, 0, 0, 0];
      jacobian.push(rowTimes(row, st.G));
      initialStateJacobian.push(rowTimes(row, st.P));
      st.B.forEach((b, i) => burnJacobians[i].push(rowTimes(row, b)));
    }
  }
  return {
    ok: true, values, jacobian, initialStateJacobian, burnJacobians, burns, approaches, samples, final: state,
    propagations, evaluations, warnings: [...warnings],
  };
}
