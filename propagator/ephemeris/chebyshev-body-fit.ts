/**
 * Fitting one body of a Chebyshev cache: uniform segments of Chebyshev series for position and velocity,
 * halved until the fit matches the source within the tolerance at check points between the nodes, then
 * negligible trailing position terms dropped and the error measured again. Used by buildChebyshevEphemeris.
 */
import { InvalidInputError } from '../../contract/errors.ts';
import type { BodyName } from '../types.ts';
import type { Ephemeris, TdbSpan } from './ephemeris.ts';
import {
  chebyshevCoefficientsInto, chebyshevDerivativeInto, chebyshevEvaluate, chebyshevNodes, truncatedLength,
} from './chebyshev-fit.ts';

/** Fewer than this many halvings and the source is not smooth enough to cache. */
const MAX_HALVINGS = 12;
/** Share of the tolerance that dropping negligible trailing position coefficients may use (the rest is
 * left for the fit error itself); the measured error after dropping is what fitReport() gives. */
const TRUNCATION_SHARE = 0.25;

/** The fitted series of one body relative to its parent. */
export interface BodySeries {
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
/** Fits `body` relative to `parent` over `span` (TDB s from J2000; source frame, km and km/s) with `n`
 * coefficients per series, halving the segment from `firstSegmentS` until the check points agree within
 * `toleranceKm`; throws InvalidInputError when MAX_HALVINGS halvings are not enough. */
export function fitBody(
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

/**
 * Position noise (km) a source shows because it takes time as float64 days: its time resolution is one
 * ulp of the day count, which coarsens away from J2000 (about 1.6e-7 s in 2031, 1.3e-6 s near 2196).
 * Bounded by twice a generous relative speed times that resolution: 1.1 km/s for the Moon about the
 * Earth, 100 km/s for anything else (Mercury about the Sun peaks near 59 km/s). Only used for the
 * default tolerance, so a caller's explicit `toleranceKm` is never loosened.
 */
export function sourceTimeNoiseKm(body: BodyName, parent: BodyName, span: TdbSpan): number {
  const farthestDays = Math.max(Math.abs(span.startTdbS), Math.abs(span.endTdbS)) / 86400;
  const ulpDays = 2 ** (Math.floor(Math.log2(Math.max(farthestDays, 1))) - 52);
  const speedKmS = body === 'moon' && parent === 'earth' ? 1.1 : 100;
  return 2 * speedKmS * ulpDays * 86400;
}
