/**
 * A propagation with finite burns, run as a chain of pieces of the generic loop (propagate.ts): coasts
 * (the requested method, impulsive burns, events and switching as asked) and thrust arcs about the
 * requested central body, without switching (Cowell with thrust and its parameter partials,
 * thrust-arc-dynamics.ts, when the STM is asked or the arc method — `arcMethod`, else `method` — is
 * Cowell; Encke with the thrust as a perturbation otherwise), so the integrator lands exactly on every ignition and cut-off. Mass falls only inside arcs. With the STM the pieces chain by
 * multiplication, and each finite burn's parameter sensitivities are carried to the end:
 *   ∂x(t_f)/∂u  = Φ(t_f, t_e) ψ_u(t_e)
 *   ∂x(t_f)/∂t_e = Φ(t_f, t_e) [0; a_T(t_e)]                      (cut-off later: thrust for longer)
 *   ∂x(t_f)/∂t_s|t_e = Φ(t_f, t_e) (−Φ_arc [0; a_T(t_s)] + ṁ ψ_m(t_e))  (switching-time partial; a later
 *                      ignition also leaves more mass at every instant of the arc)
 * with duration partial = ∂/∂t_e and ignition partial (duration held) = ∂/∂t_s|t_e + ∂/∂t_e; a burn's
 * duration lowers the mass at every later ignition by ṁ per s, which enters through the later arcs' ψ_m.
 * Events are searched in coasts only (a warning says so when events were asked).
 * Units km, s, km/s, kg; J2000 equatorial; TDB s from J2000.
 */
import { InvalidInputError } from '../../contract/errors.ts';
import { changeCentre, stateToFrame } from '../frames/index.ts';
import { multiply6Columns } from '../math/matrix6.ts';
import type {
  FiniteBurnRecord, FiniteBurnSensitivity, PropagationOptions, PropagationRequest, PropagationResult,
} from '../run/propagation-types.ts';
import type { StateVector, Vec3 } from '../types.ts';
import { checkFiniteBurns, type OrderedFiniteBurn } from './finite-burn-checks.ts';
import { arcMassKg, thrustAccelerationInto, type ThrustArc } from './thrust-arc-dynamics.ts';
import { ThrustDirection } from './thrust-direction.ts';

/** The generic single-piece loop, injected by propagate.ts (avoids an import cycle). */
export type ArcSteps = (request: PropagationRequest, options: PropagationOptions, extraWatchers: never[],
  arc?: ThrustArc) => Generator<number, PropagationResult, void>;

interface Piece { startTdbS: number; endTdbS: number; burn: OrderedFiniteBurn | null }

function pieces(burns: OrderedFiniteBurn[], start: number, end: number): Piece[] {
  const out: Piece[] = [];
  let t = start;
  for (const b of burns) {
    if (b.startTdbS > t) out.push({ startTdbS: t, endTdbS: b.startTdbS, burn: null });
    out.push({ startTdbS: b.startTdbS, endTdbS: b.endTdbS, burn: b });
    t = b.endTdbS;
  }
  if (end > t || out.length === 0) out.push({ startTdbS: t, endTdbS: end, burn: null });
  return out;
}

/** Sensitivities of the current state to one finite burn, and of the current mass to its duration. */
interface Carried { direction: number[]; start: number[]; duration: number[]; massPerDurationKgS: number }

const vec = (s: StateVector): number[] => [...s.positionKm, ...s.velocityKmS];
const addInto = (a: number[], b: number[], f = 1): number[] => a.map((v, i) => v + f * b[i]);

/** Everything collected over the pieces. */
class Chain {
  stm: number[] | null = null;
  impulsive: (number[] | undefined)[];
  finite: (Carried | undefined)[];
  records: (FiniteBurnRecord | null)[];
  /** ∂(current state)/∂(initial mass): every arc's ignition mass moves one for one with it. */
  initialMass = new Array<number>(6).fill(0);
  constructor(impulsiveCount: number, finiteCount: number) {
    this.impulsive = new Array<number[] | undefined>(impulsiveCount).fill(undefined);
    this.finite = new Array<Carried | undefined>(finiteCount).fill(undefined);
    this.records = new Array<FiniteBurnRecord | null>(finiteCount).fill(null);
  }

  /** Passes every carried sensitivity through a piece's Φ (and, for an arc, its mass sensitivity). */
  through(phi: number[], massSensitivity: number[] | null): void {
    this.stm = this.stm === null ? phi : multiply6Columns(phi, this.stm, 6);
    this.impulsive = this.impulsive.map((s) => (s === undefined ? s : multiply6Columns(phi, s, 3)));
    this.initialMass = multiply6Columns(phi, this.initialMass, 1);
    if (massSensitivity !== null) this.initialMass = addInto(this.initialMass, massSensitivity);
    this.finite = this.finite.map((c) => {
      if (c === undefined) return c;
      let duration = multiply6Columns(phi, c.duration, 1);
      if (massSensitivity !== null) duration = addInto(duration, massSensitivity, c.massPerDurationKgS);
      return { ...c, direction: multiply6Columns(phi, c.direction, 3), start: multiply6Columns(phi, c.start, 1), duration };
    });
  }
}

/** Record of a flown arc. */
function arcRecord(b: OrderedFiniteBurn, arc: ThrustArc, atStart: StateVector, atEnd: StateVector): FiniteBurnRecord {
  const massAfterKg = arcMassKg(arc, b.endTdbS);
  const idealDeltaVKmS = b.massFlowKgS > 0
    ? (b.thrustN / b.massFlowKgS / 1000) * Math.log(arc.massAtStartKg / massAfterKg)
    : (b.thrustN / arc.massAtStartKg / 1000) * b.durationS;
  const dir = new ThrustDirection(b.axes, b.direction);
  dir.update(vec(atStart), false);
  const startDir = Array.from(dir.inertial) as Vec3;
  dir.update(vec(atEnd), false);
  return {
    startTdbS: b.startTdbS, endTdbS: b.endTdbS, massBeforeKg: arc.massAtStartKg, massAfterKg, idealDeltaVKmS,
    directionAtStartInertial: startDir, directionAtEndInertial: Array.from(dir.inertial) as Vec3, stateAtStart: atStart, stateAtEnd: atEnd,
  };
}

/** The chained run as a generator yielding the fraction of the whole span done; see the file comment. */
export function* finiteBurnSteps(request: PropagationRequest, options: PropagationOptions, steps: ArcSteps): Generator<number, PropagationResult, void> {
  const { burns, initialMassKg } = checkFiniteBurns(request);
  const start = request.initial.epochTdbS;
  const end = request.endEpochTdbS;
  const central = request.forces.centralBody;
  const withStm = request.withStm === true;
  const impulses = (request.burns ?? []).map((b, index) => ({ ...b, index }));
  const assigned = new Set<number>();
  const chain = new Chain(impulses.length, burns.length);
  const results: PropagationResult[] = [];
  const warnings: string[] = [];
  let state: StateVector = request.initial;
  let mass = initialMassKg;
  const forcesWithMass = (m: number): PropagationRequest['forces'] => (request.forces.solarPressure === undefined ? request.forces
    : { ...request.forces, solarPressure: { ...request.forces.solarPressure, massKg: m } });

  const plan = pieces(burns, start, end);
  impulses.forEach((i) => {
    if (!plan.some((p) => p.burn === null && i.epochTdbS >= p.startTdbS && i.epochTdbS <= p.endTdbS)) {
      throw new InvalidInputError(`burns[${i.index}].epochTdbS`, `impulsive burn at ${i.epochTdbS} TDB s coincides with a finite burn's ignition at the start of the run; fold it into the initial state`);
    }
  });
  for (const piece of plan) {
    const base: PropagationRequest = {
      ...request, initial: state, endEpochTdbS: piece.endTdbS, finiteBurns: undefined, initialMassKg: undefined,
      forces: forcesWithMass(mass), maxSteps: request.maxSteps,
    };
    const b = piece.burn;
    let arc: ThrustArc | undefined;
    let sub: PropagationRequest;
    let pieceImpulses: typeof impulses = [];
    if (b === null) {
      pieceImpulses = impulses.filter((i) => !assigned.has(i.index) && i.epochTdbS >= piece.startTdbS && i.epochTdbS <= piece.endTdbS);
      pieceImpulses.forEach((i) => assigned.add(i.index));
      sub = { ...base, burns: pieceImpulses.map(({ epochTdbS, deltaVKmS }) => ({ epochTdbS, deltaVKmS })) };
    } else {
      state = changeCentre(stateToFrame(state, 'J2000_EQUATORIAL'), central, request.ephemeris);
      arc = { startTdbS: b.startTdbS, thrustN: b.thrustN, massFlowKgS: b.massFlowKgS, massAtStartKg: mass, axes: b.axes, direction: b.direction };
      sub = { ...base, initial: state, burns: [], events: [], switching: undefined, method: request.arcMethod ?? request.method };
    }
    const run = steps(sub, options, [], arc);
    const done = piece.startTdbS - start;
    let next = run.next();
    while (next.done !== true) {
      yield end === start ? 1 : Math.min(1, (done + next.value * (piece.endTdbS - piece.startTdbS)) / (end - start));
      next = run.next();
    }
    const result = next.value;
    results.push(result);
    warnings.push(...result.warnings);
    if (b !== null && arc !== undefined) {
      const stopped = result.outcome !== 'finished';
      mass = arcMassKg(arc, result.final.epochTdbS);
      if (stopped) break;
      chain.records[b.requestIndex] = arcRecord(b, arc, state, result.final);
      if (withStm) carryArc(chain, b, arc, state, result);
    } else if (withStm && result.stm !== undefined) {
      chain.through(result.stm, null);
      pieceImpulses.forEach((i, k) => { chain.impulsive[i.index] = result.burnSensitivities?.[k]; });
    }
    state = result.final;
    if (result.outcome !== 'finished') break;
  }
  if ((request.events?.length ?? 0) > 0) warnings.push('events are searched in coasts only, not inside finite-burn arcs');
  return combine(results, chain, warnings, mass, withStm);
}

/** Adds a finished arc to the chain: earlier sensitivities through its Φ, then this burn's own. */
function carryArc(chain: Chain, b: OrderedFiniteBurn, arc: ThrustArc, atStart: StateVector, result: PropagationResult): void {
  const phi = result.stm as number[];
  const psiMass = arc.end?.massSensitivity ?? new Array<number>(6).fill(0);
  chain.through(phi, psiMass);
  const aStart = new Float64Array(3);
  const aEnd = new Float64Array(3);
  thrustAccelerationInto(arc, b.startTdbS, vec(atStart), aStart);
  thrustAccelerationInto(arc, b.endTdbS, vec(result.final), aEnd);
  const atCutOff = [0, 0, 0, aEnd[0], aEnd[1], aEnd[2]];
  const startHeldEnd = addInto(multiply6Columns(phi, [0, 0, 0, -aStart[0], -aStart[1], -aStart[2]], 1), psiMass, b.massFlowKgS);
  chain.finite[b.requestIndex] = {
    direction: arc.end?.directionSensitivity ?? new Array<number>(18).fill(0),
    start: addInto(startHeldEnd, atCutOff),
    duration: atCutOff,
    massPerDurationKgS: -b.massFlowKgS,
  };
}

/** The run's result from its pieces' results. */
function combine(results: PropagationResult[], chain: Chain, warnings: string[], finalMassKg: number, withStm: boolean): PropagationResult {
  const last = results[results.length - 1];
  const methods = new Set(results.map((r) => r.methodUsed));
  const samples: StateVector[] = [];
  for (const r of results) {
    for (const s of r.samples) if (samples.length === 0 || s.epochTdbS > samples[samples.length - 1].epochTdbS) samples.push(s);
  }
  const stats = { steps: 0, acceptedSteps: 0, rejectedSteps: 0, evaluations: 0, rectifications: 0, switches: [] as PropagationResult['stats']['switches'] };
  for (const r of results) {
    stats.steps += r.stats.steps;
    stats.acceptedSteps += r.stats.acceptedSteps;
    stats.rejectedSteps += r.stats.rejectedSteps;
    stats.evaluations += r.stats.evaluations;
    stats.rectifications += r.stats.rectifications;
    stats.switches.push(...r.stats.switches);
  }
  const result: PropagationResult = {
    outcome: last.outcome, methodUsed: methods.size === 1 ? last.methodUsed : 'mixed', message: last.message,
    final: last.final, samples, events: results.flatMap((r) => r.events), warnings: [...new Set(warnings)], stats,
    finiteBurns: chain.records as FiniteBurnRecord[], finalMassKg,
  };
  if (withStm && chain.stm !== null) {
    result.stm = chain.stm;
    result.initialMassSensitivity = chain.initialMass;
    result.burnSensitivities = chain.impulsive.map((s) => s ?? new Array<number>(18).fill(0));
    const zero = (): FiniteBurnSensitivity => ({ direction: new Array<number>(18).fill(0), startTdbS: new Array<number>(6).fill(0), durationS: new Array<number>(6).fill(0) });
    result.finiteBurnSensitivities = chain.finite.map((c) => (c === undefined ? zero() : { direction: c.direction, startTdbS: c.start, durationS: c.duration }));
    if (chain.finite.some((c) => c === undefined)) result.warnings.push('some finite burn(s) not flown to cut-off; their sensitivities are zero');
  }
  return result;
}
