/**
 * The request file of `veer propagate` (zod 4): one propagation of an initial state under a force model.
 * Epochs are ISO-8601 text with the scale named ('2031-03-01T00:00:00 TDB', '...Z' for UTC) or a number
 * of TDB seconds from J2000. Units are in the field names. Parsing turns zod issues and bad epochs into
 * InvalidInputError naming the field path (e.g. `burns[1].epoch`).
 */
import { z } from 'zod';
import { RELATIVE_TOLERANCE_RANGE } from '../contract/problem-bounds.ts';
import {
  BODY_NAMES, BUILTIN_LEAP_SECONDS, formatEpoch, INERTIAL_FRAMES, InvalidInputError, OutOfSpanError, parseEpoch,
  type LeapSecondTable, type EventSpec, type VelocityImpulse, type PropagationRequest, type Ephemeris, type TdbSpan, type Vec3,
} from '../propagator/index.ts';

const vec3 = z.tuple([z.number(), z.number(), z.number()]);
const body = z.enum(BODY_NAMES);
const epoch = z.union([
  z.string().min(10).max(64).describe("ISO-8601 with scale: '2031-03-01T00:00:00 TDB' or '...Z' (UTC)"),
  z.number().describe('TDB seconds from J2000'),
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
  burns: z.array(z.object({ epoch, deltaVKmS: vec3 }).strict()).default([]),
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

/** The propagator's request for a parsed file and an ephemeris. */
export function toPropagationRequest(file: PropagateRequestFile, ephemeris: Ephemeris): PropagationRequest {
  const { startTdbS, endTdbS } = requestSpan(file);
  const burns: VelocityImpulse[] = file.burns.map((b, i) => ({
    epochTdbS: epochSeconds(file, b.epoch, `burns[${i}].epoch`),
    deltaVKmS: b.deltaVKmS as Vec3,
  }));
  return {
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
    outputStepS: file.outputStepS,
    withStm: file.withStm,
    events: file.events.map((e, i): EventSpec => (e.kind === 'epoch'
      ? { kind: 'epoch', epochTdbS: epochSeconds(file, e.epoch, `events[${i}].epoch`), stop: e.stop }
      : e)),
    switching: file.switching,
  };
}
