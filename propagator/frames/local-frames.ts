/**
 * Local orbital frames built from a position and velocity (any inertial frame; the result is in the
 * same frame):
 * - RTN: R along the position, N along the angular momentum r × v, T = N × R (along-track, ⟂ R).
 * - VNB: V along the velocity, N along r × v, B = V × N (completes the right-handed triad).
 * Matrices are row-major and their rows are the local unit axes in inertial components, so
 * local = M · inertial and inertial = Mᵀ · local.
 */
import { InvalidInputError } from '../../contract/errors.ts';
import type { LocalFrame, Vec3 } from '../types.ts';
import type { Matrix3 } from '../math/matrix3.ts';
import { multiplyMatrixVector, multiplyTransposeVector } from '../math/matrix3.ts';

function unit(v: ArrayLike<number>, field: string): Vec3 {
  const n = Math.hypot(v[0], v[1], v[2]);
  if (!(n > 0) || !Number.isFinite(n)) throw new InvalidInputError(field, `vector of length ${n} has no direction`);
  return [v[0] / n, v[1] / n, v[2] / n];
}

function cross(a: ArrayLike<number>, b: ArrayLike<number>): Vec3 {
  return [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
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

/** The rotation of a local frame by name. */
export function localFrameMatrix(frame: LocalFrame, positionKm: ArrayLike<number>, velocityKmS: ArrayLike<number>): Matrix3 {
  if (frame === 'RTN') return rtnMatrix(positionKm, velocityKmS);
  if (frame === 'VNB') return vnbMatrix(positionKm, velocityKmS);
  throw new InvalidInputError('frame', `unknown local frame '${String(frame)}' (use RTN or VNB)`);
}

/** Local-frame components of `vec` (any unit, e.g. a Δv in km/s) → inertial components, in the frame of
 * `positionKm`/`velocityKmS`. */
export function localToInertial(vec: ArrayLike<number>, frame: LocalFrame, positionKm: ArrayLike<number>,
  velocityKmS: ArrayLike<number>): Vec3 {
  return multiplyTransposeVector(localFrameMatrix(frame, positionKm, velocityKmS), vec);
}

/** Inertial components of `vec` → local-frame components (units unchanged). */
export function inertialToLocal(vec: ArrayLike<number>, frame: LocalFrame, positionKm: ArrayLike<number>,
  velocityKmS: ArrayLike<number>): Vec3 {
  return multiplyMatrixVector(localFrameMatrix(frame, positionKm, velocityKmS), vec);
}
