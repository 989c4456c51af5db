/**
 * A Chebyshev-interpolated cache over a span, built from any Ephemeris source.
 *
 * Each body is stored relative to a parent (the Moon relative to the Earth, everything else relative to
 * the origin body, the Sun by default) as uniform segments of Chebyshev series for position and,
 * separately, velocity. Segment lengths start from a per-body guess and are halved until the fit
 * matches the source within `toleranceKm` at check points between the nodes (so the stated error is
 * measured, not assumed). Look-ups index the segment directly and evaluate by Clenshaw: no allocation.
 */
import { InvalidInputError } from '../../contract/errors.ts';
import type { BodyName } from '../types.ts';
import type { Ephemeris, TdbSpan } from './ephemeris.ts';
import { assertBody, assertInSpan, assertValidSpan } from './ephemeris-checks.ts';
import { fitBody, sourceTimeNoiseKm, type BodySeries, type ChebyshevFitReport } from './chebyshev-body-fit.ts';
import { ChebyshevEphemeris } from './chebyshev-lookup.ts';

export type { ChebyshevFitReport } from './chebyshev-body-fit.ts';

/** Options of {@link buildChebyshevEphemeris}. */
export interface ChebyshevEphemerisOptions {
  /** Bodies the cache must answer for (as target or centre). The origin is added. */
  bodies: readonly BodyName[];
  /** Start of the cached span, TDB s from J2000 (inside the source's span). */
  startTdbS: number;
  /** End of the cached span, TDB s from J2000 (inside the source's span). */
  endTdbS: number;
  /** Body everything is stored relative to (except the Moon, stored relative to the Earth when both are
   * present). @defaultValue 'sun' */
  origin?: BodyName;
  /** Largest position difference from the source allowed at the check points, km.
   * @defaultValue 5e-5 (5 cm; the built-in source itself is only smooth to ~1 cm near today because it
   * takes time as float64 days, ~2e-7 s resolution). Far from J2000 the default rises with that
   * resolution (to ~25 cm for planets near 2200, still under 1 m; the Moon about the Earth stays near
   * 5 cm); an explicit value is used as given. */
  toleranceKm?: number;
  /** How the velocity series are made: 'fitted' to the source's velocities at the nodes (stateInto), or
   * 'from-positions', the derivative of the position series (positionInto only: about half the source's
   * work for the planets and a third for the Moon, whose source velocity is itself a numerical derivative);
   * then fitReport's velocity error is measured at one point per segment near its start.
   * @defaultValue 'fitted' */
  velocity?: 'fitted' | 'from-positions';
  /** Coefficients per series (polynomial degree + 1), in [6, 32]. @defaultValue 14 */
  coefficients?: number;
  /** Longest segment tried per body, s; halved until the fit passes. @defaultValue per body (Moon 4 d,
   * and Mercury 4 d, Venus/Earth/Mars 16 d, outer planets 128 d) */
  initialSegmentS?: Partial<Record<BodyName, number>>;
}

export const CHEBYSHEV_DEFAULTS = Object.freeze({
  origin: 'sun' as BodyName,
  toleranceKm: 5e-5,
  coefficients: 14,
});

const DAY_S = 86400;
// Bodies that share a segment length share one Chebyshev basis per epoch in the batch look-up, so the
// guesses form three grids (4, 16 and 128 d): Mercury and Mars use shorter segments than they need
// (fewer terms each) rather than grids of their own — measured ~10-15 % faster per epoch than 8 and 32 d.
const INITIAL_SEGMENT_S: Readonly<Record<BodyName, number>> = Object.freeze({
  sun: 128 * DAY_S, mercury: 4 * DAY_S, venus: 16 * DAY_S, earth: 16 * DAY_S, moon: 4 * DAY_S,
  mars: 16 * DAY_S, jupiter: 128 * DAY_S, saturn: 128 * DAY_S, uranus: 128 * DAY_S, neptune: 128 * DAY_S,
});

/** A Chebyshev cache: an Ephemeris plus the fit quality measured while building it. */
export type ChebyshevEphemerisCache = Ephemeris & { fitReport(): ChebyshevFitReport[] };

/**
 * Builds a Chebyshev-interpolated cache of `source` over [startTdbS, endTdbS] (TDB s from J2000) for the
 * given bodies; states in the source's frame (J2000 equatorial), km and km/s. Fit error at check points
 * is kept within `toleranceKm` (default 5 cm) and reported by `fitReport()`. Look-ups outside the span
 * throw OutOfSpanError. Building calls the source about (2 + 6/14) × coefficients times per segment.
 */
export function buildChebyshevEphemeris(source: Ephemeris, options: ChebyshevEphemerisOptions): ChebyshevEphemerisCache {
  const span: TdbSpan = { startTdbS: options.startTdbS, endTdbS: options.endTdbS };
  assertValidSpan(span, 'startTdbS/endTdbS');
  assertInSpan(source.name, source.span, span.startTdbS, 'startTdbS');
  assertInSpan(source.name, source.span, span.endTdbS, 'endTdbS');
  const origin = options.origin ?? CHEBYSHEV_DEFAULTS.origin;
  const toleranceKm = options.toleranceKm ?? CHEBYSHEV_DEFAULTS.toleranceKm;
  const n = options.coefficients ?? CHEBYSHEV_DEFAULTS.coefficients;
  if (!(toleranceKm > 0) || !Number.isFinite(toleranceKm)) {
    throw new InvalidInputError('toleranceKm', `${toleranceKm} must be a positive finite number of km`);
  }
  if (!Number.isInteger(n) || n < 6 || n > 32) throw new InvalidInputError('coefficients', `${n} is not an integer in [6, 32]`);
  if (!Array.isArray(options.bodies) || options.bodies.length === 0) {
    throw new InvalidInputError('bodies', 'give at least one body to cache');
  }
  const bodies = [...new Set<BodyName>([origin, ...options.bodies])];
  bodies.forEach((b, i) => assertBody(source.name, source.bodies, b, `bodies[${i}]`));
  const series: Partial<Record<BodyName, BodySeries>> = {};
  for (const body of bodies) {
    if (body === origin) continue;
    const parent: BodyName = body === 'moon' && bodies.includes('earth') && origin !== 'earth' ? 'earth' : origin;
    const first = options.initialSegmentS?.[body] ?? INITIAL_SEGMENT_S[body];
    if (!(first > 0)) throw new InvalidInputError(`initialSegmentS.${body}`, `${first} must be a positive number of s`);
    const bodyToleranceKm = options.toleranceKm ?? Math.max(toleranceKm, sourceTimeNoiseKm(body, parent, span));
    series[body] = fitBody(source, body, parent, span, n, bodyToleranceKm, first, options.velocity === 'from-positions');
  }
  const name = `chebyshev cache of ${source.name} over [${span.startTdbS}, ${span.endTdbS}] TDB s`;
  return new ChebyshevEphemeris(name, Object.freeze(span), Object.freeze(bodies), n, series);
}
