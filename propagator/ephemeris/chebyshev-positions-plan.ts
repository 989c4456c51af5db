/**
 * The Chebyshev cache's batch look-up: positions of a fixed list of bodies relative to one centre at an
 * epoch, in one call. Work shared between bodies, which one-body look-ups repeat:
 * - every series needed (targets, centre and their parents) is evaluated once per epoch;
 * - series on the same segment grid share the segment search and the basis T_0..T_{n-1}(x);
 * - bodies, parents and signs are resolved when the plan is made, so the hot path reads typed arrays and
 *   checks only the epoch (OutOfSpanError outside the span).
 * A target is summed over its parent chain up to the common ancestor with the centre (the Moon from the
 * Earth is its own series, never a difference of two heliocentric vectors).
 */
import type { BodyName } from '../types.ts';
import { BODY_NAMES } from '../types.ts';
import type { BodyPositionsPlan, TdbSpan } from './ephemeris.ts';
import { assertBody, assertInSpan } from './ephemeris-checks.ts';

/** What the plan reads from the cache: per body (index in BODY_NAMES) its parent and fitted segments. */
export interface ChebyshevTables {
  readonly name: string;
  readonly span: TdbSpan;
  readonly bodies: readonly BodyName[];
  /** Coefficients per series (degree + 1). */
  readonly n: number;
  /** Parent body index, -1 for the origin (and bodies not cached). */
  readonly parentIndex: Int8Array;
  readonly segmentS: Float64Array;
  readonly segmentCount: Int32Array;
  /** Position series use only this many leading coefficients (the rest are zero). */
  readonly positionTerms: Int32Array;
  /** All bodies' position coefficients in one array; body b's block starts at positionBase[b] and is laid
   * [segment][coefficient j < positionTerms][x, y, z] — the order the batch evaluation reads them in. */
  readonly positionCoefs: Float64Array;
  readonly positionBase: Int32Array;
}

/** Body indices from `b` up to (excluding) the origin. */
function chain(tables: ChebyshevTables, b: number): number[] {
  const out: number[] = [];
  for (let i = b; tables.parentIndex[i] >= 0; i = tables.parentIndex[i]) out.push(i);
  return out;
}

export class ChebyshevPositionsPlan implements BodyPositionsPlan {
  readonly targets: readonly BodyName[];
  readonly centre: BodyName;
  private readonly name: string;
  private readonly span: TdbSpan;
  private readonly startTdbS: number;
  private readonly endTdbS: number;
  private readonly n: number;
  // Grids (distinct segment length and count): one basis each per epoch.
  private readonly gridSegmentS: Float64Array;
  private readonly gridLast: Int32Array;
  private readonly gridBasis: Float64Array;
  private readonly gridSegment: Int32Array;
  // Series evaluated per epoch: grid, coefficient table; results relative to the parent, 3 per series.
  private readonly seriesGrid: Int32Array;
  private readonly seriesTerms: Int32Array;
  private readonly coefs: Float64Array;
  private readonly seriesBase: Int32Array;
  /** Coefficients per segment block (3 × terms). */
  private readonly seriesStride: Int32Array;
  private readonly seriesPosition: Float64Array;
  // Per target: terms [termStart[i], termStart[i+1]) of (series, sign).
  private readonly termStart: Int32Array;
  private readonly termSeries: Int32Array;
  private readonly termSign: Float64Array;

  constructor(tables: ChebyshevTables, targets: readonly BodyName[], centre: BodyName) {
    assertBody(tables.name, tables.bodies, centre, 'centre');
    targets.forEach((t, i) => assertBody(tables.name, tables.bodies, t, `targets[${i}]`));
    this.targets = targets;
    this.centre = centre;
    this.name = tables.name;
    this.span = tables.span;
    this.startTdbS = tables.span.startTdbS;
    this.endTdbS = tables.span.endTdbS;
    this.n = tables.n;
    const seriesBodies: number[] = [];
    const slotOf = (b: number): number => {
      const k = seriesBodies.indexOf(b);
      if (k >= 0) return k;
      seriesBodies.push(b);
      return seriesBodies.length - 1;
    };
    const centreChain = chain(tables, BODY_NAMES.indexOf(centre));
    const starts = [0];
    const slots: number[] = [];
    const signs: number[] = [];
    for (const target of targets) {
      const targetChain = chain(tables, BODY_NAMES.indexOf(target));
      // Drop the shared tail (common ancestors): those series cancel exactly.
      let shared = 0;
      while (shared < targetChain.length && shared < centreChain.length
        && targetChain[targetChain.length - 1 - shared] === centreChain[centreChain.length - 1 - shared]) shared++;
      for (const b of targetChain.slice(0, targetChain.length - shared)) {
        slots.push(slotOf(b));
        signs.push(1);
      }
      for (const b of centreChain.slice(0, centreChain.length - shared)) {
        slots.push(slotOf(b));
        signs.push(-1);
      }
      starts.push(slots.length);
    }
    this.termStart = Int32Array.from(starts);
    this.termSeries = Int32Array.from(slots);
    this.termSign = Float64Array.from(signs);
    const grids: Array<{ segmentS: number; count: number }> = [];
    this.seriesGrid = Int32Array.from(seriesBodies.map((b) => {
      const segmentS = tables.segmentS[b];
      const count = tables.segmentCount[b];
      let g = grids.findIndex((x) => x.segmentS === segmentS && x.count === count);
      if (g < 0) g = grids.push({ segmentS, count }) - 1;
      return g;
    }));
    this.coefs = tables.positionCoefs;
    this.seriesBase = Int32Array.from(seriesBodies.map((b) => tables.positionBase[b]));
    this.seriesTerms = Int32Array.from(seriesBodies.map((b) => tables.positionTerms[b]));
    this.seriesStride = Int32Array.from(seriesBodies.map((b) => 3 * tables.positionTerms[b]));
    this.seriesPosition = new Float64Array(3 * seriesBodies.length);
    this.gridSegmentS = Float64Array.from(grids.map((g) => g.segmentS));
    this.gridLast = Int32Array.from(grids.map((g) => g.count - 1));
    this.gridBasis = new Float64Array(grids.length * this.n);
    this.gridSegment = new Int32Array(grids.length);
  }

  // Kept whole (~90 lines): the per-evaluation hot path of every force model; one pass, no calls or allocation.
  positionsInto(epochTdbS: number, out: Float64Array, offset = 0): void {
    if (!(epochTdbS >= this.startTdbS && epochTdbS <= this.endTdbS)) assertInSpan(this.name, this.span, epochTdbS);
    const n = this.n;
    const basis = this.gridBasis;
    const segment = this.gridSegment;
    const gridSegmentS = this.gridSegmentS;
    const gridLast = this.gridLast;
    const elapsed = epochTdbS - this.startTdbS;
    // One basis T_0..T_{n-1}(x) per grid; the recurrence runs in registers.
    for (let g = 0; g < gridSegmentS.length; g++) {
      const u = elapsed / gridSegmentS[g];
      let seg = Math.floor(u);
      if (seg > gridLast[g]) seg = gridLast[g];
      if (seg < 0) seg = 0;
      segment[g] = seg;
      const x = 2 * (u - seg) - 1;
      const x2 = 2 * x;
      const o = g * n;
      let previous = 1;
      let current = x;
      basis[o] = previous;
      basis[o + 1] = current;
      for (let j = 2; j < n; j++) {
        const next = x2 * current - previous;
        basis[o + j] = next;
        previous = current;
        current = next;
      }
    }
    const grid = this.seriesGrid;
    const k = this.coefs;
    const seriesBase = this.seriesBase;
    const stride = this.seriesStride;
    const pos = this.seriesPosition;
    const terms = this.seriesTerms;
    for (let s = 0; s < grid.length; s++) {
      const g = grid[s];
      const m = terms[s];
      const o = g * n;
      let c = seriesBase[s] + segment[g] * stride[s];
      // Even and odd terms summed apart: six independent sums instead of three long chains.
      let ex = 0;
      let ey = 0;
      let ez = 0;
      let ox = 0;
      let oy = 0;
      let oz = 0;
      let j = 0;
      for (; j + 1 < m; j += 2, c += 6) {
        const t0 = basis[o + j];
        const t1 = basis[o + j + 1];
        ex += k[c] * t0;
        ey += k[c + 1] * t0;
        ez += k[c + 2] * t0;
        ox += k[c + 3] * t1;
        oy += k[c + 4] * t1;
        oz += k[c + 5] * t1;
      }
      if (j < m) {
        const t0 = basis[o + j];
        ex += k[c] * t0;
        ey += k[c + 1] * t0;
        ez += k[c + 2] * t0;
      }
      pos[3 * s] = ex + ox;
      pos[3 * s + 1] = ey + oy;
      pos[3 * s + 2] = ez + oz;
    }
    const termStart = this.termStart;
    const termSeries = this.termSeries;
    const termSign = this.termSign;
    for (let i = 0, o = offset; i < termStart.length - 1; i++, o += 3) {
      let x = 0;
      let y = 0;
      let z = 0;
      for (let m = termStart[i]; m < termStart[i + 1]; m++) {
        const p = 3 * termSeries[m];
        const sign = termSign[m];
        x += sign * pos[p];
        y += sign * pos[p + 1];
        z += sign * pos[p + 2];
      }
      out[o] = x;
      out[o + 1] = y;
      out[o + 2] = z;
    }
  }
}
