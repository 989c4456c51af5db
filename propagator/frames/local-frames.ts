/**
 * Local orbital frames built from a position and velocity (any inertial frame; the result is in the
 * same frame):
 * - RTN: R along the position, N along the angular momentum r × v, T = N × R (along-track, ⟂ R).
 * - VNB: V along the velocity, N along r × v, B = V × N (completes the right-handed triad).
 * - TNW (CCSDS ODM): T along the velocity, W along r × v, N = W × T.
 * Matrices are row-major and their rows are the local unit axes in inertial components, so
 * local = M · inertial and inertial = Mᵀ · local. `inertial` names the identity (Δv given in the state's
 * own inertial axes). This is the one place local frames are built: the planner's burns, the plan's
 * reported components and the CCSDS covariance frames all come here.
 */
import { InvalidInputError } from '../../contract/errors.ts';
import type { LocalFrame, Vec3 } from '../types.ts';
import type { Matrix } from '../math/matrix.ts';
import type { Matrix3 } from '../math/matrix3.ts';
import { cross3 as cross, multiplyMatrixVector, multiplyTransposeVector } from '../math/matrix3.ts';

function unit(v: ArrayLike<number>, field: string): Vec3 {
  const n = Math.hypot(v[0], v[1], v[2]);
  if (!(n > 0) || !Number.isFinite(n)) throw new InvalidInputError(field, `vector of length ${n} has no direction`);
  return [v[0] / n, v[1] / n, v[2] / n];
}

function normal(r: ArrayLike<number>, v: ArrayLike<number>): Vec3 {
  const h = cross(r, v);
  const scale = Math.hypot(r[0], r[1], r[2]) * Math.hypot(v[0], v[1], v[2]);
  // Relative test: r and v (anti)parallel leaves no orbit plane to define N.
  if (!(Math.hypot(h[0], h[1], h[2]) > 1e-12 * scale)) {
    throw new InvalidInputError('velocityKmS', 'position and velocity are parallel (or zero): no orbit plane');
  }
  return unit(h, 'velocityKmS');
}

/** RTN rotation (rows R, T, N) from position km and velocity km/s; see the file comment. */
export function rtnMatrix(positionKm: ArrayLike<number>, velocityKmS: ArrayLike<number>): Matrix3 {
  const r = unit(positionKm, 'positionKm');
  const n = normal(positionKm, velocityKmS);
  const t = cross(n, r);
  return [r[0], r[1], r[2], t[0], t[1], t[2], n[0], n[1], n[2]];
}

/** VNB rotation (rows V, N, B) from position km and velocity km/s; see the file comment. */
export function vnbMatrix(positionKm: ArrayLike<number>, velocityKmS: ArrayLike<number>): Matrix3 {
  unit(positionKm, 'positionKm');
  const v = unit(velocityKmS, 'velocityKmS');
  const n = normal(positionKm, velocityKmS);
  const b = cross(v, n);
  return [v[0], v[1], v[2], n[0], n[1], n[2], b[0], b[1], b[2]];
}

/** TNW rotation (rows T, N, W) from position km and velocity km/s; see the file comment. */
export function tnwMatrix(positionKm: ArrayLike<number>, velocityKmS: ArrayLike<number>): Matrix3 {
  unit(positionKm, 'positionKm');
  const t = unit(velocityKmS, 'velocityKmS');
  const w = normal(positionKm, velocityKmS);
  const n = cross(w, t);
  return [t[0], t[1], t[2], n[0], n[1], n[2], w[0], w[1], w[2]];
}

/** Axes a vector's components can be given in: the state's inertial axes or a local frame. */
export type AxesName = 'inertial' | LocalFrame | 'TNW';

/** The rotation of a local frame by name (the identity for `inertial`). */
export function localFrameMatrix(frame: AxesName, positionKm: ArrayLike<number>, velocityKmS: ArrayLike<number>): Matrix3 {
  if (frame === 'inertial') return [1, 0, 0, 0, 1, 0, 0, 0, 1];
  if (frame === 'RTN') return rtnMatrix(positionKm, velocityKmS);
  if (frame === 'VNB') return vnbMatrix(positionKm, velocityKmS);
  if (frame === 'TNW') return tnwMatrix(positionKm, velocityKmS);
  throw new InvalidInputError('frame', `unknown local frame '${String(frame)}' (use inertial, RTN, VNB or TNW)`);
}

/** A local frame's three unit axes in inertial components (the rows of its matrix). */
export type Rotation3 = [Vec3, Vec3, Vec3];

/** The axes of a local frame at the state (r km, v km/s, any inertial frame; result in the same frame). */
export function localAxes(frame: AxesName, positionKm: ArrayLike<number>, velocityKmS: ArrayLike<number>): Rotation3 {
  const m = localFrameMatrix(frame, positionKm, velocityKmS);
  return [[m[0], m[1], m[2]], [m[3], m[4], m[5]], [m[6], m[7], m[8]]];
}

/** inertial = Σ_j axes[j] · local[j]: components along `axes` → inertial components (units unchanged). */
export function axesToInertial(axes: Rotation3, local: ArrayLike<number>): Vec3 {
  return [0, 1, 2].map((i) => axes[0][i] * local[0] + axes[1][i] * local[1] + axes[2][i] * local[2]) as Vec3;
}

/** local[j] = axes[j] · inertial (the axes are orthonormal; units unchanged). */
export function axesFromInertial(axes: Rotation3, inertial: ArrayLike<number>): Vec3 {
  return axes.map((a) => a[0] * inertial[0] + a[1] * inertial[1] + a[2] * inertial[2]) as Vec3;
}

/**
 * ∂(inertial components)/∂(components in `frame`) at the state: the 3×3 matrix (rows inertial x, y, z) that
 * maps components in `frame` to inertial ones — the identity for `inertial`, the transposed local rotation
 * otherwise. Chains a Jacobian (∂targets/∂Δv_axes = ∂targets/∂Δv_inertial · this) or rotates a covariance.
 */
export function axesToInertialMatrix(frame: AxesName, positionKm: ArrayLike<number>, velocityKmS: ArrayLike<number>): Matrix {
  const m = localFrameMatrix(frame, positionKm, velocityKmS);
  return [0, 1, 2].map((i) => [m[i], m[3 + i], m[6 + i]]);
}

/** The 6×6 block rotation diag(M, M) that turns a [r, v] state (or covariance, by congruence) with the
 * rotation M (row-major 3×3). Position and velocity rotate alike: the frames here are taken as
 * non-rotating at the epoch (no ω × r term). */
export function stateRotation6(m: Readonly<Matrix3>): Matrix {
  const out = Array.from({ length: 6 }, () => new Array<number>(6).fill(0));
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) {
      out[i][j] = m[3 * i + j];
      out[3 + i][3 + j] = m[3 * i + j];
    }
  }
  return out;
}

/** Local-frame components of `vec` (any unit, e.g. a Δv in km/s) → inertial components, in the frame of
 * `positionKm`/`velocityKmS`. */
export function localToInertial(vec: ArrayLike<number>, frame: AxesName, positionKm: ArrayLike<number>,
  velocityKmS: ArrayLike<number>): Vec3 {
  return multiplyTransposeVector(localFrameMatrix(frame, positionKm, velocityKmS), vec);
}

/** Inertial components of `vec` → local-frame components (units unchanged). */
export function inertialToLocal(vec: ArrayLike<number>, frame: AxesName, positionKm: ArrayLike<number>,
  velocityKmS: ArrayLike<number>): Vec3 {
  return multiplyMatrixVector(localFrameMatrix(frame, positionKm, velocityKmS), vec);
}

/** Components of a vector in TNW → the same vector's components in VNB at the same state (an exact axis
 * permutation: V = T, N_vnb = W, B = −N_tnw); units carried through. */
export function vnbFromTnw([t, n, w]: Vec3): Vec3 {
  return [t, w, n === 0 ? 0 : -n];
}

/** Components in VNB → TNW at the same state (inverse of {@link vnbFromTnw}); units carried through. */
export function tnwFromVnb([v, n, b]: Vec3): Vec3 {
  return [v, b === 0 ? 0 : -b, n];
}
