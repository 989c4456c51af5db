/**
 * Thrust direction of a finite burn in J2000 equatorial components, d = Mᵀu, from its fixed components u
 * in inertial axes (M = I) or in the local RTN / VNB axes of the instantaneous state (frames/local-frames.ts
 * defines the axes), with the Jacobian ∂d/∂[r, v] that the variational equations need while the axes turn
 * with the state. Derivatives of unit vectors: ∂ŵ/∂w = (I − ŵŵᵀ)/|w|; of h = r × v: ∂h/∂r = −[v]×,
 * ∂h/∂v = [r]× (standard vector calculus).
 */
import { InvalidInputError } from '../../contract/errors.ts';
import type { ThrustAxes } from '../run/propagation-types.ts';

type M3 = Float64Array;

function unitWithJacobian(w0: number, w1: number, w2: number, unit: Float64Array, jac: M3 | null, what: string): void {
  const n = Math.hypot(w0, w1, w2);
  if (!(n > 0) || !Number.isFinite(n)) throw new InvalidInputError('finiteBurns', `the ${what} has no direction (length ${n}) during a finite burn in local axes`);
  unit[0] = w0 / n;
  unit[1] = w1 / n;
  unit[2] = w2 / n;
  if (jac === null) return;
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) jac[3 * i + j] = ((i === j ? 1 : 0) - unit[i] * unit[j]) / n;
}

/** out = a × b. */
function crossInto(a: ArrayLike<number>, b: ArrayLike<number>, out: Float64Array): void {
  out[0] = a[1] * b[2] - a[2] * b[1];
  out[1] = a[2] * b[0] - a[0] * b[2];
  out[2] = a[0] * b[1] - a[1] * b[0];
}

/** out = [a]× · m (3x3 row-major), i.e. each column of m crossed with a from the left. */
function skewTimes(a: ArrayLike<number>, m: M3, out: M3): void {
  for (let j = 0; j < 3; j++) {
    const c0 = m[j];
    const c1 = m[3 + j];
    const c2 = m[6 + j];
    out[j] = a[1] * c2 - a[2] * c1;
    out[3 + j] = a[2] * c0 - a[0] * c2;
    out[6 + j] = a[0] * c1 - a[1] * c0;
  }
}

/** out = a · b for 3x3 row-major matrices. */
function mul3(a: M3, b: M3, out: M3): void {
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) out[3 * i + j] = a[3 * i] * b[j] + a[3 * i + 1] * b[3 + j] + a[3 * i + 2] * b[6 + j];
  }
}

/** Skew matrix [a]× (row-major) into out, times `sign`. */
function skewInto(a: ArrayLike<number>, sign: number, out: M3): void {
  out[0] = 0; out[1] = -sign * a[2]; out[2] = sign * a[1];
  out[3] = sign * a[2]; out[4] = 0; out[5] = -sign * a[0];
  out[6] = -sign * a[1]; out[7] = sign * a[0]; out[8] = 0;
}

/**
 * Evaluates d = Mᵀu and, on request, ∂d/∂[r, v]. Reusable buffers; no allocation per call after the
 * first. State: position km, velocity km/s (any inertial axes; the result is in the same axes).
 */
export class ThrustDirection {
  /** Rows: the three axes of `axes` in inertial components (identity for 'inertial'). */
  readonly axesRows = new Float64Array(9);
  /** d = Mᵀu, inertial components (unit when u is). */
  readonly inertial = new Float64Array(3);
  /** ∂d/∂[r, v], 3x6 row-major (1/km in columns 0..2, s/km in columns 3..5); zero for 'inertial'. */
  readonly jacobian = new Float64Array(18);
  private readonly e = [new Float64Array(3), new Float64Array(3), new Float64Array(3)];
  /** ∂e_i/∂r and ∂e_i/∂v, 3x3 each. */
  private readonly dr = [new Float64Array(9), new Float64Array(9), new Float64Array(9)];
  private readonly dv = [new Float64Array(9), new Float64Array(9), new Float64Array(9)];
  private readonly h = new Float64Array(3);
  private readonly jn = new Float64Array(9);
  private readonly jw = new Float64Array(9);
  private readonly sk = new Float64Array(9);
  private readonly t1 = new Float64Array(9);
  private readonly t2 = new Float64Array(9);

  constructor(readonly axes: ThrustAxes, readonly components: ArrayLike<number>) {}

  /** Updates `axesRows`, `inertial` and (when `withJacobian`) `jacobian` for the state y[0..5]. */
  update(y: ArrayLike<number>, withJacobian: boolean): void {
    const u = this.components;
    if (this.axes === 'inertial') {
      this.axesRows.fill(0);
      this.axesRows[0] = 1;
      this.axesRows[4] = 1;
      this.axesRows[8] = 1;
      for (let i = 0; i < 3; i++) this.inertial[i] = u[i];
      return;
    }
    this.localAxes(y, withJacobian);
    for (let i = 0; i < 3; i++) {
      for (let k = 0; k < 3; k++) this.axesRows[3 * i + k] = this.e[i][k];
      this.inertial[i] = u[0] * this.e[0][i] + u[1] * this.e[1][i] + u[2] * this.e[2][i];
    }
    if (!withJacobian) return;
    for (let i = 0; i < 3; i++) {
      for (let j = 0; j < 3; j++) {
        let sr = 0;
        let sv = 0;
        for (let a = 0; a < 3; a++) {
          sr += u[a] * this.dr[a][3 * i + j];
          sv += u[a] * this.dv[a][3 * i + j];
        }
        this.jacobian[6 * i + j] = sr;
        this.jacobian[6 * i + 3 + j] = sv;
      }
    }
  }

  /** The local axes e0, e1, e2 (RTN or VNB) and their partials. */
  private localAxes(y: ArrayLike<number>, withJacobian: boolean): void {
    const r = [y[0], y[1], y[2]];
    const v = [y[3], y[4], y[5]];
    const [e0, e1, e2] = this.e;
    const jac = withJacobian ? this.jw : null;
    crossInto(r, v, this.h);
    // N̂ and its partials: ∂N̂/∂r = Jn·(−[v]×), ∂N̂/∂v = Jn·[r]×.
    const nHat = this.axes === 'RTN' ? e2 : e1;
    unitWithJacobian(this.h[0], this.h[1], this.h[2], nHat, withJacobian ? this.jn : null, 'orbit normal r × v');
    const nIndex = this.axes === 'RTN' ? 2 : 1;
    if (withJacobian) {
      skewInto(v, -1, this.sk);
      mul3(this.jn, this.sk, this.dr[nIndex]);
      skewInto(r, 1, this.sk);
      mul3(this.jn, this.sk, this.dv[nIndex]);
    }
    // The first axis: R̂ (depends on r only) or V̂ (on v only).
    const first = this.axes === 'RTN' ? r : v;
    unitWithJacobian(first[0], first[1], first[2], e0, jac, this.axes === 'RTN' ? 'position' : 'velocity');
    if (withJacobian) {
      const onR = this.axes === 'RTN';
      (onR ? this.dr[0] : this.dv[0]).set(this.jw);
      (onR ? this.dv[0] : this.dr[0]).fill(0);
    }
    // The third axis: T̂ = N̂ × R̂ (RTN, index 1) or B̂ = V̂ × N̂ (VNB, index 2); d(a × b) = [a]× db − [b]× da.
    const [a, b, ia, ib, out] = this.axes === 'RTN' ? [e2, e0, 2, 0, 1] as const : [e0, e1, 0, 1, 2] as const;
    crossInto(a, b, this.e[out]);
    if (!withJacobian) return;
    for (const [dst, src] of [[this.dr, this.dr], [this.dv, this.dv]] as const) {
      skewTimes(a, src[ib], this.t1);
      skewTimes(b, src[ia], this.t2);
      for (let k = 0; k < 9; k++) dst[out][k] = this.t1[k] - this.t2[k];
    }
  }
}
