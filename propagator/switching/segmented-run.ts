/**
 * A propagation with events and/or central-body switching, run as a chain of single-centre segments of
 * the generic propagation loop (propagate.ts). Each segment carries an EventWatcher; a sphere-of-influence
 * crossing ends the segment at the located epoch, the state is translated to the new centre through the
 * ephemeris at that fixed epoch (identity Jacobian, so Φ chains by multiplication), and the next segment
 * integrates about the new centre with the same set of attracting bodies (old centre becomes a perturber).
 * J2 applies only while the originally requested central body is the centre.
 */
import { InvalidInputError } from '../../contract/errors.ts';
import { PROPAGATION_DEFAULTS } from '../run/propagation-defaults.ts';
import { buildEvents, EventWatcher, type CartesianSource, type DenseStepper, type EventStop } from '../events/index.ts';
import { changeCentre, stateToFrame } from '../frames/index.ts';
import { multiply6Columns } from '../math/matrix6.ts';
import type {
  EventRecord, PropagationOptions, PropagationRequest, PropagationResult, VelocityImpulse,
} from '../run/propagation-types.ts';
import type { BodyName, StateVector } from '../types.ts';
import { PRIMARY_OF, soiRadiusKm } from './sphere-of-influence.ts';

/** Structural copy of propagate.ts's StepWatcher (kept here to avoid an import cycle). */
interface SegmentWatcher {
  afterStep(stepper: DenseStepper, events: EventRecord[], dynamics?: CartesianSource): EventStop | null;
}
/** The generic single-segment loop, injected by propagate.ts. */
export type SegmentSteps = (request: PropagationRequest, options: PropagationOptions,
  extraWatchers: SegmentWatcher[]) => Generator<number, PropagationResult, void>;

/** True when a request needs this chained runner (events or switching). */
export function needsSegmentedRun(request: PropagationRequest): boolean {
  return (request.events?.length ?? 0) > 0 || request.switching?.enabled === true;
}

interface Candidates {
  entries: { body: BodyName; radiusKm: number }[];
  exit?: { to: BodyName; radiusKm: number };
}

function switchCandidates(centre: BodyName, bodies: BodyName[], request: PropagationRequest): Candidates {
  if (request.switching?.enabled !== true) return { entries: [] };
  const overrides = request.switching.radiusKm;
  const entries = bodies.filter((b) => b !== centre && PRIMARY_OF[b] === centre)
    .map((body) => ({ body, radiusKm: soiRadiusKm(body, overrides) }));
  const primary = PRIMARY_OF[centre];
  const exit = primary !== undefined && bodies.includes(primary) ? { to: primary, radiusKm: soiRadiusKm(centre, overrides) } : undefined;
  return { entries, exit };
}

/** Where the state starts inside a candidate's sphere (switch at once), else null. */
function insideAtStart(state: StateVector, c: Candidates, request: PropagationRequest): BodyName | null {
  const r = Math.hypot(...state.positionKm);
  if (c.exit && r > c.exit.radiusKm) return c.exit.to;
  for (const e of c.entries) {
    const b = changeCentre(state, e.body, request.ephemeris);
    if (Math.hypot(...b.positionKm) < e.radiusKm) return e.body;
  }
  return null;
}

type IndexedBurn = VelocityImpulse & { index: number };

/** What the whole run keeps constant: its span, direction and the attracting bodies. */
interface RunFrame {
  request: PropagationRequest;
  start: number;
  end: number;
  direction: 1 | -1;
  bodies: BodyName[];
  j2Body: BodyName | null;
  referenceBody: BodyName;
  burns: IndexedBurn[];
  maxSteps: number;
}

/** What the segments add up to: records, counts, the chained Φ and burn sensitivities. */
interface SegmentTotals {
  events: EventRecord[];
  warnings: string[];
  switches: PropagationResult['stats']['switches'];
  counts: { steps: number; acceptedSteps: number; rejectedSteps: number; evaluations: number };
  rectifications: number;
  stm: number[] | undefined;
  sens: (number[] | undefined)[];
  methodsUsed: Set<PropagationResult['methodUsed']>;
  samples: StateVector[];
  last: PropagationResult | null;
}

function runFrame(request: PropagationRequest): RunFrame {
  const start = request.initial.epochTdbS;
  const end = request.endEpochTdbS;
  return {
    request, start, end, direction: end >= start ? 1 : -1,
    bodies: [request.forces.centralBody, ...request.forces.perturbingBodies],
    j2Body: request.forces.centralJ2 === true ? request.forces.centralBody : null,
    referenceBody: request.forces.referenceBody ?? request.forces.centralBody,
    burns: (request.burns ?? []).map((b, i) => ({ ...b, index: i })),
    maxSteps: request.maxSteps ?? PROPAGATION_DEFAULTS.maxSteps,
  };
}

/** One single-centre segment from `state` about `centre`, with the burns inside it. */
function segmentRequest(run: RunFrame, state: StateVector, centre: BodyName, stepsSoFar: number):
  { segRequest: PropagationRequest; segBurns: IndexedBurn[] } {
  const { request, direction, end, bodies } = run;
  const segStart = state.epochTdbS;
  const segBurns = run.burns.filter((b) => (b.epochTdbS - segStart) * direction > 0 && (b.epochTdbS - end) * direction <= 0);
  const segRequest: PropagationRequest = {
    ...request, initial: state, events: [], switching: undefined, burns: segBurns, outputStepS: undefined,
    // Every segment keeps the equations of a run about the requested central body: switching changes
    // the integration variable, not the physics (forces/moving-centre.ts).
    forces: { ...request.forces, centralBody: centre, perturbingBodies: bodies.filter((b) => b !== centre),
      centralJ2: centre === run.j2Body, referenceBody: run.referenceBody },
    maxSteps: Math.max(1, run.maxSteps - stepsSoFar),
  };
  return { segRequest, segBurns };
}

/** The segment's event watcher, built on the first step (it needs the loop's dynamics). */
function segmentWatcher(run: RunFrame, centre: BodyName, cand: Candidates): { factory: SegmentWatcher; watcher(): EventWatcher | null } {
  const { request, direction } = run;
  let watcher: EventWatcher | null = null;
  const factory: SegmentWatcher = {
    afterStep(stepper, out, dynamics) {
      if (dynamics === undefined) throw new InvalidInputError('events', 'the propagation loop gave no dynamics to the event watcher');
      if (watcher === null) {
        const active = buildEvents(request.events ?? [], {
          ephemeris: request.ephemeris, centre, integrationDirection: direction, impactBodies: [],
          soiEntries: cand.entries, soiExit: cand.exit,
        });
        const grid = request.outputStepS === undefined ? undefined
          : { originTdbS: run.start, endTdbS: run.end, stepS: request.outputStepS };
        watcher = new EventWatcher(active, dynamics, request.ephemeris, direction, grid);
      }
      return watcher.afterStep(stepper, out);
    },
  };
  return { factory, watcher: () => watcher };
}

/** Adds a finished segment to the totals; Φ and the burn sensitivities chain by multiplication. */
function absorbSegment(totals: SegmentTotals, run: RunFrame, result: PropagationResult, watcher: EventWatcher | null,
  segBurns: readonly IndexedBurn[]): void {
  const { direction } = run;
  const { counts, sens } = totals;
  totals.last = result;
  totals.methodsUsed.add(result.methodUsed);
  totals.events.push(...result.events);
  totals.warnings.push(...result.warnings.filter((w) => !w.includes('not reached')));
  for (const k of Object.keys(counts) as (keyof typeof counts)[]) counts[k] += result.stats[k];
  totals.rectifications += result.stats.rectifications;
  const tEnd = result.final.epochTdbS;
  if (watcher !== null) totals.samples.push(...watcher.samples.filter((s) => (s.epochTdbS - tEnd) * direction <= 0));
  if (result.stm !== undefined) {
    // Earlier burns' sensitivities pass through this segment's Φ; this segment's burns start here.
    sens.forEach((s, k) => { if (s !== undefined) sens[k] = multiply6Columns(result.stm!, s, 3); });
    segBurns.forEach((b, k) => {
      if ((b.epochTdbS - tEnd) * direction <= 0) sens[b.index] = result.burnSensitivities![k];
    });
    totals.stm = totals.stm === undefined ? result.stm : multiply6Columns(result.stm, totals.stm, 6);
  }
}

/** The whole run's result from the totals: events in time order, samples, the last segment's outcome. */
function assembleResult(totals: SegmentTotals, run: RunFrame, initial: StateVector, state: StateVector): PropagationResult {
  const { last, switches, warnings } = totals;
  const { direction } = run;
  if (last === null) throw new InvalidInputError('switching', 'no segment was run');
  const finishedBySwitch = last.outcome === 'stopped-by-event' && switches.length > 0
    && switches[switches.length - 1].epochTdbS === last.final.epochTdbS;
  const final = finishedBySwitch ? state : last.final;
  // Time order (the watchers of one step report separately), nothing past the end reached (an impact can
  // end a step in which a later event was located).
  const ordered = totals.events.filter((e) => (e.epochTdbS - final.epochTdbS) * direction <= 0)
    .sort((x, y) => (x.epochTdbS - y.epochTdbS) * direction);
  // Samples: the start, the grid (from each segment's watcher, centre of that segment), the end.
  const allSamples = run.request.outputStepS === undefined ? []
    : [initial, ...totals.samples, final];
  const result: PropagationResult = {
    outcome: finishedBySwitch ? 'finished' : last.outcome,
    methodUsed: totals.methodsUsed.size === 1 ? last.methodUsed : 'mixed',
    message: finishedBySwitch ? undefined : last.message,
    final, samples: allSamples, events: ordered, warnings,
    stats: { ...totals.counts, rectifications: totals.rectifications, switches },
  };
  if (totals.stm !== undefined) {
    result.stm = totals.stm;
    result.burnSensitivities = totals.sens.map((s) => s ?? new Array<number>(18).fill(0));
    if (totals.sens.some((s) => s === undefined)) warnings.push('some burn(s) not reached; their sensitivities are zero');
  }
  return result;
}

/** The chained run as a generator yielding the fraction of the whole span done. */
export function* segmentedSteps(request: PropagationRequest, options: PropagationOptions,
  segmentSteps: SegmentSteps): Generator<number, PropagationResult, void> {
  const run = runFrame(request);
  const { start, end } = run;
  const span = Math.abs(end - start);
  const totals: SegmentTotals = {
    events: [], warnings: [], switches: [], counts: { steps: 0, acceptedSteps: 0, rejectedSteps: 0, evaluations: 0 },
    rectifications: 0, stm: undefined, sens: run.burns.map(() => undefined), methodsUsed: new Set(), samples: [], last: null,
  };
  const initial = changeCentre(stateToFrame(request.initial, 'J2000_EQUATORIAL'), request.forces.centralBody, request.ephemeris);
  let state: StateVector = initial;
  let centre = request.forces.centralBody;

  for (let segment = 0; segment < 1000; segment++) {
    const cand = switchCandidates(centre, run.bodies, request);
    const jump = segment === 0 ? insideAtStart(state, cand, request) : null;
    if (jump !== null) {
      totals.switches.push({ epochTdbS: state.epochTdbS, from: centre, to: jump });
      state = changeCentre(state, jump, request.ephemeris);
      centre = jump;
      segment -= 1;
      continue;
    }
    const segStart = state.epochTdbS;
    const { segRequest, segBurns } = segmentRequest(run, state, centre, totals.counts.steps);
    const { factory, watcher } = segmentWatcher(run, centre, cand);
    const steps = segmentSteps(segRequest, options, [factory]);
    const done = Math.abs(segStart - start);
    let next = steps.next();
    while (next.done !== true) {
      yield span === 0 ? 1 : Math.min(1, (done + next.value * Math.abs(end - segStart)) / span);
      next = steps.next();
    }
    const result = next.value;
    absorbSegment(totals, run, result, watcher(), segBurns);
    const tEnd = result.final.epochTdbS;
    const sw = watcher()?.switchTo ?? null;
    if (result.outcome !== 'stopped-by-event' || sw === null || sw.epochTdbS !== tEnd) break;
    totals.switches.push({ epochTdbS: tEnd, from: centre, to: sw.body });
    state = changeCentre(result.final, sw.body, request.ephemeris);
    centre = sw.body;
    if (tEnd === end) break;
  }
  return assembleResult(totals, run, initial, state);
}
