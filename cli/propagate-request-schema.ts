/**
 * The request file of `veer propagate` (zod 4): one propagation of an initial state under a force model.
 * Epochs are ISO-8601 text with the scale named ('2031-03-01T00:00:00 TDB', '...Z' for UTC) or a number
 * of TDB seconds from J2000. Units are in the field names. Parsing turns zod issues and bad epochs into
 * InvalidInputError naming the field path (e.g. `burns[1].epoch`).
 */
import * as z from 'zod';
import { RELATIVE_TOLERANCE_RANGE } from '../contract/problem-bounds.ts';
import {
  BODY_NAMES, BUILTIN_LEAP_SECONDS, formatEpoch, INERTIAL_FRAMES, InvalidInputError, OutOfSpanError, parseEpoch,
  type LeapSecondTable, type EventSpec, type VelocityImpulse, type PropagationRequest, type Ephemeris, type TdbSpan, type Vec3,
  type FiniteBurnSpec, checkFiniteBurns,
} from '../propagator/index.ts';
import { massFlowRateKgS } from '../planner/index.ts';

const vec3 = z.tuple([z.number(), z.number(), z.number()]);
const body = z.enum(BODY_NAMES);
const epoch = z.union([
  z.string().min(10).max(64).describe("ISO-8601 with scale: '2031-03-01T00:00:00 TDB' or '...Z' (UTC)"),
  z.number().describe('TDB seconds from J2000'),
]);

/**
 * A burn, with the problem's burn models: `impulsive` (the default) is Δv at `epoch` (J2000 equatorial);
 * `finite` fires `thrustN` from `epoch` (ignition) for `durationS` along the unit `direction` held fixed in
 * `frame` axes (inertial = J2000 equatorial; RTN / VNB of the instantaneous state relative to the central
 * body), the mass falling at ṁ = thrustN/(ispS·g0) or at the `massFlowKgS` given (a plan's finite block).
 */
const burnSchema = z.discriminatedUnion('model', [
  z.object({ model: z.literal('impulsive').default('impulsive'), epoch, deltaVKmS: vec3 }).strict(),
  z.object({
    model: z.literal('finite'),
    epoch,
    durationS: z.number().positive(),
    thrustN: z.number().positive(),
    ispS: z.number().positive().optional(),
    massFlowKgS: z.number().min(0).optional(),
    frame: z.enum(['inertial', 'RTN', 'VNB']),
    direction: vec3,
  }).strict(),
]);

const stop = z.boolean().optional();
/** Events located on the dense output (propagator/events); `stop: true` ends the run there. */
const eventSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('periapsis'), body, stop }).strict(),
  z.object({ kind: z.literal('apoapsis'), body, stop }).strict(),
  z.object({ kind: z.literal('closest-approach'), body, stop }).strict(),
  z.object({ kind: z.literal('altitude'), body, altitudeKm: z.number().min(0).describe('km above the mean surface, >= 0'), stop }).strict(),
  z.object({ kind: z.literal('epoch'), epoch, stop }).strict(),
]);

/** The request file's zod schema (README "veer propagate" documents each field). */
export const propagateRequestSchema = z.object({
  initial: z.object({
    epoch,
    centre: body,
    frame: z.enum(INERTIAL_FRAMES).default('J2000_EQUATORIAL'),
    positionKm: vec3,
    velocityKmS: vec3,
  }).strict(),
  /** End of the span: an epoch, or a signed duration in seconds (negative = backward). Exactly one. */
  endEpoch: epoch.optional(),
  durationS: z.number().optional(),
  forces: z.object({
    centralBody: body,
    perturbingBodies: z.array(body).default([]),
    centralJ2: z.boolean().optional(),
    solarPressure: z.object({
      areaM2: z.number().positive(),
      reflectivityCoefficient: z.number().min(1).max(2),
      massKg: z.number().positive(),
      shadow: z.enum(['none', 'cylindrical']).optional(),
    }).strict().optional(),
  }).strict(),
  method: z.enum(['cowell', 'encke']).optional(),
  relativeTolerance: z.number().min(RELATIVE_TOLERANCE_RANGE.min).max(RELATIVE_TOLERANCE_RANGE.max).optional(),
  absoluteTolerance: z.number().positive().max(1).optional(),
  maxSteps: z.number().int().positive().optional(),
  /** Spacecraft mass at the initial epoch, kg: needed with finite burns unless forces.solarPressure.massKg
   * gives it (both given: they must agree). Finite burns lower it; solar pressure follows it. */
  massKg: z.number().positive().optional(),
  burns: z.array(burnSchema).default([]),
  outputStepS: z.number().positive().optional(),
  withStm: z.boolean().optional(),
  events: z.array(eventSchema).default([]),
  /** Central-body switching at spheres of influence (Laplace radius unless overridden, km). */
  switching: z.object({
    enabled: z.boolean(),
    radiusKm: z.partialRecord(body, z.number().positive()).optional(),
  }).strict().optional(),
  /** 'chebyshev' (default): a Chebyshev cache of the built-in ephemeris over the span; 'builtin': the
   * astronomy-engine series at every look-up (slower, same physics to ~cm). */
  ephemeris: z.enum(['chebyshev', 'builtin']).default('chebyshev'),
}).strict();

/** A parsed request file (epochs still as given: ISO text with a scale, or TDB s from J2000) with the
 * leap-second table its UTC epochs are read through. */
export type PropagateRequestFile = z.infer<typeof propagateRequestSchema> & { leapSeconds: LeapSecondTable };

/** Dotted field path of a zod issue: ['burns', 1, 'epoch'] -> 'burns[1].epoch'. */
function fieldPath(path: readonly PropertyKey[]): string {
  return path.reduce<string>((acc, key) => (typeof key === 'number' ? `${acc}[${key}]` : acc === '' ? String(key) : `${acc}.${String(key)}`), '') || 'request';
}

function epochSeconds(file: PropagateRequestFile, value: string | number, field: string): number {
  return typeof value === 'number' ? value : parseEpoch(value, undefined, field, file.leapSeconds);
}

/** Validates parsed JSON against the schema; throws InvalidInputError naming the first bad field. UTC epochs
 * will be read through `leapSeconds` (--leap-seconds, VEER_LEAP_SECONDS or the built-in table). */
export function parsePropagateRequest(json: unknown, leapSeconds: LeapSecondTable = BUILTIN_LEAP_SECONDS): PropagateRequestFile {
  const result = propagateRequestSchema.safeParse(json);
  if (!result.success) {
    const issue = result.error.issues[0];
    const others = result.error.issues.length > 1 ? ` (and ${result.error.issues.length - 1} more issue(s))` : '';
    throw new InvalidInputError(fieldPath(issue.path), `${issue.message}${others}`);
  }
  const file = { ...result.data, leapSeconds };
  if ((file.endEpoch === undefined) === (file.durationS === undefined)) {
    throw new InvalidInputError('endEpoch', 'give exactly one of endEpoch and durationS');
  }
  file.burns.forEach((b, i) => {
    if (b.model === 'finite' && (b.ispS === undefined) === (b.massFlowKgS === undefined)) {
      throw new InvalidInputError(`burns[${i}].ispS`, 'a finite burn needs exactly one of ispS and massFlowKgS');
    }
  });
  return file;
}

/** Start and end epochs of a request file, TDB s from J2000. */
export function requestSpan(file: PropagateRequestFile): { startTdbS: number; endTdbS: number } {
  const startTdbS = epochSeconds(file, file.initial.epoch, 'initial.epoch');
  const endTdbS = file.endEpoch !== undefined ? epochSeconds(file, file.endEpoch, 'endEpoch') : startTdbS + (file.durationS ?? 0);
  return { startTdbS, endTdbS };
}

/**
 * Throws OutOfSpanError naming the request field (`initial.epoch`, then `endEpoch` or `durationS`,
 * whichever the file gives) unless the whole requested span lies inside `span` (TDB s from J2000) of the
 * ephemeris source `sourceName`. Called before any cache is built over the span, so the message speaks
 * of the request, never of the cache; the span is never clipped to fit.
 */
export function checkRequestSpan(file: PropagateRequestFile, span: TdbSpan, sourceName: string): void {
  const { startTdbS, endTdbS } = requestSpan(file);
  const endField = file.endEpoch !== undefined ? 'endEpoch' : 'durationS';
  const covered = `the span of ${sourceName}, ${formatEpoch(span.startTdbS, 'TDB', 0)} to ${formatEpoch(span.endTdbS, 'TDB', 0)}`;
  for (const [epoch, field] of [[startTdbS, 'initial.epoch'], [endTdbS, endField]] as const) {
    if (epoch >= span.startTdbS && epoch <= span.endTdbS) continue;
    if (!Number.isFinite(epoch)) throw new InvalidInputError(field, `epoch ${epoch} is not a finite number`);
    const what = field === 'initial.epoch' ? 'the initial epoch'
      : field === 'endEpoch' ? 'the end epoch' : `the end of the span (initial epoch + durationS ${file.durationS} s)`;
    throw new OutOfSpanError(field, `${what} ${formatEpoch(epoch, 'TDB', 3)} (${epoch} TDB s from J2000) is outside `
      + `${covered} (no extrapolation)`);
  }
}

/** Where each of the propagator's impulsive and finite burns sits in the file's `burns`. */
interface FileIndex { impulsive: number[]; finite: number[] }

/** The request file's name for a field of the propagator's finite-burn checks (`finiteBurns[k].startTdbS`
 * is `burns[j].epoch` of the file, `initialMassKg` is `massKg`). */
function fileField(field: string, index: FileIndex): string {
  if (field === 'initialMassKg') return 'massKg';
  const m = /^(finiteBurns|burns)\[(\d+)\](?:\.(\w+))?(.*)$/.exec(field);
  if (m === null) return field;
  const names: Record<string, string> = { startTdbS: 'epoch', epochTdbS: 'epoch', axes: 'frame' };
  const key = m[3] === undefined ? '' : `.${names[m[3]] ?? m[3]}`;
  return `burns[${(m[1] === 'burns' ? index.impulsive : index.finite)[Number(m[2])]}]${key}${m[4]}`;
}

/** Runs the propagator's finite-burn checks now, so a bad burn is named as the file names it. */
function checkFileFiniteBurns(request: PropagationRequest, index: FileIndex): void {
  try {
    checkFiniteBurns(request);
  } catch (error) {
    if (!(error instanceof InvalidInputError)) throw error;
    const message = error.detail
      .replace(/finiteBurns\[(\d+)\]/g, (_m, k: string) => `burns[${index.finite[Number(k)]}]`)
      .replace(/finite burn (\d+)/g, (_m, k: string) => `finite burn burns[${index.finite[Number(k)]}]`);
    throw new InvalidInputError(fileField(error.field, index), message);
  }
}

/** The propagator's request for a parsed file and an ephemeris; finite burns are checked here (spans,
 * overlaps, unit directions, the mass), InvalidInputError naming the file's field. */
export function toPropagationRequest(file: PropagateRequestFile, ephemeris: Ephemeris): PropagationRequest {
  const { startTdbS, endTdbS } = requestSpan(file);
  const burns: VelocityImpulse[] = [];
  const finiteBurns: FiniteBurnSpec[] = [];
  const index: FileIndex = { impulsive: [], finite: [] };
  file.burns.forEach((b, i) => {
    const epochTdbS = epochSeconds(file, b.epoch, `burns[${i}].epoch`);
    if (b.model === 'impulsive') {
      index.impulsive.push(i);
      burns.push({ epochTdbS, deltaVKmS: b.deltaVKmS as Vec3 });
    } else {
      index.finite.push(i);
      finiteBurns.push({
        startTdbS: epochTdbS, durationS: b.durationS, thrustN: b.thrustN, axes: b.frame, direction: b.direction as Vec3,
        massFlowKgS: b.massFlowKgS ?? massFlowRateKgS(b.thrustN, b.ispS as number),
      });
    }
  });
  const request: PropagationRequest = {
    initial: {
      epochTdbS: startTdbS,
      centre: file.initial.centre,
      frame: file.initial.frame,
      positionKm: file.initial.positionKm as Vec3,
      velocityKmS: file.initial.velocityKmS as Vec3,
    },
    endEpochTdbS: endTdbS,
    forces: file.forces,
    ephemeris,
    method: file.method,
    relativeTolerance: file.relativeTolerance,
    absoluteTolerance: file.absoluteTolerance,
    maxSteps: file.maxSteps,
    burns,
    ...(finiteBurns.length > 0 ? { finiteBurns } : {}),
    ...(file.massKg !== undefined ? { initialMassKg: file.massKg } : {}),
    outputStepS: file.outputStepS,
    withStm: file.withStm,
    events: file.events.map((e, i): EventSpec => (e.kind === 'epoch'
      ? { kind: 'epoch', epochTdbS: epochSeconds(file, e.epoch, `events[${i}].epoch`), stop: e.stop }
      : e)),
    switching: file.switching,
  };
  if (finiteBurns.length > 0) checkFileFiniteBurns(request, index);
  return request;
}
