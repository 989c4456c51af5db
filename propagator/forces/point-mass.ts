/**
 * Newtonian point-mass attraction and its gradient. Frame: any inertial frame; the position is of the
 * spacecraft relative to the attracting body, km; accelerations km/s^2; partials 1/s^2.
 */

/**
 * Adds a = -gm r/|r|^3 to acc[0..2] and, when `partials` is given, ∂a/∂r = -gm/|r|^3 (I - 3 r̂r̂ᵀ) to
 * partials[0..8] (row-major). gm in km^3/s^2 (> 0); (x, y, z) in km, non-zero.
 */
export function addPointMass(
  gm: number, x: number, y: number, z: number, acc: Float64Array, partials: Float64Array | null,
): void {
  const r2 = x * x + y * y + z * z;
  const r = Math.sqrt(r2);
  const k = gm / (r2 * r);
  acc[0] -= k * x;
  acc[1] -= k * y;
  acc[2] -= k * z;
  if (partials !== null) addPointMassGradient(k, x, y, z, r2, partials);
}

/** Adds -k (I - 3 d dᵀ/|d|²) to the 3x3 row-major `partials`; k = gm/|d|^3 (1/s^2). */
export function addPointMassGradient(
  k: number, x: number, y: number, z: number, d2: number, partials: Float64Array,
): void {
  const s = (3 * k) / d2;
  partials[0] += s * x * x - k;
  partials[1] += s * x * y;
  partials[2] += s * x * z;
  partials[3] += s * y * x;
  partials[4] += s * y * y - k;
  partials[5] += s * y * z;
  partials[6] += s * z * x;
  partials[7] += s * z * y;
  partials[8] += s * z * z - k;
}
