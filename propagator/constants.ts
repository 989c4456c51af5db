/**
 * Physical constants with their published sources. Values marked "from memory" were written from the
 * cited publication without the document at hand; each is cross-checked by a test where an independent
 * source exists (see test/reference/constants.test.ts).
 */
import type { BodyName } from './types.ts';

/** Gravitational parameters GM in km^3/s^2. Planets beyond Mars are system values (planet + moons).
 * Source: Park, Folkner, Williams & Boggs (2021), "The JPL Planetary and Lunar Ephemerides DE440 and
 * DE441", Astronomical Journal 161:105, Table 8 (from memory). */
export const GM_KM3_S2: Readonly<Record<BodyName, number>> = Object.freeze({
  sun: 132712440041.279419,
  mercury: 22031.868551,
  venus: 324858.592,
  earth: 398600.435507,
  moon: 4902.800118,
  mars: 42828.375816,
  jupiter: 126712764.1,
  saturn: 37940584.8418,
  uranus: 5794556.4,
  neptune: 6836527.10058,
});

/** Mean (Moon) or equatorial radii in km. Sources: IAU 2015 Resolution B3 nominal solar radius
 * (695,700 km); Archinal et al. (2018), "Report of the IAU Working Group on Cartographic Coordinates and
 * Rotational Elements: 2015", Celestial Mechanics and Dynamical Astronomy 130:22, Table 5 (from memory). */
export const RADIUS_KM: Readonly<Record<BodyName, number>> = Object.freeze({
  sun: 695700,
  mercury: 2440.53,
  venus: 6051.8,
  earth: 6378.1366,
  moon: 1737.4,
  mars: 3396.19,
  jupiter: 71492,
  saturn: 60268,
  uranus: 25559,
  neptune: 24764,
});

/** Earth's unnormalised second zonal harmonic J2 (dimensionless), EGM2008 (Pavlis et al. 2012):
 * J2 = -sqrt(5) * C̄20 with C̄20 = -4.84165143790815e-4 (from memory). */
export const J2_EARTH = 1.0826261738522227e-3;
/** Reference radius of the EGM2008 field, km (from memory). */
export const J2_REFERENCE_RADIUS_EARTH_KM = 6378.1363;

/** The astronomical unit in km, exact by definition: IAU 2012 Resolution B2. */
export const KM_PER_AU = 149597870.7;
/** Standard acceleration of gravity g0 in m/s^2, exact by definition: 3rd CGPM (1901). */
export const STANDARD_GRAVITY_M_S2 = 9.80665;
/** Speed of light in vacuum, km/s, exact by definition of the metre (17th CGPM, 1983). */
export const SPEED_OF_LIGHT_KM_S = 299792.458;
/** Total solar irradiance at 1 au, W/m^2: IAU 2015 Resolution B3 nominal value. */
export const SOLAR_IRRADIANCE_1AU_W_M2 = 1361;
/** Seconds in a Julian day (exact). */
export const SECONDS_PER_DAY = 86400;
/** Julian date of the J2000.0 epoch, 2000-01-01T12:00:00 TT/TDB (IAU 1976/1994 convention). */
export const J2000_JULIAN_DATE = 2451545.0;
