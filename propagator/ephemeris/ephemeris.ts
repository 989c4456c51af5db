/**
 * The one interface every ephemeris source implements: the built-in astronomy-engine wrapper, the
 * Chebyshev cache built over a span from any source, and tabulated sources (CCSDS OEM files).
 */
import type { BodyName } from '../types.ts';

/** Closed interval of TDB seconds from J2000 over which a source answers. */
export interface TdbSpan {
  startTdbS: number;
  endTdbS: number;
}

/**
 * Positions of a fixed list of bodies relative to one centre, evaluated together at an epoch: what a force
 * model asks for at every evaluation. Bodies are checked once when the plan is made; the epoch is checked
 * on every call (OutOfSpanError outside the source's span).
 */
export interface BodyPositionsPlan {
  readonly targets: readonly BodyName[];
  readonly centre: BodyName;
  /** Writes target i's position (km, J2000 equatorial, from `centre`) at `epochTdbS` (TDB s from J2000)
   * into `out[offset+3i..offset+3i+2]`. Must not allocate on the hot path. */
  positionsInto(epochTdbS: number, out: Float64Array, offset?: number): void;
}

export interface Ephemeris {
  /** Human-readable name of the source, e.g. `astronomy-engine 2.1.19` or `chebyshev cache of ...`. */
  readonly name: string;
  /** Span the source answers for; an epoch outside it throws OutOfSpanError, never extrapolates. */
  readonly span: TdbSpan;
  /** Bodies this source can give (as target or centre). */
  readonly bodies: readonly BodyName[];
  /**
   * Writes the state of `target` relative to `centre` at `epochTdbS` (TDB s from J2000) into
   * `out[offset..offset+5]`: position km, velocity km/s, J2000 equatorial (ICRF-aligned) axes.
   * Must not allocate on the hot path.
   */
  stateInto(target: BodyName, centre: BodyName, epochTdbS: number, out: Float64Array, offset?: number): void;
  /** Position only (km, J2000 equatorial) into `out[offset..offset+2]`; cheaper where the source allows. */
  positionInto(target: BodyName, centre: BodyName, epochTdbS: number, out: Float64Array, offset?: number): void;
  /**
   * Optional: a plan that gives all `targets` relative to `centre` in one call per epoch, for sources
   * that can share work between bodies (the Chebyshev cache). Callers use planBodyPositions(), which
   * falls back to one positionInto per body for sources without it.
   */
  planPositions?(targets: readonly BodyName[], centre: BodyName): BodyPositionsPlan;
}
