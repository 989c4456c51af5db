/**
 * Checks a PropagationRequest before any work (InvalidInputError / OutOfSpanError naming the field)
 * and resolves its defaults.
 */
import { InvalidInputError, OutOfSpanError } from '../../contract/errors.ts';
import { RELATIVE_TOLERANCE_RANGE } from '../../contract/problem-bounds.ts';
import { PROPAGATION_DEFAULTS } from './propagation-defaults.ts';
import type { EventSpec, VelocityImpulse, PropagationMethod, PropagationRequest } from './propagation-types.ts';
import { BODY_NAMES, INERTIAL_FRAMES } from '../types.ts';

/** A burn in the order the run meets it, with its index in the request. */
export interface OrderedBurn extends VelocityImpulse {
  requestIndex: number;
}

/** A validated request with its defaults resolved: epochs TDB s from J2000, direction of time ±1,
 * tolerances (relative dimensionless; absolute km or km/s), burns in the order the run meets them. */
export interface CheckedRequest {
  method: PropagationMethod;
  startTdbS: number;
  endTdbS: number;
  direction: 1 | -1;
  relativeTolerance: number;
  absoluteTolerance: number;
  maxSteps: number;
  burns: OrderedBurn[];
  outputStepS: number | null;
  withStm: boolean;
}

function finite(value: unknown, field: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new InvalidInputError(field, `must be a finite number, got ${String(value)}`);
  }
  return value;
}

function vector3(value: unknown, field: string): void {
  if (!Array.isArray(value) || value.length !== 3) throw new InvalidInputError(field, 'must be an array of 3 numbers');
  value.forEach((v, i) => finite(v, `${field}[${i}]`));
}

function inRange(value: unknown, lo: number, hi: number, field: string, loOpen = false): number {
  const v = finite(value, field);
  if (v > hi || v < lo || (loOpen && v === lo)) {
    throw new InvalidInputError(field, `must lie in ${loOpen ? '(' : '['}${lo}, ${hi}], got ${v}`);
  }
  return v;
}

const EVENT_KINDS: readonly EventSpec['kind'][] = ['periapsis', 'apoapsis', 'closest-approach', 'altitude', 'epoch'];

/**
 * Validates the requested events (InvalidInputError naming `events[i].<field>`): a known kind and body,
 * a finite epoch (TDB s from J2000), and an altitude above the body's mean surface, altitudeKm ≥ 0 km
 * (below it the crossing is the impact, which is always reported; a negative altitude means nothing).
 */
export function checkEvents(events: readonly EventSpec[] | undefined): void {
  if (events === undefined) return;
  if (!Array.isArray(events)) throw new InvalidInputError('events', 'must be an array of event specifications');
  events.forEach((spec, i) => {
    const field = `events[${i}]`;
    if (spec === null || typeof spec !== 'object') throw new InvalidInputError(field, 'must be an event specification');
    if (!EVENT_KINDS.includes(spec.kind)) {
      throw new InvalidInputError(`${field}.kind`, `unknown kind ${JSON.stringify(spec.kind)}; use ${EVENT_KINDS.join(', ')}`);
    }
    if (spec.kind === 'epoch') {
      finite(spec.epochTdbS, `${field}.epochTdbS`);
      return;
    }
    if (!(BODY_NAMES as readonly string[]).includes(spec.body)) {
      throw new InvalidInputError(`${field}.body`, `unknown body ${JSON.stringify(spec.body)}`);
    }
    if (spec.kind === 'altitude') {
      const altitudeKm = finite(spec.altitudeKm, `${field}.altitudeKm`);
      if (altitudeKm < 0) {
        throw new InvalidInputError(`${field}.altitudeKm`, `must be >= 0 km above the surface of ${spec.body}, got ${altitudeKm} `
          + '(a crossing below the surface would never be reached: the impact ends the run first)');
      }
    }
  });
}

/** Validates the request's own fields (forces are checked by ForceModel, frames by frames/). */
export function checkRequest(request: PropagationRequest): CheckedRequest {
  const initial = request.initial;
  if (initial === null || typeof initial !== 'object') throw new InvalidInputError('initial', 'must be a state vector');
  const start = finite(initial.epochTdbS, 'initial.epochTdbS');
  vector3(initial.positionKm, 'initial.positionKm');
  vector3(initial.velocityKmS, 'initial.velocityKmS');
  if (!(BODY_NAMES as readonly string[]).includes(initial.centre)) {
    throw new InvalidInputError('initial.centre', `unknown body ${JSON.stringify(initial.centre)}`);
  }
  if (!(INERTIAL_FRAMES as readonly string[]).includes(initial.frame)) {
    throw new InvalidInputError('initial.frame', `unknown frame ${JSON.stringify(initial.frame)}; use ${INERTIAL_FRAMES.join(' or ')}`);
  }
  const end = finite(request.endEpochTdbS, 'endEpochTdbS');
  const direction: 1 | -1 = end >= start ? 1 : -1;
  const method = request.method ?? PROPAGATION_DEFAULTS.method;
  if (method !== 'cowell' && method !== 'encke') {
    throw new InvalidInputError('method', `must be 'cowell' or 'encke', got ${JSON.stringify(method)}`);
  }
  const relativeTolerance = inRange(request.relativeTolerance ?? PROPAGATION_DEFAULTS.relativeTolerance, RELATIVE_TOLERANCE_RANGE.min, RELATIVE_TOLERANCE_RANGE.max, 'relativeTolerance');
  const absoluteTolerance = inRange(request.absoluteTolerance ?? PROPAGATION_DEFAULTS.absoluteTolerance, 0, 1, 'absoluteTolerance', true);
  const maxSteps = request.maxSteps ?? PROPAGATION_DEFAULTS.maxSteps;
  if (!Number.isInteger(maxSteps) || maxSteps < 1) throw new InvalidInputError('maxSteps', `must be an integer >= 1, got ${maxSteps}`);
  const burns = checkBurns(request.burns ?? [], start, end, direction);
  let outputStepS: number | null = null;
  if (request.outputStepS !== undefined) {
    outputStepS = finite(request.outputStepS, 'outputStepS');
    if (outputStepS <= 0) throw new InvalidInputError('outputStepS', `must be > 0, got ${outputStepS}`);
    const count = Math.abs(end - start) / outputStepS;
    if (count > PROPAGATION_DEFAULTS.maxSamples) {
      throw new InvalidInputError('outputStepS', `would give ${Math.ceil(count)} samples (limit ${PROPAGATION_DEFAULTS.maxSamples})`);
    }
  }
  return {
    method, startTdbS: start, endTdbS: end, direction, relativeTolerance, absoluteTolerance, maxSteps, burns,
    outputStepS, withStm: request.withStm === true,
  };
}

function checkBurns(burns: VelocityImpulse[], start: number, end: number, direction: 1 | -1): OrderedBurn[] {
  if (!Array.isArray(burns)) throw new InvalidInputError('burns', 'must be an array');
  const lo = Math.min(start, end);
  const hi = Math.max(start, end);
  const ordered = burns.map((burn, i): OrderedBurn => {
    const epoch = finite(burn?.epochTdbS, `burns[${i}].epochTdbS`);
    vector3(burn.deltaVKmS, `burns[${i}].deltaVKmS`);
    if (epoch < lo || epoch > hi) {
      throw new InvalidInputError(`burns[${i}].epochTdbS`, `epoch ${epoch} lies outside the propagation span [${lo}, ${hi}]`);
    }
    if (direction < 0 && epoch === start) {
      throw new InvalidInputError(`burns[${i}].epochTdbS`, 'a burn at the initial epoch of a backward propagation is '
        + 'ambiguous; fold it into the initial state');
    }
    return { epochTdbS: epoch, deltaVKmS: [...burn.deltaVKmS], requestIndex: i };
  });
  // Stable sort in the direction of time: burns at one epoch apply in request order.
  return ordered.sort((a, b) => direction * (a.epochTdbS - b.epochTdbS) || a.requestIndex - b.requestIndex);
}

/** Throws OutOfSpanError (naming initial.epochTdbS or endEpochTdbS) unless both epochs, TDB s from J2000,
 * lie inside the closed span of the ephemeris `name`. */
export function checkEphemerisSpan(span: { startTdbS: number; endTdbS: number }, name: string, start: number, end: number): void {
  for (const [epoch, field] of [[start, 'initial.epochTdbS'], [end, 'endEpochTdbS']] as const) {
    if (epoch < span.startTdbS || epoch > span.endTdbS) {
      throw new OutOfSpanError(field, `epoch ${epoch} TDB s is outside the span of ${name} [${span.startTdbS}, ${span.endTdbS}]`);
    }
  }
}
