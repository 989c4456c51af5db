/**
 * An OEM as a tabulated ephemeris for the propagator: each segment becomes the propagator's tabulated
 * source (Lagrange or Hermite over a sliding window), segments are chained in time, and the span is
 * each segment's useable span (USEABLE_START/STOP_TIME when given). Epochs outside every segment throw
 * OutOfSpanError; states come out J2000 equatorial (the only axes a message may name).
 *
 * Interpolation: INTERPOLATION = LAGRANGE with degree d uses d + 1 states; HERMITE with degree d
 * uses (d + 1) / 2 states matching positions and velocities (an even d is raised to the next odd one,
 * so the polynomial is never of lower degree than the file asks); LINEAR is Lagrange of degree 1.
 * Without INTERPOLATION the options' default applies.
 */
import {
  type BodyName, type Ephemeris, type StateVector, type TabulatedEphemeris, type TabulatedInterpolation, type TdbSpan,
  assertBody, assertInSpan, createTabulatedEphemeris, InvalidInputError, OutOfSpanError,
} from '../../propagator/index.ts';
import { CcsdsFormatError } from '../errors.ts';
import { centreFromName } from './frames.ts';
import type { Oem, OemSegment } from './odm-types.ts';

export interface OemEphemerisOptions {
  /** The body the file tabulates; by default read from OBJECT_NAME when it is a centre name the
   * propagator knows (e.g. `MOON`). */
  target?: BodyName;
  /** Interpolation when a segment names none. @defaultValue 'lagrange' */
  defaultInterpolation?: TabulatedInterpolation;
  /** Degree when a segment names none. @defaultValue 7 (Lagrange) or 5 (Hermite) */
  defaultDegree?: number;
  /** Name of the source in errors, reports and cache keys (make it unique per file, e.g. with its SHA-256).
   * @defaultValue `OEM <OBJECT_NAME> (<ORIGINATOR>, <CREATION_DATE>)` */
  name?: string;
}

export const OEM_EPHEMERIS_DEFAULTS = Object.freeze({ defaultInterpolation: 'lagrange' as TabulatedInterpolation });

interface SegmentSource {
  span: TdbSpan;
  table: TabulatedEphemeris;
}

/** How a segment is interpolated, from its metadata and the defaults. */
export function segmentInterpolation(segment: OemSegment, options: OemEphemerisOptions = {}):
  { interpolation: TabulatedInterpolation; degree: number } {
  const m = segment.metadata;
  if (m.interpolation === 'LINEAR') return { interpolation: 'lagrange', degree: 1 };
  const interpolation: TabulatedInterpolation = m.interpolation === 'HERMITE' ? 'hermite'
    : m.interpolation === 'LAGRANGE' ? 'lagrange' : options.defaultInterpolation ?? OEM_EPHEMERIS_DEFAULTS.defaultInterpolation;
  const fallback = options.defaultDegree ?? (interpolation === 'hermite' ? 5 : 7);
  const degree = m.interpolation && m.interpolationDegree !== undefined ? m.interpolationDegree : fallback;
  return { interpolation, degree: interpolation === 'hermite' && degree % 2 === 0 ? degree + 1 : degree };
}

function segmentSource(segment: OemSegment, target: BodyName, name: string, options: OemEphemerisOptions): SegmentSource {
  const m = segment.metadata;
  const { interpolation, degree } = segmentInterpolation(segment, options);
  const needed = interpolation === 'hermite' ? (degree + 1) / 2 : degree + 1;
  if (segment.states.length < needed) {
    throw new CcsdsFormatError('INTERPOLATION_DEGREE', segment.states[0]?.line ?? 0, `segment of ${m.objectName} has `
      + `${segment.states.length} states; ${interpolation} of degree ${degree} needs ${needed}`);
  }
  // Every frame a message may name is J2000 equatorial (ccsds/frames.ts): no rotation.
  const records = segment.states.map((s) => ({ epochTdbS: s.epochTdbS, positionKm: s.positionKm, velocityKmS: s.velocityKmS }));
  const table = createTabulatedEphemeris({ name, target, centre: m.centre, records, interpolation, degree });
  const first = records[0].epochTdbS;
  const last = records[records.length - 1].epochTdbS;
  const span = {
    startTdbS: Math.max(first, m.useableStartTdbS ?? first),
    endTdbS: Math.min(last, m.useableStopTdbS ?? last),
  };
  return { span, table };
}

class OemEphemeris implements Ephemeris {
  readonly name: string;
  readonly span: TdbSpan;
  readonly bodies: readonly BodyName[];
  readonly target: BodyName;
  readonly centre: BodyName;
  private readonly sources: SegmentSource[];

  constructor(sources: SegmentSource[], name: string, target: BodyName, centre: BodyName) {
    this.sources = sources;
    this.name = name;
    this.target = target;
    this.centre = centre;
    this.bodies = Object.freeze([target, centre]);
    this.span = Object.freeze({
      startTdbS: Math.min(...sources.map((s) => s.span.startTdbS)),
      endTdbS: Math.max(...sources.map((s) => s.span.endTdbS)),
    });
  }

  /** The segment covering `t`; the later one where two meet (a maneuver boundary starts the new arc). */
  private sourceAt(t: number): SegmentSource {
    assertInSpan(this.name, this.span, t);
    for (let i = this.sources.length - 1; i >= 0; i--) {
      const s = this.sources[i];
      if (t >= s.span.startTdbS && t <= s.span.endTdbS) return s;
    }
    throw new OutOfSpanError('epochTdbS', `epoch ${t} TDB s from J2000 falls in a gap between the segments of `
      + `${this.name} (no extrapolation)`);
  }

  stateInto(target: BodyName, centre: BodyName, epochTdbS: number, out: Float64Array, offset = 0): void {
    assertBody(this.name, this.bodies, target, 'target');
    assertBody(this.name, this.bodies, centre, 'centre');
    this.sourceAt(epochTdbS).table.stateInto(target, centre, epochTdbS, out, offset);
  }

  positionInto(target: BodyName, centre: BodyName, epochTdbS: number, out: Float64Array, offset = 0): void {
    assertBody(this.name, this.bodies, target, 'target');
    assertBody(this.name, this.bodies, centre, 'centre');
    this.sourceAt(epochTdbS).table.positionInto(target, centre, epochTdbS, out, offset);
  }
}

function commonCentre(oem: Oem): BodyName {
  const centre = oem.segments[0].metadata.centre;
  const other = oem.segments.find((s) => s.metadata.centre !== centre);
  if (other) {
    throw new InvalidInputError('CENTER_NAME', `segments are relative to different centres `
      + `(${oem.segments[0].metadata.centerName}, ${other.metadata.centerName}); one ephemeris needs one centre`);
  }
  return centre;
}

/**
 * An Ephemeris over an OEM that tabulates a body (for example the Moon relative to the Earth), usable
 * as a perturbing body's source (combine with layerEphemerides for other bodies). Answers the
 * (target, centre) pair either way round; J2000 equatorial, km, km/s, TDB s from J2000.
 */
export function oemToEphemeris(oem: Oem, options: OemEphemerisOptions = {}): TabulatedEphemeris {
  const centre = commonCentre(oem);
  let target = options.target;
  if (!target) {
    const objectName = oem.segments[0].metadata.objectName;
    try {
      target = centreFromName(0, objectName);
    } catch {
      throw new InvalidInputError('target', `OBJECT_NAME '${objectName}' is not a body the propagator knows; `
        + 'name the target body explicitly');
    }
  }
  const name = options.name ?? `OEM ${oem.segments[0].metadata.objectName} (${oem.header.originator}, ${oem.header.creationDate})`;
  const sources = oem.segments.map((s) => segmentSource(s, target!, name, options));
  return new OemEphemeris(sources, name, target, centre);
}

/** A tabulated spacecraft trajectory (a reference to compare a plan against). */
export interface OemTrajectory {
  readonly name: string;
  readonly span: TdbSpan;
  readonly centre: BodyName;
  /** Interpolated state at `epochTdbS` (TDB s from J2000), J2000 equatorial, relative to `centre`;
   * OutOfSpanError outside the useable span. */
  stateAt(epochTdbS: number): StateVector;
}

/** Reads an OEM of a spacecraft as an interpolated trajectory. */
export function oemToTrajectory(oem: Oem, options: Omit<OemEphemerisOptions, 'target'> = {}): OemTrajectory {
  const centre = commonCentre(oem);
  // The tabulated source is keyed by body: the spacecraft rides under a stand-in body name that is never
  // exposed (any body other than the centre will do).
  const standIn: BodyName = centre === 'sun' ? 'mercury' : 'sun';
  const ephemeris = oemToEphemeris(oem, { ...options, target: standIn });
  const name = `OEM trajectory of ${oem.segments[0].metadata.objectName}`;
  const out = new Float64Array(6);
  return {
    name,
    span: ephemeris.span,
    centre,
    stateAt(epochTdbS: number): StateVector {
      ephemeris.stateInto(standIn, centre, epochTdbS, out);
      return {
        epochTdbS, centre, frame: 'J2000_EQUATORIAL',
        positionKm: [out[0], out[1], out[2]], velocityKmS: [out[3], out[4], out[5]],
      };
    },
  };
}
