/**
 * Cannonball solar radiation pressure: a = C_R (Φ/c) (A/m) (1 au/ρ)² ρ̂, with ρ the Sun-to-spacecraft
 * vector, Φ the IAU 2015 Resolution B3 nominal total solar irradiance at 1 au and c the speed of light
 * (propagator/constants.ts). Shadow: 'none', or 'cylindrical' (the spacecraft is dark when behind the
 * central body inside the cylinder of the body's radius along the Sun direction; no penumbra). Standard
 * model, e.g. Montenbruck & Gill, Satellite Orbits, §3.4.
 */
import { KM_PER_AU, SOLAR_IRRADIANCE_1AU_W_M2, SPEED_OF_LIGHT_KM_S } from '../constants.ts';
import { addPointMassGradient } from './point-mass.ts';

/** Radiation pressure at 1 au, N/m^2 (= W/m^2 over m/s). */
export const SOLAR_PRESSURE_1AU_N_M2 = SOLAR_IRRADIANCE_1AU_W_M2 / (SPEED_OF_LIGHT_KM_S * 1000);

/** Strength K (km^3/s^2) of the inverse-square SRP term a = K ρ/|ρ|^3, for area m^2, mass kg. */
export function solarPressureStrength(areaM2: number, reflectivityCoefficient: number, massKg: number): number {
  // C_R P A/m is m/s^2 at 1 au; /1000 -> km/s^2; times (1 au)^2 in km^2.
  return (reflectivityCoefficient * SOLAR_PRESSURE_1AU_N_M2 * areaM2 / massKg / 1000) * KM_PER_AU * KM_PER_AU;
}

/**
 * Adds the SRP acceleration for strength K (from {@link solarPressureStrength}) to acc[0..2] and its
 * gradient K/|ρ|^3 (I - 3 ρ̂ρ̂ᵀ) to `partials` when given. r: spacecraft from the central body (km);
 * sun: Sun from the central body (km); occulterRadiusKm: radius of the central body for the
 * cylindrical shadow, or 0 for no shadow. Returns false when the spacecraft is in shadow.
 */
export function addSolarPressure(
  strength: number,
  rx: number, ry: number, rz: number,
  sunX: number, sunY: number, sunZ: number,
  occulterRadiusKm: number,
  acc: Float64Array, partials: Float64Array | null,
): boolean {
  if (occulterRadiusKm > 0) {
    const sunDist = Math.sqrt(sunX * sunX + sunY * sunY + sunZ * sunZ);
    const along = (rx * sunX + ry * sunY + rz * sunZ) / sunDist;
    if (along < 0) {
      const perp2 = rx * rx + ry * ry + rz * rz - along * along;
      if (perp2 < occulterRadiusKm * occulterRadiusKm) return false;
    }
  }
  const px = rx - sunX;
  const py = ry - sunY;
  const pz = rz - sunZ;
  const p2 = px * px + py * py + pz * pz;
  const k = strength / (p2 * Math.sqrt(p2));
  acc[0] += k * px;
  acc[1] += k * py;
  acc[2] += k * pz;
  // The SRP field is the gradient of -K/|ρ|, so its Jacobian is the point-mass one with opposite sign.
  if (partials !== null) addPointMassGradient(-k, px, py, pz, p2, partials);
  return true;
}
