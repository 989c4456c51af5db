/**
 * Third-body (perturbing point mass) acceleration in Battin's cancellation-free form: Battin, An
 * Introduction to the Mathematics and Methods of Astrodynamics (AIAA 1999), §8.4, eqs. for f(q).
 * Frame: inertial, positions relative to the central body in km; accelerations km/s^2.
 *
 * With r the spacecraft and s the perturbing body (both from the central body) and d = r - s,
 *   a = -gm (d/|d|^3 + s/|s|^3)            (direct + indirect term on the central body)
 *     = -gm/|d|^3 (r + f(q) s),   q = r·(r - 2s)/(s·s),   f(q) = (1+q)^{3/2} - 1,
 * and f is evaluated as q(3 + 3q + q²)/(1 + (1+q)^{3/2}), so no two nearly equal large vectors are
 * subtracted when |r| ≪ |s|.
 */
import { addPointMassGradient } from './point-mass.ts';

/** Battin's f(q) = (1+q)^{3/2} - 1 evaluated without cancellation; q > -1 (dimensionless). */
export function battinF(q: number): number {
  return (q * (3 + 3 * q + q * q)) / (1 + (1 + q) * Math.sqrt(1 + q));
}

/**
 * Adds the third-body acceleration of a body with parameter gm (km^3/s^2) at `s` (km, from the central
 * body) on a spacecraft at `r` (km, from the central body) to acc[0..2]; when `partials` is given, adds
 * ∂a/∂r = -gm/|d|^3 (I - 3 d̂d̂ᵀ) (the indirect term does not depend on r).
 */
export function addThirdBody(
  gm: number,
  rx: number, ry: number, rz: number,
  sx: number, sy: number, sz: number,
  acc: Float64Array, partials: Float64Array | null,
): void {
  const dx = rx - sx;
  const dy = ry - sy;
  const dz = rz - sz;
  const d2 = dx * dx + dy * dy + dz * dz;
  const s2 = sx * sx + sy * sy + sz * sz;
  const q = (rx * (rx - 2 * sx) + ry * (ry - 2 * sy) + rz * (rz - 2 * sz)) / s2;
  const f = battinF(q);
  const k = gm / (d2 * Math.sqrt(d2));
  acc[0] -= k * (rx + f * sx);
  acc[1] -= k * (ry + f * sy);
  acc[2] -= k * (rz + f * sz);
  if (partials !== null) addPointMassGradient(k, dx, dy, dz, d2, partials);
}
