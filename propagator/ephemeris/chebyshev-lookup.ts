/**
 * Look-ups in a fitted Chebyshev cache: the segment is indexed directly and each body's series evaluated
 * once per epoch (remembered for the next perturber); no allocation on the hot path.
 */
import type { BodyName } from '../types.ts';
import { BODY_NAMES } from '../types.ts';
import type { BodyPositionsPlan, Ephemeris, TdbSpan } from './ephemeris.ts';
import { assertBody, assertInSpan } from './ephemeris-checks.ts';
import type { BodySeries, ChebyshevFitReport } from './chebyshev-body-fit.ts';
import { ChebyshevPositionsPlan, type ChebyshevTables } from './chebyshev-positions-plan.ts';

/** Index in BODY_NAMES by name (a keyed load instead of a string search per look-up); no prototype, so a
 * name like 'toString' finds nothing. */
const BODY_INDEX: Readonly<Record<string, number | undefined>> = Object.freeze(
  Object.assign(Object.create(null) as Record<string, number>, Object.fromEntries(BODY_NAMES.map((b, i) => [b, i]))));

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

/** An Ephemeris over fitted series (states in the source's frame, km and km/s, TDB s from J2000). */
export class ChebyshevEphemeris implements Ephemeris {
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
  /** Batch plans made so far, by centre and targets (planPositions). */
  private readonly plans = new Map<string, BodyPositionsPlan>();
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

  /** Batch look-up of `targets` relative to `centre` (see ChebyshevPositionsPlan); bodies checked now. One plan
   * per centre and target list, shared by every caller: a plan keeps nothing between look-ups (its buffers are
   * rewritten at each epoch before they are read), and a propagation asks for its plans anew — a Monte Carlo
   * run thousands of times over the same few blocks. */
  planPositions(targets: readonly BodyName[], centre: BodyName): BodyPositionsPlan {
    const key = `${centre}>${targets.join(',')}`;
    let plan = this.plans.get(key);
    if (plan === undefined) {
      const tables: ChebyshevTables = {
        name: this.name, span: this.span, bodies: this.bodies, n: this.n, parentIndex: this.parentIndex,
        segmentS: this.segmentS, segmentCount: this.segmentCount, positionTerms: this.positionTerms,
        positionCoefs: this.positionCoefs, positionBase: this.positionBase,
      };
      plan = new ChebyshevPositionsPlan(tables, targets, centre);
      this.plans.set(key, plan);
    }
    return plan;
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
