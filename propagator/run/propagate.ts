/**
 * propagate(): one propagation of a spacecraft state under a force model (J2000 equatorial, km, km/s,
 * TDB s from J2000), forward or backward in time, with impulsive burns, output samples, the STM on
 * request, impact detection, progress and cancellation. One code path: a generator that yields after
 * every accepted step, drained synchronously by propagate() and cooperatively by propagateAsync().
 */
import { createCowellDynamics } from '../cowell.ts';
import { createEnckeOrFallback } from '../encke/index.ts';
import { MovingCentreDynamics, needsSegmentedRun, segmentedSteps } from '../switching/index.ts';
import type { Ephemeris } from '../ephemeris/ephemeris.ts';
import { InvalidInputError } from '../../contract/errors.ts';
import { ForceModel } from '../forces/index.ts';
import { changeCentre, stateToFrame } from '../frames/index.ts';
import { Dop853Stepper } from '../integrators/index.ts';
import { checkEphemerisSpan, checkEvents, checkRequest, type CheckedRequest } from './propagate-checks.ts';
import { ImpactWatch } from './propagate-impact.ts';
import { OutputSampler, stateVector } from './propagate-output.ts';
import { CARTESIAN_LENGTH, type PropagationDynamics } from './propagation-dynamics.ts';
import type {
  EventRecord, PropagationOptions, PropagationOutcome, PropagationRequest, PropagationResult,
} from './propagation-types.ts';
import { resetStm, StmSegments } from '../variational.ts';
import { createThrustArcDynamics, finiteBurnSteps, thrustAddedAcceleration, type ThrustArc } from '../finite-burn/index.ts';

/** Ends a run inside the step just accepted (impact, a stopping event). */
export interface WatchStop {
  epochTdbS: number;
  outcome: PropagationOutcome;
  message: string;
  event?: EventRecord;
}

/** Inspects every accepted step; may record events and ask to stop inside the step. */
export interface StepWatcher {
  afterStep(stepper: Dop853Stepper, events: EventRecord[], dynamics?: PropagationDynamics): WatchStop | null;
}

/** How often propagateAsync yields to the event loop (and reports progress), ms. */
export const ASYNC_YIELD_INTERVAL_MS = 20;
/** propagate() reports progress every this many accepted steps. */
const SYNC_PROGRESS_EVERY_STEPS = 64;

/** Runs a propagation to its end; see the PropagationRequest fields for units and frames. Throws only
 * for bad input (InvalidInputError / OutOfSpanError naming the field); everything else is an outcome. */
export function propagate(request: PropagationRequest, options: PropagationOptions = {}): PropagationResult {
  const steps = propagationSteps(request, options);
  for (let count = 1; ; count++) {
    const next = steps.next();
    if (next.done === true) return finishProgress(next.value, options);
    if (count % SYNC_PROGRESS_EVERY_STEPS === 0) options.onProgress?.(next.value);
  }
}

/** Same as {@link propagate}, yielding to the event loop every ~20 ms so an AbortSignal and progress
 * callbacks flow (e.g. inside a worker thread). The clock only paces yielding; results do not depend on it. */
export async function propagateAsync(request: PropagationRequest, options: PropagationOptions = {}): Promise<PropagationResult> {
  const steps = propagationSteps(request, options);
  let last = performance.now();
  for (;;) {
    const next = steps.next();
    if (next.done === true) return finishProgress(next.value, options);
    const now = performance.now();
    if (now - last >= ASYNC_YIELD_INTERVAL_MS) {
      options.onProgress?.(next.value);
      await new Promise<void>((resolve) => setImmediate(resolve));
      last = performance.now();
    }
  }
}

function finishProgress(result: PropagationResult, options: PropagationOptions): PropagationResult {
  if (result.outcome === 'finished') options.onProgress?.(1);
  return result;
}

/** Equations of motion for the requested method. */
function createDynamics(checked: CheckedRequest, forces: ForceModel, cart: number[], arc?: ThrustArc): PropagationDynamics {
  if (arc !== undefined) {
    // Encke carries the thrust as a perturbation; its arc partials (direction, mass) exist in Cowell form only.
    if (checked.method === 'encke' && !checked.withStm) {
      return createEnckeOrFallback(checked, forces, cart, (f, c, w) => createThrustArcDynamics(f, c, w, arc), thrustAddedAcceleration(forces, arc));
    }
    return createThrustArcDynamics(forces, cart, checked.withStm, arc);
  }
  if (checked.method === 'cowell') return createCowellDynamics(forces, cart, checked.withStm);
  if (checked.method === 'encke') return createEnckeOrFallback(checked, forces, cart, createCowellDynamics);
  throw new InvalidInputError('method', `'${checked.method}' is not available in this build`);
}

/** Validates, converts the initial state to the integration frame and centre, and builds the model. */
function prepare(request: PropagationRequest, arc?: ThrustArc): { checked: CheckedRequest; dynamics: PropagationDynamics } {
  const checked = checkRequest(request);
  if ((request.events?.length ?? 0) > 0) throw new InvalidInputError('events', 'events are not available in this build');
  if (request.switching?.enabled === true) throw new InvalidInputError('switching', 'central-body switching is not available in this build');
  const ephemeris: Ephemeris = request.ephemeris;
  const forces = new ForceModel(request.forces, ephemeris);
  const needsEphemeris = forces.perturbingBodies.length > 0 || request.forces.solarPressure !== undefined
    || request.initial.centre !== forces.centralBody;
  if (needsEphemeris) checkEphemerisSpan(ephemeris.span, ephemeris.name, checked.startTdbS, checked.endTdbS);
  const state = changeCentre(stateToFrame(request.initial, 'J2000_EQUATORIAL'), forces.centralBody, ephemeris);
  // About a moving centre the shifted coordinate starts equal to the state (its offset is zero at the anchor).
  forces.anchorMovingCentre(checked.startTdbS);
  const inner = createDynamics(checked, forces, [...state.positionKm, ...state.velocityKmS], arc);
  const dynamics = forces.movingCentre === null ? inner : new MovingCentreDynamics(inner);
  const inside = new ImpactWatch(dynamics).inside(checked.startTdbS, dynamics.initialY);
  if (inside !== null) {
    throw new InvalidInputError('initial.positionKm', `the initial state lies inside ${inside.body} `
      + `(distance ${inside.distanceKm.toFixed(3)} km from its centre)`);
  }
  return { checked, dynamics };
}

/** Impact detection as a StepWatcher. */
function impactWatcher(dynamics: PropagationDynamics): StepWatcher {
  const watch = new ImpactWatch(dynamics);
  const cart = new Float64Array(6);
  const bodyState = new Float64Array(6);
  const dense = new Float64Array(dynamics.initialY.length);
  return {
    afterStep(stepper, events) {
      const hit = watch.afterStep(stepper);
      if (hit === null) return null;
      if (stepper.hasDenseOutput) stepper.denseOutput(hit.epochTdbS, dense, CARTESIAN_LENGTH);
      else dense.set(stepper.y);
      dynamics.cartesianInto(hit.epochTdbS, dense, cart);
      // EventRecord states are relative to the event's body.
      const forces = dynamics.forces;
      if (hit.body !== forces.centralBody) {
        forces.ephemeris.stateInto(hit.body, forces.centralBody, hit.epochTdbS, bodyState, 0);
        for (let i = 0; i < 6; i++) cart[i] -= bodyState[i];
      }
      const event: EventRecord = {
        kind: 'impact', body: hit.body, epochTdbS: hit.epochTdbS, distanceKm: hit.distanceKm,
        state: stateVector(hit.epochTdbS, hit.body, cart),
      };
      events.push(event);
      return {
        epochTdbS: hit.epochTdbS, outcome: 'impact', event,
        message: `impact on ${hit.body} at ${hit.epochTdbS} TDB s (distance ${hit.distanceKm.toFixed(3)} km from its centre)`,
      };
    },
  };
}

/**
 * The propagation as a generator: yields the fraction of the span done after each accepted step and
 * returns the result. Validation errors throw on the first `next()`. `arc` (internal, from the finite-burn
 * runner): the whole run is one thrust arc.
 */
export function* propagationSteps(
  request: PropagationRequest, options: PropagationOptions = {}, extraWatchers: StepWatcher[] = [], arc?: ThrustArc,
): Generator<number, PropagationResult, void> {
  checkEvents(request.events);
  if ((request.finiteBurns?.length ?? 0) > 0) return yield* finiteBurnSteps(request, options, propagationSteps);
  if (needsSegmentedRun(request)) return yield* segmentedSteps(request, options, propagationSteps);
  const { checked, dynamics } = prepare(request, arc);
  const { startTdbS: start, endTdbS: end, direction, burns } = checked;
  const stepper = new Dop853Stepper(dynamics.rhs, start, dynamics.initialY, direction, {
    relativeTolerance: checked.relativeTolerance,
    absoluteTolerance: checked.absoluteTolerance,
    errorComponents: dynamics.errorComponents,
    linearTail: dynamics.linearTail,
    initialStepS: dynamics.initialStepS,
    maxStepS: dynamics.maxStepS,
    endTime: end,
  });
  const watchers = [impactWatcher(dynamics), ...extraWatchers];
  const events: EventRecord[] = [];
  const warnings: string[] = [...(dynamics.warnings ?? [])];
  const segments = checked.withStm ? new StmSegments() : null;
  const sampler = checked.outputStepS === null ? null : new OutputSampler(dynamics, start, end, checked.outputStepS, direction);
  sampler?.emitStart(stepper.y);
  const span = Math.abs(end - start);
  // Encke's rectification rewrites a copy of y in place; one buffer for the whole run (no allocation per step).
  const rectifyBuffer = dynamics.maybeRectify === undefined ? null : new Float64Array(dynamics.initialY.length);
  const targets = [...new Set([...burns.map((b) => b.epochTdbS), end])];
  let outcome: PropagationOutcome = 'finished';
  let message: string | undefined;
  let stop: WatchStop | null = null;
  let burnsApplied = 0;

  run: for (const target of targets) {
    while (stepper.t !== target) {
      if (options.signal?.aborted === true) {
        outcome = 'cancelled';
        message = `cancelled at ${stepper.t} TDB s`;
        break run;
      }
      if (stepper.counts.steps >= checked.maxSteps) {
        outcome = 'max-steps';
        message = `${checked.maxSteps} steps reached at ${stepper.t} TDB s (raise maxSteps or loosen the tolerance)`;
        break run;
      }
      if (stepper.step(target) === 'step-size-underflow') {
        outcome = 'step-size-underflow';
        message = stepper.diagnostic;
        break run;
      }
      for (const watcher of watchers) {
        const hit = watcher.afterStep(stepper, events, dynamics);
        if (hit !== null && (stop === null || (hit.epochTdbS - stop.epochTdbS) * direction < 0)) stop = hit;
      }
      sampler?.emitThrough(stepper, stop?.epochTdbS ?? stepper.t);
      if (stop !== null) {
        outcome = stop.outcome;
        message = stop.message;
        break run;
      }
      if (rectifyBuffer !== null) {
        rectifyBuffer.set(stepper.y);
        if (dynamics.maybeRectify!(stepper.t, rectifyBuffer)) stepper.reset(rectifyBuffer);
      }
      yield span === 0 ? 1 : Math.min(1, Math.abs(stepper.t - start) / span);
    }
    burnsApplied = applyBurnsAt(target, burns, burnsApplied, stepper, dynamics, segments, direction);
  }

  return finishRun({ stepper, dynamics, stop, sampler, segments, burns, burnsApplied, outcome, message, events, warnings });
}

/** Applies the impulsive burns due at `target` (TDB s) in order from index `applied`; with the STM, closes the
 * segment at each burn first. Returns the count of burns applied so far. */
function applyBurnsAt(target: number, burns: CheckedRequest['burns'], applied: number, stepper: Dop853Stepper,
  dynamics: PropagationDynamics, segments: StmSegments | null, direction: 1 | -1): number {
  let burnsApplied = applied;
  while (burnsApplied < burns.length && burns[burnsApplied].epochTdbS === target) {
    const y = Float64Array.from(stepper.y);
    if (segments !== null) {
      dynamics.settleStm?.(target, y);
      segments.closeAtBurn(y, direction);
      resetStm(y);
    }
    const dv = burns[burnsApplied].deltaVKmS;
    dynamics.applyImpulse(target, y, [direction * dv[0], direction * dv[1], direction * dv[2]]);
    stepper.reset(y);
    burnsApplied += 1;
  }
  return burnsApplied;
}

/** Where the step loop left off: what finishRun needs to build the result. */
interface RunEnd {
  stepper: Dop853Stepper;
  dynamics: PropagationDynamics;
  stop: WatchStop | null;
  sampler: OutputSampler | null;
  segments: StmSegments | null;
  burns: CheckedRequest['burns'];
  burnsApplied: number;
  outcome: PropagationOutcome;
  message: string | undefined;
  events: EventRecord[];
  warnings: string[];
}

/** The result of a finished step loop: final state (J2000 equatorial about the central body), samples,
 * counts and, with the STM, Φ and the burn sensitivities in the request's order. */
function finishRun(end: RunEnd): PropagationResult {
  const { stepper, dynamics, stop, sampler, segments, burns, burnsApplied, outcome, message, events, warnings } = end;
  const central = dynamics.forces.centralBody;
  // The final integration vector: where a watcher stopped the run inside a step, or the stepper's.
  let finalEpoch = stepper.t;
  let yFinal = Float64Array.from(stepper.y);
  if (stop !== null) {
    finalEpoch = stop.epochTdbS;
    if (stepper.hasDenseOutput && finalEpoch !== stepper.t) stepper.denseOutput(finalEpoch, yFinal);
  }
  dynamics.onFinish?.(finalEpoch, yFinal);
  const cart = new Float64Array(6);
  dynamics.cartesianInto(finalEpoch, yFinal, cart);
  const final = stateVector(finalEpoch, central, cart);
  sampler?.finish(final);
  const result: PropagationResult = {
    outcome, methodUsed: dynamics.method ?? 'cowell', message, final, samples: sampler?.samples ?? [], events, warnings,
    stats: { ...stepper.counts, rectifications: dynamics.rectifications ?? 0, switches: [] },
  };
  if (segments !== null) {
    dynamics.settleStm?.(finalEpoch, yFinal);
    const { stm, burnSensitivities } = segments.finish(yFinal, burns.length - burnsApplied);
    result.stm = stm;
    // Back to the request's order of burns.
    result.burnSensitivities = new Array<number[]>(burns.length);
    burns.forEach((burn, k) => {
      result.burnSensitivities![burn.requestIndex] = burnSensitivities[k];
    });
    if (burnsApplied < burns.length) warnings.push(`${burns.length - burnsApplied} burn(s) not reached; their sensitivities are zero`);
  }
  return result;
}
