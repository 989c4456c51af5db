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
import { BODY_NAMES } from '../types.ts';
import type { BodyPositionsPlan, Ephemeris, TdbSpan } from './ephemeris.ts';
import { assertBody, assertInSpan, assertValidSpan } from './ephemeris-checks.ts';
import {
  chebyshevCoefficientsInto, chebyshevDerivativeInto, chebyshevEvaluate, chebyshevNodes, truncatedLength,
} from './chebyshev-fit.ts';
import { ChebyshevPositionsPlan, type ChebyshevTables } from './chebyshev-positions-plan.ts';

/** Index in BODY_NAMES by name (a keyed load instead of a string search per look-up); no prototype, so a
 * name like 'toString' finds nothing. */
const BODY_INDEX: Readonly<Record<string, number | undefined>> = Object.freeze(
  Object.assign(Object.create(null) as Record<string, number>, Object.fromEntries(BODY_NAMES.map((b, i) => [b, i]))));

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
/** Fewer than this many halvings and the source is not smooth enough to cache. */
const MAX_HALVINGS = 12;
/** Share of the tolerance that dropping negligible trailing position coefficients may use (the rest is
 * left for the fit error itself); the measured error after dropping is what fitReport() gives. */
const TRUNCATION_SHARE = 0.25;

/** The fitted series of one body relative to its parent. */
interface BodySeries {
  parent: BodyName;
  segmentS: number;
  segments: number;
  /** [segment][component 0..5][coefficient] — x, y, z, vx, vy, vz. */
  coefs: Float64Array;
  /** Position series use only the first `positionTerms` coefficients (the rest are zero). */
  positionTerms: number;
  /** Largest position / velocity difference from the source seen at the check points. */
  maxErrorKm: number;
  maxErrorKmS: number;
}

/** Fit quality per body, as measured against the source while building. */
export interface ChebyshevFitReport {
  body: BodyName;
  parent: BodyName;
  segmentS: number;
  segments: number;
  /** Coefficients the position series keep after dropping negligible trailing terms (of `coefficients`). */
  positionTerms: number;
  maxErrorKm: number;
  maxErrorKmS: number;
}

/** Writes the six series of one segment [a, a + step] into coefs[base..base + 6n): positions fitted at the
 * nodes, velocities fitted too (stateInto) or taken as the positions' derivative (positionInto only). */
function fitSegment(source: Ephemeris, body: BodyName, parent: BodyName, a: number, step: number, nodes: Float64Array,
  velocityFromPositions: boolean, samples: Float64Array, column: Float64Array, coefs: Float64Array, base: number): void {
  const n = nodes.length;
  for (let k = 0; k < n; k++) {
    const t = a + (nodes[k] + 1) * 0.5 * step;
    if (velocityFromPositions) source.positionInto(body, parent, t, samples, 6 * k);
    else source.stateInto(body, parent, t, samples, 6 * k);
  }
  for (let c = 0; c < (velocityFromPositions ? 3 : 6); c++) {
    for (let k = 0; k < n; k++) column[k] = samples[6 * k + c];
    chebyshevCoefficientsInto(column, n, coefs, base + c * n);
  }
  if (velocityFromPositions) {
    for (let c = 0; c < 3; c++) chebyshevDerivativeInto(coefs, base + c * n, n, 2 / step, coefs, base + (c + 3) * n);
  }
}

function fitBody(
  source: Ephemeris, body: BodyName, parent: BodyName, span: TdbSpan, n: number,
  toleranceKm: number, firstSegmentS: number, velocityFromPositions: boolean,
): BodySeries {
  const nodes = chebyshevNodes(n);
  const length = span.endTdbS - span.startTdbS;
  const samples = new Float64Array(6 * n);
  const column = new Float64Array(n);
  const probe = new Float64Array(6);
  const checkX = [-1, -0.97, -0.5 * (nodes[n - 1] + nodes[n - 2]), 0.013, 0.5 * (nodes[0] + nodes[1]), 1];
  let segmentS = Math.min(firstSegmentS, length);
  for (let attempt = 0; attempt <= MAX_HALVINGS; attempt++) {
    const segments = Math.max(1, Math.ceil(length / segmentS - 1e-9));
    const step = length / segments;
    const coefs = new Float64Array(segments * 6 * n);
    const probes = new Float64Array(segments * checkX.length * 3);
    let maxErrorKm = 0;
    let maxErrorKmS = 0;
    let failed = false;
    for (let s = 0; s < segments && !failed; s++) {
      const a = span.startTdbS + s * step;
      fitSegment(source, body, parent, a, step, nodes, velocityFromPositions, samples, column, coefs, s * 6 * n);
      // Check between nodes, where the interpolation error peaks, and at both ends.
      for (let i = 0; i < checkX.length; i++) {
        const x = checkX[i];
        // Velocities from the positions' derivative are checked at one point near an end, where that
        // derivative is least accurate (one state look-up per segment instead of six).
        const withVelocity = !velocityFromPositions || i === 1;
        if (withVelocity) source.stateInto(body, parent, a + (x + 1) * 0.5 * step, probe, 0);
        else source.positionInto(body, parent, a + (x + 1) * 0.5 * step, probe, 0);
        probes.set(probe.subarray(0, 3), (s * checkX.length + i) * 3);
        let dp = 0;
        let dv = 0;
        for (let c = 0; c < 3; c++) {
          dp = Math.max(dp, Math.abs(chebyshevEvaluate(coefs, (s * 6 + c) * n, n, x) - probe[c]));
          if (withVelocity) dv = Math.max(dv, Math.abs(chebyshevEvaluate(coefs, (s * 6 + c + 3) * n, n, x) - probe[c + 3]));
        }
        maxErrorKm = Math.max(maxErrorKm, dp);
        maxErrorKmS = Math.max(maxErrorKmS, dv);
      }
      if (maxErrorKm > toleranceKm) failed = true;
    }
    if (!failed) {
      const positionTerms = dropNegligibleTerms(coefs, segments, n, Math.min(TRUNCATION_SHARE * toleranceKm, toleranceKm - maxErrorKm));
      // Measure again at the same check points with the shortened series (no new source calls).
      let truncatedErrorKm = 0;
      for (let seg = 0; seg < segments; seg++) {
        for (let i = 0; i < checkX.length; i++) {
          for (let c = 0; c < 3; c++) {
            const v = chebyshevEvaluate(coefs, (seg * 6 + c) * n, positionTerms, checkX[i]);
            truncatedErrorKm = Math.max(truncatedErrorKm, Math.abs(v - probes[(seg * checkX.length + i) * 3 + c]));
          }
        }
      }
      return { parent, segmentS: step, segments, coefs, positionTerms, maxErrorKm: truncatedErrorKm, maxErrorKmS };
    }
    segmentS = step / 2;
  }
  throw new InvalidInputError('toleranceKm', `cannot fit ${body} relative to ${parent} from ${source.name} `
    + `within ${toleranceKm} km with ${n} coefficients (source not smooth enough or tolerance too tight)`);
}

/** Zeroes trailing position coefficients whose sum of magnitudes stays within `budgetKm` in every segment
 * (they are at the source's noise level); returns how many position terms remain. */
function dropNegligibleTerms(coefs: Float64Array, segments: number, n: number, budgetKm: number): number {
  const offsets: number[] = [];
  for (let s = 0; s < segments; s++) for (let c = 0; c < 3; c++) offsets.push((s * 6 + c) * n);
  const m = budgetKm > 0 ? truncatedLength(coefs, offsets, n, budgetKm) : n;
  for (const o of offsets) coefs.fill(0, o + m, o + n);
  return m;
}

/** Every body's position coefficients in one array, each body's block laid [segment][j < positionTerms]
 * [x, y, z] (read front to back by the batch look-up); `base` receives each block's start. */
function flatPositions(series: Partial<Record<BodyName, BodySeries>>, n: number, base: Int32Array): Float64Array {
  let total = 0;
  BODY_NAMES.forEach((body, i) => {
    const s = series[body];
    base[i] = total;
    if (s) total += s.segments * s.positionTerms * 3;
  });
  const out = new Float64Array(total);
  BODY_NAMES.forEach((body, i) => {
    const s = series[body];
    if (!s) return;
    const m = s.positionTerms;
    for (let seg = 0; seg < s.segments; seg++) {
      for (let j = 0; j < m; j++) {
        for (let c = 0; c < 3; c++) out[base[i] + (seg * m + j) * 3 + c] = s.coefs[(seg * 6 + c) * n + j];
      }
    }
  });
  return out;
}

class ChebyshevEphemeris implements Ephemeris {
  readonly name: string;
  readonly span: TdbSpan;
  readonly bodies: readonly BodyName[];
  private readonly n: number;
  private readonly series: Partial<Record<BodyName, BodySeries>>;
  private readonly tValues: Float64Array;
  // Flat per-body tables indexed by position in BODY_NAMES: the hot path reads typed arrays only.
  private readonly present = new Uint8Array(BODY_NAMES.length);
  private readonly parentIndex = new Int8Array(BODY_NAMES.length).fill(-1);
  private readonly segmentS = new Float64Array(BODY_NAMES.length);
  private readonly segmentCount = new Int32Array(BODY_NAMES.length);
  private readonly positionTerms = new Int32Array(BODY_NAMES.length);
  private readonly coefs: Float64Array[] = [];
  /** Position coefficients of all bodies re-laid in one array for the batch look-up (ChebyshevPositionsPlan):
   * body i from positionBase[i], [segment][j][x, y, z]. */
  private readonly positionCoefs: Float64Array;
  private readonly positionBase = new Int32Array(BODY_NAMES.length);
  private readonly startTdbS: number;
  private readonly endTdbS: number;
  // Last evaluation per body (state relative to its parent) and the epoch and components it holds.
  private readonly memo = new Float64Array(6 * BODY_NAMES.length);
  private readonly memoEpoch = new Float64Array(BODY_NAMES.length).fill(Number.NaN);
  private readonly memoComponents = new Int8Array(BODY_NAMES.length);

  constructor(name: string, span: TdbSpan, bodies: readonly BodyName[], n: number,
    series: Partial<Record<BodyName, BodySeries>>) {
    this.name = name;
    this.span = span;
    this.startTdbS = span.startTdbS;
    this.endTdbS = span.endTdbS;
    this.bodies = bodies;
    this.n = n;
    this.series = series;
    this.tValues = new Float64Array(n);
    BODY_NAMES.forEach((body, i) => {
      this.present[i] = bodies.includes(body) ? 1 : 0;
      const s = series[body];
      this.coefs.push(s ? s.coefs : new Float64Array(0));
      if (s) {
        this.parentIndex[i] = BODY_NAMES.indexOf(s.parent);
        this.segmentS[i] = s.segmentS;
        this.segmentCount[i] = s.segments;
        this.positionTerms[i] = s.positionTerms;
      }
    });
    this.positionCoefs = flatPositions(series, n, this.positionBase);
  }

  /** Batch look-up of `targets` relative to `centre` (see ChebyshevPositionsPlan); bodies checked now. */
  planPositions(targets: readonly BodyName[], centre: BodyName): BodyPositionsPlan {
    const tables: ChebyshevTables = {
      name: this.name, span: this.span, bodies: this.bodies, n: this.n, parentIndex: this.parentIndex,
      segmentS: this.segmentS, segmentCount: this.segmentCount, positionTerms: this.positionTerms,
      positionCoefs: this.positionCoefs, positionBase: this.positionBase,
    };
    return new ChebyshevPositionsPlan(tables, targets, centre);
  }

  fitReport(): ChebyshevFitReport[] {
    return Object.entries(this.series).map(([body, s]) => ({
      body: body as BodyName, parent: s.parent, segmentS: s.segmentS, segments: s.segments, positionTerms: s.positionTerms,
      maxErrorKm: s.maxErrorKm, maxErrorKmS: s.maxErrorKmS,
    }));
  }

  private lookUp(target: BodyName, centre: BodyName, epochTdbS: number, out: Float64Array, offset: number,
    components: number): void {
    const ti = BODY_INDEX[target] ?? -1;
    const ci = BODY_INDEX[centre] ?? -1;
    if (ti < 0 || this.present[ti] === 0) assertBody(this.name, this.bodies, target, 'target');
    if (ci < 0 || this.present[ci] === 0) assertBody(this.name, this.bodies, centre, 'centre');
    if (!(epochTdbS >= this.startTdbS && epochTdbS <= this.endTdbS)) assertInSpan(this.name, this.span, epochTdbS);
    for (let c = 0; c < components; c++) out[offset + c] = 0;
    if (ti === ci) return;
    // Direct series when one body is the other's parent (Moon–Earth): no large terms to cancel.
    if (this.parentIndex[ti] === ci) {
      this.accumulateOne(ti, epochTdbS, out, offset, 1, components);
    } else if (this.parentIndex[ci] === ti) {
      this.accumulateOne(ci, epochTdbS, out, offset, -1, components);
    } else {
      for (let b = ti; this.parentIndex[b] >= 0; b = this.parentIndex[b]) {
        this.accumulateOne(b, epochTdbS, out, offset, 1, components);
      }
      for (let b = ci; this.parentIndex[b] >= 0; b = this.parentIndex[b]) {
        this.accumulateOne(b, epochTdbS, out, offset, -1, components);
      }
    }
  }

  /** Adds sign × (state of body `b` relative to its parent) into out[offset..]. The last evaluation of
   * each body is remembered: a force model asks for every perturber relative to the same centre at one
   * epoch, so the centre's series is evaluated once per epoch rather than once per perturber. */
  private accumulateOne(b: number, epochTdbS: number, out: Float64Array, offset: number, sign: number,
    components: number): void {
    const m = this.memo;
    const mb = 6 * b;
    if (this.memoEpoch[b] !== epochTdbS || this.memoComponents[b] < components) {
      this.evaluate(b, epochTdbS, components, m, mb);
      this.memoEpoch[b] = epochTdbS;
      this.memoComponents[b] = components;
    }
    for (let c = 0; c < components; c++) out[offset + c] += sign * m[mb + c];
  }

  /** Writes the state (components 3 or 6) of body `b` relative to its parent into out[offset..]. Chebyshev
   * polynomial values are computed once and shared; components are summed side by side in one pass
   * (independent sums pipeline better than one loop per component). */
  private evaluate(b: number, epochTdbS: number, components: number, out: Float64Array, offset: number): void {
    const n = this.n;
    const u = (epochTdbS - this.startTdbS) / this.segmentS[b];
    let seg = Math.floor(u);
    const last = this.segmentCount[b] - 1;
    if (seg > last) seg = last;
    if (seg < 0) seg = 0;
    const x = 2 * (u - seg) - 1;
    const t = this.tValues;
    t[0] = 1;
    t[1] = x;
    const x2 = 2 * x;
    for (let j = 2; j < n; j++) t[j] = x2 * t[j - 1] - t[j - 2];
    const k = this.coefs[b];
    const b0 = seg * 6 * n;
    let s0 = 0;
    let s1 = 0;
    let s2 = 0;
    const m = this.positionTerms[b];
    for (let j = 0; j < m; j++) {
      const tj = t[j];
      s0 += k[b0 + j] * tj;
      s1 += k[b0 + n + j] * tj;
      s2 += k[b0 + 2 * n + j] * tj;
    }
    out[offset] = s0;
    out[offset + 1] = s1;
    out[offset + 2] = s2;
    if (components === 3) return;
    let s3 = 0;
    let s4 = 0;
    let s5 = 0;
    for (let j = 0; j < n; j++) {
      const tj = t[j];
      s3 += k[b0 + 3 * n + j] * tj;
      s4 += k[b0 + 4 * n + j] * tj;
      s5 += k[b0 + 5 * n + j] * tj;
    }
    out[offset + 3] = s3;
    out[offset + 4] = s4;
    out[offset + 5] = s5;
  }

  stateInto(target: BodyName, centre: BodyName, epochTdbS: number, out: Float64Array, offset = 0): void {
    this.lookUp(target, centre, epochTdbS, out, offset, 6);
  }

  positionInto(target: BodyName, centre: BodyName, epochTdbS: number, out: Float64Array, offset = 0): void {
    this.lookUp(target, centre, epochTdbS, out, offset, 3);
  }
}

/** A Chebyshev cache: an Ephemeris plus the fit quality measured while building it. */
export type ChebyshevEphemerisCache = Ephemeris & { fitReport(): ChebyshevFitReport[] };

/**
 * Builds a Chebyshev-interpolated cache of `source` over [startTdbS, endTdbS] (TDB s from J2000) for the
 * given bodies; states in the source's frame (J2000 equatorial), km and km/s. Fit error at check points
 * is kept within `toleranceKm` (default 5 cm) and reported by `fitReport()`. Look-ups outside the span
 * throw OutOfSpanError. Building calls the source about (2 + 6/14) × coefficients times per segment.
 */
/**
 * Position noise (km) a source shows because it takes time as float64 days: its time resolution is one
 * ulp of the day count, which coarsens away from J2000 (about 1.6e-7 s in 2031, 1.3e-6 s near 2196).
 * Bounded by twice a generous relative speed times that resolution: 1.1 km/s for the Moon about the
 * Earth, 100 km/s for anything else (Mercury about the Sun peaks near 59 km/s). Only used for the
 * default tolerance, so a caller's explicit `toleranceKm` is never loosened.
 */
function sourceTimeNoiseKm(body: BodyName, parent: BodyName, span: TdbSpan): number {
  const farthestDays = Math.max(Math.abs(span.startTdbS), Math.abs(span.endTdbS)) / 86400;
  const ulpDays = 2 ** (Math.floor(Math.log2(Math.max(farthestDays, 1))) - 52);
  const speedKmS = body === 'moon' && parent === 'earth' ? 1.1 : 100;
  return 2 * speedKmS * ulpDays * 86400;
}

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
