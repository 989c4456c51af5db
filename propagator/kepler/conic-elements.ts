/**
 * Classical conic elements from a Cartesian state and back, for ellipses, parabolas and hyperbolas.
 * Method: Vallado, "Fundamentals of Astrodynamics and Applications" (4th ed., 2013), Algorithm 9 (RV2COE)
 * and Algorithm 10 (COE2RV). Angles in radians, [0, 2π) except the true anomaly of a hyperbola,
 * which lies in (−ν∞, ν∞) as (−π, π].
 *
 * Special cases (our convention, stated because the angles are undefined there): on a circular orbit
 * (e < CIRCULAR_LIMIT) the argument of periapsis is set to 0 and the true anomaly counts from the node
 * (argument of latitude); on an equatorial orbit (i < EQUATORIAL_LIMIT or > π − it) the node is set to 0
 * and ω is measured from the x axis (longitude of periapsis); circular-equatorial: Ω = ω = 0 and ν is the
 * true longitude.
 */
import { InvalidInputError } from '../../contract/errors.ts';
import type { Vec3 } from '../types.ts';

/** Eccentricity (dimensionless) below which stateToConic treats an orbit as circular (ω = 0). */
export const CIRCULAR_LIMIT = 1e-11;
/** |n| / |h| (sine of the inclination, dimensionless) below which an orbit counts as equatorial (Ω = 0). */
export const EQUATORIAL_LIMIT = 1e-11;

/** Conic elements relative to the attracting body, in the axes of the Cartesian state they came from. */
export interface ConicElements {
  /** Semi-latus rectum p = h²/μ, km (> 0). */
  semiLatusRectumKm: number;
  /** Semi-major axis a, km: > 0 ellipse, < 0 hyperbola, Infinity for an exact parabola. */
  semiMajorAxisKm: number;
  /** Eccentricity e ≥ 0. */
  eccentricity: number;
  /** Inclination i, rad, [0, π]. */
  inclinationRad: number;
  /** Right ascension of the ascending node Ω, rad, [0, 2π). */
  raanRad: number;
  /** Argument of periapsis ω, rad, [0, 2π). */
  argPeriapsisRad: number;
  /** True anomaly ν, rad, [0, 2π) for ellipses, (−π, π] for parabolas and hyperbolas. */
  trueAnomalyRad: number;
}

const TWO_PI = 2 * Math.PI;
const wrap = (x: number) => ((x % TWO_PI) + TWO_PI) % TWO_PI;
const cross = (a: Vec3, b: Vec3): Vec3 => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
const dot = (a: Vec3, b: Vec3) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
const norm = (a: Vec3) => Math.hypot(a[0], a[1], a[2]);

/**
 * Conic elements of a state (Vallado Algorithm 9).
 * @param rKm position relative to the attracting body, km (inertial axes)
 * @param vKmS velocity, km/s
 * @param muKm3S2 GM, km^3/s^2 (> 0)
 * @throws InvalidInputError when the angular momentum is zero (rectilinear motion has no conic plane)
 */
export function stateToConic(rKm: Vec3, vKmS: Vec3, muKm3S2: number): ConicElements {
  if (!(muKm3S2 > 0)) throw new InvalidInputError('muKm3S2', `must be > 0, got ${muKm3S2}`);
  if (![...rKm, ...vKmS].every(Number.isFinite)) throw new InvalidInputError('state', 'must be finite');
  const r = norm(rKm);
  const h = cross(rKm, vKmS);
  const hMag = norm(h);
  if (!(hMag > 1e-12 * r * norm(vKmS)) || r === 0) {
    throw new InvalidInputError('state', `angular momentum is zero (|h| = ${hMag} km^2/s): rectilinear motion`);
  }
  const v2 = dot(vKmS, vKmS);
  const rv = dot(rKm, vKmS);
  const eVec: Vec3 = [0, 1, 2].map((i) => ((v2 - muKm3S2 / r) * rKm[i] - rv * vKmS[i]) / muKm3S2) as Vec3;
  const e = norm(eVec);
  const p = (hMag * hMag) / muKm3S2;
  const energy = v2 / 2 - muKm3S2 / r;
  const a = energy === 0 ? Infinity : -muKm3S2 / (2 * energy);
  const i = Math.atan2(Math.hypot(h[0], h[1]), h[2]);
  const nodeVec: Vec3 = [-h[1], h[0], 0]; // k × h
  const n = norm(nodeVec);
  const equatorial = n <= EQUATORIAL_LIMIT * hMag;
  const circular = e < CIRCULAR_LIMIT;
  let raan = 0;
  let argp = 0;
  let nu: number;
  if (!equatorial) raan = wrap(Math.atan2(nodeVec[1], nodeVec[0]));
  // Signed angle from one vector to another about h, by atan2 (accurate at 0 and π, unlike acos).
  const signed = (from: Vec3, to: Vec3) => Math.atan2(dot(cross(from, to), h) / hMag, dot(from, to));
  const xAxis: Vec3 = [1, 0, 0];
  if (!circular) {
    argp = equatorial ? wrap(signed(xAxis, eVec)) : wrap(signed(nodeVec, eVec));
    nu = signed(eVec, rKm);
  } else {
    nu = equatorial ? signed(xAxis, rKm) : signed(nodeVec, rKm);
  }
  if (e < 1 || circular) nu = wrap(nu);
  return { semiLatusRectumKm: p, semiMajorAxisKm: a, eccentricity: e, inclinationRad: i, raanRad: raan,
    argPeriapsisRad: argp, trueAnomalyRad: nu };
}

/**
 * Cartesian state from conic elements (Vallado Algorithm 10), inverse of stateToConic with the same
 * conventions. Uses p (not a), so parabolas are handled.
 * @param el conic elements; p km > 0, e ≥ 0; for e ≥ 1, |ν| must be below acos(−1/e)
 * @param muKm3S2 GM, km^3/s^2 (> 0)
 * @returns position km and velocity km/s in the elements' reference axes
 */
export function conicToState(el: ConicElements, muKm3S2: number): { positionKm: Vec3; velocityKmS: Vec3 } {
  const { semiLatusRectumKm: p, eccentricity: e, inclinationRad: i, raanRad: O, argPeriapsisRad: w,
    trueAnomalyRad: nu } = el;
  if (!(p > 0)) throw new InvalidInputError('semiLatusRectumKm', `must be > 0, got ${p}`);
  if (!(e >= 0)) throw new InvalidInputError('eccentricity', `must be ≥ 0, got ${e}`);
  const denom = 1 + e * Math.cos(nu);
  if (!(denom > 0)) {
    throw new InvalidInputError('trueAnomalyRad', `ν = ${nu} rad lies beyond the asymptote of e = ${e}`);
  }
  const r = p / denom;
  const sq = Math.sqrt(muKm3S2 / p);
  const rPqw = [r * Math.cos(nu), r * Math.sin(nu), 0];
  const vPqw = [-sq * Math.sin(nu), sq * (e + Math.cos(nu)), 0];
  const cO = Math.cos(O), sO = Math.sin(O), cw = Math.cos(w), sw = Math.sin(w), ci = Math.cos(i), si = Math.sin(i);
  // Rotation PQW → inertial: R3(−Ω) R1(−i) R3(−ω).
  const m = [
    [cO * cw - sO * sw * ci, -cO * sw - sO * cw * ci],
    [sO * cw + cO * sw * ci, -sO * sw + cO * cw * ci],
    [sw * si, cw * si],
  ];
  const rot = (x: number[]): Vec3 => [m[0][0] * x[0] + m[0][1] * x[1], m[1][0] * x[0] + m[1][1] * x[1],
    m[2][0] * x[0] + m[2][1] * x[1]];
  return { positionKm: rot(rPqw), velocityKmS: rot(vPqw) };
}
