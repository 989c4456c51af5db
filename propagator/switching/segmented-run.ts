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
  EventRecord, PropagationOptions, PropagationRequest, PropagationResult,
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

/** The chained run as a generator yielding the fraction of the whole span done. */
export function* segmentedSteps(request: PropagationRequest, options: PropagationOptions,
  segmentSteps: SegmentSteps): Generator<number, PropagationResult, void> {
  const start = request.initial.epochTdbS;
  const end = request.endEpochTdbS;
  const direction: 1 | -1 = end >= start ? 1 : -1;
  const span = Math.abs(end - start);
  const bodies: BodyName[] = [request.forces.centralBody, ...request.forces.perturbingBodies];
  const j2Body = request.forces.centralJ2 === true ? request.forces.centralBody : null;
  const referenceBody = request.forces.referenceBody ?? request.forces.centralBody;
  const burns = (request.burns ?? []).map((b, i) => ({ ...b, index: i }));
  const maxSteps = request.maxSteps ?? PROPAGATION_DEFAULTS.maxSteps;
  const events: EventRecord[] = [];
  const warnings: string[] = [];
  const switches: PropagationResult['stats']['switches'] = [];
  const counts = { steps: 0, acceptedSteps: 0, rejectedSteps: 0, evaluations: 0 };
  let rectifications = 0;
  let stm: number[] | undefined;
  const sens: (number[] | undefined)[] = burns.map(() => undefined);
  const initial = changeCentre(stateToFrame(request.initial, 'J2000_EQUATORIAL'), request.forces.centralBody, request.ephemeris);
  let state: StateVector = initial;
  let centre = request.forces.centralBody;
  let last: PropagationResult | null = null;
  const methodsUsed = new Set<PropagationResult['methodUsed']>();
  const samples: StateVector[] = [];

  for (let segment = 0; segment < 1000; segment++) {
    const cand = switchCandidates(centre, bodies, request);
    const jump = segment === 0 ? insideAtStart(state, cand, request) : null;
    if (jump !== null) {
      switches.push({ epochTdbS: state.epochTdbS, from: centre, to: jump });
      state = changeCentre(state, jump, request.ephemeris);
      centre = jump;
      segment -= 1;
      continue;
    }
    const segStart = state.epochTdbS;
    const segBurns = burns.filter((b) => (b.epochTdbS - segStart) * direction > 0 && (b.epochTdbS - end) * direction <= 0);
    const segRequest: PropagationRequest = {
      ...request, initial: state, events: [], switching: undefined, burns: segBurns, outputStepS: undefined,
      // Every segment keeps the equations of a run about the requested central body: switching changes
      // the integration variable, not the physics (forces/moving-centre.ts).
      forces: { ...request.forces, centralBody: centre, perturbingBodies: bodies.filter((b) => b !== centre),
        centralJ2: centre === j2Body, referenceBody },
      maxSteps: Math.max(1, maxSteps - counts.steps),
    };
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
            : { originTdbS: start, endTdbS: end, stepS: request.outputStepS };
          watcher = new EventWatcher(active, dynamics, request.ephemeris, direction, grid);
        }
        return watcher.afterStep(stepper, out);
      },
    };
    const run = segmentSteps(segRequest, options, [factory]);
    const done = Math.abs(segStart - start);
    let next = run.next();
    while (next.done !== true) {
      yield span === 0 ? 1 : Math.min(1, (done + next.value * Math.abs(end - segStart)) / span);
      next = run.next();
    }
    const result = next.value;
    last = result;
    methodsUsed.add(result.methodUsed);
    events.push(...result.events);
    warnings.push(...result.warnings.filter((w) => !w.includes('not reached')));
    for (const k of Object.keys(counts) as (keyof typeof counts)[]) counts[k] += result.stats[k];
    rectifications += result.stats.rectifications;
    const tEnd = result.final.epochTdbS;
    if (watcher !== null) samples.push(...(watcher as EventWatcher).samples.filter((s) => (s.epochTdbS - tEnd) * direction <= 0));
    if (result.stm !== undefined) {
      // Earlier burns' sensitivities pass through this segment's Φ; this segment's burns start here.
      sens.forEach((s, k) => { if (s !== undefined) sens[k] = multiply6Columns(result.stm!, s, 3); });
      segBurns.forEach((b, k) => {
        if ((b.epochTdbS - tEnd) * direction <= 0) sens[b.index] = result.burnSensitivities![k];
      });
      stm = stm === undefined ? result.stm : multiply6Columns(result.stm, stm, 6);
    }
    const sw = (watcher as EventWatcher | null)?.switchTo ?? null;
    if (result.outcome !== 'stopped-by-event' || sw === null || sw.epochTdbS !== tEnd) break;
    switches.push({ epochTdbS: tEnd, from: centre, to: sw.body });
    state = changeCentre(result.final, sw.body, request.ephemeris);
    centre = sw.body;
    if (tEnd === end) break;
  }
  if (last === null) throw new InvalidInputError('switching', 'no segment was run');
  const finishedBySwitch = last.outcome === 'stopped-by-event' && switches.length > 0
    && switches[switches.length - 1].epochTdbS === last.final.epochTdbS;
  const final = finishedBySwitch ? state : last.final;
  // Time order (the watchers of one step report separately), nothing past the end reached (an impact can
  // end a step in which a later event was located).
  const ordered = events.filter((e) => (e.epochTdbS - final.epochTdbS) * direction <= 0)
    .sort((x, y) => (x.epochTdbS - y.epochTdbS) * direction);
  // Samples: the start, the grid (from each segment's watcher, centre of that segment), the end.
  const allSamples = request.outputStepS === undefined ? []
    : [initial, ...samples, final];
  const result: PropagationResult = {
    outcome: finishedBySwitch ? 'finished' : last.outcome,
    methodUsed: methodsUsed.size === 1 ? last.methodUsed : 'mixed',
    message: finishedBySwitch ? undefined : last.message,
    final, samples: allSamples, events: ordered, warnings,
    stats: { ...counts, rectifications, switches },
  };
  if (stm !== undefined) {
    result.stm = stm;
    result.burnSensitivities = sens.map((s) => s ?? new Array<number>(18).fill(0));
    if (sens.some((s) => s === undefined)) warnings.push('some burn(s) not reached; their sensitivities are zero');
  }
  return result;
}
