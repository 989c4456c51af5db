/**
 * A tabulated source: epoch-sorted state records of one body relative to another (for example read from a
 * CCSDS OEM file), interpolated by Lagrange or Hermite polynomials over a sliding window of records.
 *
 * - Lagrange of degree d uses the d+1 records nearest the epoch, position and velocity interpolated
 *   separately (the usual reading of an OEM's INTERPOLATION = LAGRANGE, INTERPOLATION_DEGREE = d).
 * - Hermite of degree d uses (d+1)/2 records (d odd), matching positions and velocities; the velocity
 *   returned is the derivative of the position polynomial.
 * Epochs outside [first record, last record] throw OutOfSpanError. Look-ups do not allocate.
 */
import { InvalidInputError } from '../../contract/errors.ts';
import type { BodyName, Vec3 } from '../types.ts';
import type { Ephemeris, TdbSpan } from './ephemeris.ts';
import { ComponentEphemeris } from './component-ephemeris.ts';

/** One tabulated state: epoch TDB s from J2000; position km and velocity km/s, J2000 equatorial. */
export interface TabulatedStateRecord {
  epochTdbS: number;
  positionKm: Vec3;
  velocityKmS: Vec3;
}

export type TabulatedInterpolation = 'lagrange' | 'hermite';

/** Options of {@link createTabulatedEphemeris}. */
export interface TabulatedEphemerisOptions {
  /** Name shown in errors and reports, e.g. the file it came from. */
  name: string;
  /** The body the records describe. */
  target: BodyName;
  /** The body the records are relative to. */
  centre: BodyName;
  /** Records with strictly increasing epochs; at least as many as the interpolation needs. */
  records: readonly TabulatedStateRecord[];
  /** @defaultValue 'lagrange' */
  interpolation?: TabulatedInterpolation;
  /** Polynomial degree, [1, 15]; odd for Hermite. @defaultValue 7 (Lagrange) or 5 (Hermite) */
  degree?: number;
}

/** An Ephemeris over one tabulated body; `target` and `centre` say what it stands in for. */
export interface TabulatedEphemeris extends Ephemeris {
  readonly target: BodyName;
  readonly centre: BodyName;
}

function checkRecords(records: readonly TabulatedStateRecord[], needed: number): void {
  if (!Array.isArray(records) || records.length < needed) {
    throw new InvalidInputError('records', `need at least ${needed} records for this interpolation, got `
      + `${Array.isArray(records) ? records.length : 'none'}`);
  }
  records.forEach((r, i) => {
    const values = [r.epochTdbS, ...r.positionKm, ...r.velocityKmS];
    if (r.positionKm.length !== 3 || r.velocityKmS.length !== 3 || !values.every(Number.isFinite)) {
      throw new InvalidInputError(`records[${i}]`, 'epoch, position and velocity must be finite numbers (3 each)');
    }
    if (i > 0 && !(r.epochTdbS > records[i - 1].epochTdbS)) {
      throw new InvalidInputError(`records[${i}].epochTdbS`, `epochs must increase strictly `
        + `(${r.epochTdbS} after ${records[i - 1].epochTdbS})`);
    }
  });
}

class TabulatedSource extends ComponentEphemeris implements TabulatedEphemeris {
  readonly name: string;
  readonly span: TdbSpan;
  readonly bodies: readonly BodyName[];
  readonly target: BodyName;
  readonly centre: BodyName;
  private readonly epochs: Float64Array;
  /** [record][x, y, z, vx, vy, vz]. */
  private readonly states: Float64Array;
  private readonly points: number;
  private readonly hermite: boolean;
  private readonly work = new Float64Array(6);

  constructor(options: TabulatedEphemerisOptions) {
    super();
    const interpolation = options.interpolation ?? 'lagrange';
    if (interpolation !== 'lagrange' && interpolation !== 'hermite') {
      throw new InvalidInputError('interpolation', `'${String(interpolation)}' is not 'lagrange' or 'hermite'`);
    }
    this.hermite = interpolation === 'hermite';
    const degree = options.degree ?? (this.hermite ? 5 : 7);
    if (!Number.isInteger(degree) || degree < 1 || degree > 15 || (this.hermite && degree % 2 === 0)) {
      throw new InvalidInputError('degree', `${degree} must be an integer in [1, 15]${this.hermite ? ', odd for Hermite' : ''}`);
    }
    if (options.target === options.centre) throw new InvalidInputError('centre', 'target and centre must differ');
    this.points = this.hermite ? (degree + 1) / 2 : degree + 1;
    checkRecords(options.records, this.points);
    this.name = options.name;
    this.target = options.target;
    this.centre = options.centre;
    this.bodies = Object.freeze([options.target, options.centre]);
    const n = options.records.length;
    this.epochs = new Float64Array(n);
    this.states = new Float64Array(6 * n);
    options.records.forEach((r, i) => {
      this.epochs[i] = r.epochTdbS;
      this.states.set([...r.positionKm, ...r.velocityKmS], 6 * i);
    });
    this.span = Object.freeze({ startTdbS: this.epochs[0], endTdbS: this.epochs[n - 1] });
  }

  /** Index of the first record of the window centred on `t`. */
  private windowStart(t: number): number {
    const e = this.epochs;
    let lo = 0;
    let hi = e.length - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (e[mid] <= t) lo = mid; else hi = mid;
    }
    const start = lo - ((this.points - 1) >> 1);
    return Math.max(0, Math.min(start, e.length - this.points));
  }

  private interpolate(t: number, out: Float64Array): void {
    const start = this.windowStart(t);
    if (this.hermite) this.hermiteInto(start, t, out); else this.lagrangeInto(start, t, out);
  }

  private lagrangeInto(start: number, t: number, out: Float64Array): void {
    const e = this.epochs;
    out.fill(0);
    for (let i = start; i < start + this.points; i++) {
      let w = 1;
      for (let j = start; j < start + this.points; j++) if (j !== i) w *= (t - e[j]) / (e[i] - e[j]);
      for (let c = 0; c < 6; c++) out[c] += w * this.states[6 * i + c];
    }
  }

  /** Hermite interpolation in Lagrange form: H(t) = Σ [h_i(t) p_i + k_i(t) v_i] with
   * h_i = (1 − 2 L_i'(t_i)(t − t_i)) L_i², k_i = (t − t_i) L_i²; derivative taken analytically. */
  private hermiteInto(start: number, t: number, out: Float64Array): void {
    const e = this.epochs;
    out.fill(0);
    for (let i = start; i < start + this.points; i++) {
      let li = 1;
      let dliAtNode = 0; // L_i'(t_i) = Σ 1/(t_i − t_j)
      let dLi = 0; // L_i'(t), accumulated by the product rule
      for (let j = start; j < start + this.points; j++) {
        if (j === i) continue;
        const f = (t - e[j]) / (e[i] - e[j]);
        dLi = dLi * f + li / (e[i] - e[j]);
        li *= f;
        dliAtNode += 1 / (e[i] - e[j]);
      }
      const dt = t - e[i];
      const a = 1 - 2 * dliAtNode * dt;
      const h = a * li * li;
      const k = dt * li * li;
      const dh = -2 * dliAtNode * li * li + a * 2 * li * dLi;
      const dk = li * li + dt * 2 * li * dLi;
      for (let c = 0; c < 3; c++) {
        const p = this.states[6 * i + c];
        const v = this.states[6 * i + 3 + c];
        out[c] += h * p + k * v;
        out[3 + c] += dh * p + dk * v;
      }
    }
  }

  protected fillRelative(target: BodyName, centre: BodyName, epochTdbS: number, out: Float64Array, offset: number,
    components: 3 | 6): void {
    this.interpolate(epochTdbS, this.work);
    const sign = target === this.target ? 1 : -1;
    for (let c = 0; c < components; c++) out[offset + c] = sign * this.work[c];
  }
}

/**
 * An Ephemeris over tabulated states of `target` relative to `centre` (J2000 equatorial, km, km/s, TDB),
 * answering only that pair (either way round). Span = [first, last] record epoch; no extrapolation.
 */
export function createTabulatedEphemeris(options: TabulatedEphemerisOptions): TabulatedEphemeris {
  return new TabulatedSource(options);
}
