/**
 * Second zonal harmonic (J2) of the central body. The body's pole is taken as the z axis of the
 * integration frame (J2000 equatorial); for the Earth this neglects precession and nutation of the true
 * pole since J2000 (about 0.3° by 2040), far below J2's effect on a cruise or a flyby. Standard result,
 * e.g. Vallado, Fundamentals of Astrodynamics and Applications (4th ed.), §8.7.1 / Montenbruck & Gill,
 * Satellite Orbits, §3.2.
 */

/**
 * Adds the J2 acceleration a_i = k [x_i/r^5 - 5 x_i z²/r^7 + 2 δ_iz z/r^5], k = -3/2 J2 gm R², to
 * acc[0..2], and its gradient to `partials` when given. gm km^3/s^2, radiusKm the harmonic's reference
 * radius, position (x, y, z) km from the body's centre in its equatorial axes.
 */
export function addJ2(
  gm: number, j2: number, radiusKm: number, x: number, y: number, z: number,
  acc: Float64Array, partials: Float64Array | null,
): void {
  const r2 = x * x + y * y + z * z;
  const r = Math.sqrt(r2);
  const ir2 = 1 / r2;
  const ir5 = ir2 * ir2 / r;
  const ir7 = ir5 * ir2;
  const k = -1.5 * j2 * gm * radiusKm * radiusKm;
  const z2 = z * z;
  const common = ir5 - 5 * z2 * ir7;
  acc[0] += k * x * common;
  acc[1] += k * y * common;
  acc[2] += k * (z * common + 2 * z * ir5);
  if (partials === null) return;
  // ∂a_i/∂x_j = k [δ_ij common + x_i x_j B + C (x_i δ_jz + x_j δ_iz) + 2 δ_iz δ_jz / r^5] (symmetric).
  const b = 35 * z2 * ir7 * ir2 - 5 * ir7;
  const c = -10 * z * ir7;
  const gxz = k * (x * z * b + c * x);
  const gyz = k * (y * z * b + c * y);
  const gxy = k * x * y * b;
  partials[0] += k * (common + x * x * b);
  partials[1] += gxy;
  partials[2] += gxz;
  partials[3] += gxy;
  partials[4] += k * (common + y * y * b);
  partials[5] += gyz;
  partials[6] += gxz;
  partials[7] += gyz;
  partials[8] += k * (common + z2 * b + 2 * c * z + 2 * ir5);
}
