/**
 * Lambert's problem: the conic from r1 to r2 in a given time under a point mass, with zero or more
 * complete revolutions (two solutions, Izzo's left and right branches, for each revolution count > 0).
 * Method: D. Izzo (2015), "Revisiting Lambert's problem", Celestial Mechanics and Dynamical Astronomy
 * 121:1–15 — the x-variable formulation with Householder (third-order) iterations and Izzo's initial
 * guesses, velocity reconstruction from his eq. (31) (from memory).
 */
import { cross3 as cross, dot3 as dot, InvalidInputError, norm2 as norm, type Vec3 } from '../../propagator/index.ts';
import { LAMBERT_DEFAULTS, type LambertOptions, type LambertSolution } from './lambert-types.ts';
import { izzoTimeDerivatives, izzoTimeOfFlight } from './time-of-flight.ts';

/** sin(transfer angle) below this is treated as a 0° or 180° transfer whose plane is undefined. */
const MIN_SIN_TRANSFER_ANGLE = 1e-9;
/** |T(x) − T| below this (relative to max(1, T)) is a root whatever the step size. */
const RESIDUAL_TOLERANCE = 1e-15;
/** Within this of x = ±1 the derivative formulas lose precision (0/0 at the parabola). */
const NEAR_PARABOLA = 1e-7;

const scale = (a: Vec3, k: number): Vec3 => [a[0] * k, a[1] * k, a[2] * k];

function checkVector(field: string, v: Vec3): void {
  if (!Array.isArray(v) || v.length !== 3 || !v.every(Number.isFinite)) {
    throw new InvalidInputError(field, `must be three finite numbers, got ${JSON.stringify(v)}`);
  }
}

function checkPositive(field: string, value: number): void {
  if (!Number.isFinite(value) || value <= 0) {
    throw new InvalidInputError(field, `must be a finite number > 0, got ${value}`);
  }
}

/**
 * Minimum non-dimensional time for `revolutions` > 0 complete revolutions: Halley iterations on
 * dT/dx = 0 from x = 0 (Izzo 2015, section 3).
 */
function minimumTime(lambda: number, revolutions: number): number {
  let x = 0;
  let t = izzoTimeOfFlight(0, lambda, revolutions);
  for (let it = 0; it < 12; it += 1) {
    const [d1, d2, d3] = izzoTimeDerivatives(x, t, lambda);
    if (d1 === 0) break;
    const next = x - (d1 * d2) / (d2 * d2 - (d1 * d3) / 2);
    const change = Math.abs(next - x);
    x = next;
    t = izzoTimeOfFlight(x, lambda, revolutions);
    if (change < 1e-13) break;
  }
  return t;
}

/** Izzo's initial guess for x with revolutions > 0, on the chosen branch (paper, eq. 30). */
function multiRevolutionGuess(t: number, revolutions: number, branch: 'left' | 'right'): number {
  if (branch === 'left') {
    const k = Math.pow((revolutions * Math.PI + Math.PI) / (8 * t), 2 / 3);
    return (k - 1) / (k + 1);
  }
  const k = Math.pow((8 * t) / (revolutions * Math.PI), 2 / 3);
  return (k - 1) / (k + 1);
}

/** Izzo's initial guess for x, zero revolutions (paper, section 4). */
function initialGuess(t: number, lambda: number): number {
  const t00 = Math.acos(lambda) + lambda * Math.sqrt(1 - lambda * lambda);
  const t1 = (2 / 3) * (1 - lambda * lambda * lambda);
  if (t >= t00) return Math.pow(t00 / t, 2 / 3) - 1;
  if (t < t1) return (5 / 2) * (t1 * (t1 - t)) / (t * (1 - Math.pow(lambda, 5))) + 1;
  // Interpolates x = 0 at T = T00 and x = 1 at T = T1 (the parabola).
  return Math.pow(t00 / t, 1 / Math.log2(t00 / t1)) - 1;
}

/** The checked options of one solve, defaults applied. */
interface SolveSettings {
  normal: Vec3;
  tolerance: number;
  maxIterations: number;
  revolutions: number;
  branch: 'left' | 'right';
}

/** Checks the inputs (errors name the field) and applies the defaults. */
function checkInputs(r1Km: Vec3, r2Km: Vec3, timeOfFlightS: number, muKm3S2: number, options: LambertOptions): SolveSettings {
  checkVector('r1Km', r1Km);
  checkVector('r2Km', r2Km);
  checkPositive('timeOfFlightS', timeOfFlightS);
  checkPositive('muKm3S2', muKm3S2);
  if (options.direction !== 'prograde' && options.direction !== 'retrograde') {
    throw new InvalidInputError('options.direction', `must be 'prograde' or 'retrograde', got ${String(options.direction)}`);
  }
  const normal = options.referenceNormal ?? (LAMBERT_DEFAULTS.referenceNormal as Vec3);
  checkVector('options.referenceNormal', normal);
  const tolerance = options.tolerance ?? LAMBERT_DEFAULTS.tolerance;
  const maxIterations = options.maxIterations ?? LAMBERT_DEFAULTS.maxIterations;
  const revolutions = options.revolutions ?? LAMBERT_DEFAULTS.revolutions;
  if (!Number.isInteger(revolutions) || revolutions < 0 || revolutions > 100) {
    throw new InvalidInputError('options.revolutions', `must be an integer in [0, 100], got ${revolutions}`);
  }
  const branch = options.branch ?? LAMBERT_DEFAULTS.branch;
  if (branch !== 'left' && branch !== 'right') {
    throw new InvalidInputError('options.branch', `must be 'left' or 'right', got ${String(branch)}`);
  }
  return { normal, tolerance, maxIterations, revolutions, branch };
}

/** The transfer's geometry in Izzo's terms: radii r1, r2 and chord (km), semi-perimeter s (km), the radial
 * and tangential unit vectors at both ends (input frame), λ and the transfer angle (rad) in the chosen
 * direction. */
interface TransferGeometry {
  r1: number;
  r2: number;
  chord: number;
  s: number;
  ir1: Vec3;
  ir2: Vec3;
  it1: Vec3;
  it2: Vec3;
  lambda: number;
  angle: number;
}

function transferGeometry(r1Km: Vec3, r2Km: Vec3, normal: Vec3, direction: LambertOptions['direction']): TransferGeometry {
  const r1 = norm(r1Km);
  const r2 = norm(r2Km);
  checkPositive('r1Km (magnitude)', r1);
  checkPositive('r2Km (magnitude)', r2);
  const chord = norm([r2Km[0] - r1Km[0], r2Km[1] - r1Km[1], r2Km[2] - r1Km[2]]);
  const s = (r1 + r2 + chord) / 2;
  const ir1 = scale(r1Km, 1 / r1);
  const ir2 = scale(r2Km, 1 / r2);
  const h = cross(ir1, ir2);
  const sinAngle = norm(h);
  const cosAngle = dot(ir1, ir2);
  if (sinAngle < MIN_SIN_TRANSFER_ANGLE) {
    const deg = (Math.atan2(sinAngle, cosAngle) * 180) / Math.PI;
    throw new InvalidInputError('r2Km', `transfer angle is ${deg.toFixed(9)}° (r1 and r2 collinear): `
      + 'the transfer plane is undefined at 0° or 180°; split the arc or move the aim point out of line',
    'LAMBERT_DEGENERATE_GEOMETRY');
  }
  const ih = scale(h, 1 / sinAngle);
  const normalLength = norm(normal);
  checkPositive('options.referenceNormal (magnitude)', normalLength);
  const hDotN = dot(ih, normal) / normalLength;
  if (Math.abs(hDotN) < 1e-12) {
    throw new InvalidInputError('options.referenceNormal', 'lies in the transfer plane, so prograde and '
      + 'retrograde are undefined; give a normal with a component along r1 × r2', 'LAMBERT_DEGENERATE_GEOMETRY');
  }

  let lambda = Math.sqrt(Math.max(0, 1 - chord / s));
  let it1: Vec3;
  let it2: Vec3;
  let angle = Math.atan2(sinAngle, cosAngle);
  if (hDotN < 0) {
    lambda = -lambda;
    it1 = cross(ir1, ih);
    it2 = cross(ir2, ih);
    angle = 2 * Math.PI - angle;
  } else {
    it1 = cross(ih, ir1);
    it2 = cross(ih, ir2);
  }
  if (direction === 'retrograde') {
    lambda = -lambda;
    it1 = scale(it1, -1);
    it2 = scale(it2, -1);
    angle = 2 * Math.PI - angle;
  }
  return { r1, r2, chord, s, ir1, ir2, it1, it2, lambda, angle };
}

/** Householder iterations on T(x) = t (non-dimensional time) from the starting x. */
function householderRoot(x0: number, t: number, lambda: number, settings: SolveSettings):
  { x: number; iterations: number; converged: boolean } {
  const { revolutions, tolerance, maxIterations } = settings;
  let x = x0;
  let iterations = 0;
  let converged = false;
  while (iterations < maxIterations) {
    iterations += 1;
    let tx = izzoTimeOfFlight(x, lambda, revolutions);
    let delta = tx - t;
    if (Math.abs(delta) <= RESIDUAL_TOLERANCE * Math.max(1, t)) {
      converged = true; // already on the root (e.g. exactly parabolic, where the derivatives are 0/0)
      break;
    }
    if (Math.abs(1 - x * x) < NEAR_PARABOLA) {
      // The derivative formulas divide by 1 − x²: step off the parabola by a hair first.
      x += x >= 1 ? NEAR_PARABOLA : -NEAR_PARABOLA;
      tx = izzoTimeOfFlight(x, lambda, revolutions);
      delta = tx - t;
    }
    const [d1, d2, d3] = izzoTimeDerivatives(x, tx, lambda);
    const step = (delta * (d1 * d1 - (delta * d2) / 2))
      / (d1 * (d1 * d1 - delta * d2) + (d3 * delta * delta) / 6);
    let next = x - step;
    if (!Number.isFinite(next)) break;
    if (next <= -1) next = (x - 1) / 2; // stay inside the domain x > −1
    if (revolutions > 0 && next >= 1) next = (x + 1) / 2; // multi-revolution conics are ellipses
    const change = Math.abs(next - x);
    x = next;
    if (change < tolerance || delta === 0) {
      converged = true;
      break;
    }
  }
  return { x, iterations, converged };
}

/** Velocities at both ends (km/s, input frame) from x: Izzo (2015) eq. (31). */
function endVelocities(g: TransferGeometry, x: number, muKm3S2: number): { v1KmS: Vec3; v2KmS: Vec3 } {
  const { r1, r2, chord, lambda, ir1, ir2, it1, it2 } = g;
  const gamma = Math.sqrt((muKm3S2 * g.s) / 2);
  const rho = (r1 - r2) / chord;
  const sigma = Math.sqrt(Math.max(0, 1 - rho * rho));
  const y = Math.sqrt(1 - lambda * lambda + lambda * lambda * x * x);
  const vr1 = (gamma * ((lambda * y - x) - rho * (lambda * y + x))) / r1;
  const vr2 = (-gamma * ((lambda * y - x) + rho * (lambda * y + x))) / r2;
  const vt = gamma * sigma * (y + lambda * x);
  const vt1 = vt / r1;
  const vt2 = vt / r2;
  const v1KmS: Vec3 = [
    vr1 * ir1[0] + vt1 * it1[0], vr1 * ir1[1] + vt1 * it1[1], vr1 * ir1[2] + vt1 * it1[2]];
  const v2KmS: Vec3 = [
    vr2 * ir2[0] + vt2 * it2[0], vr2 * ir2[1] + vt2 * it2[1], vr2 * ir2[2] + vt2 * it2[2]];
  return { v1KmS, v2KmS };
}

/**
 * Solves Lambert's problem with zero (default) or more complete revolutions.
 *
 * @param r1Km departure position, km, any inertial frame (same frame as r2Km).
 * @param r2Km arrival position, km, same frame.
 * @param timeOfFlightS transfer time, s, > 0.
 * @param muKm3S2 gravitational parameter of the attracting body, km^3/s^2, > 0.
 * @param options direction ('prograde' | 'retrograde' about `referenceNormal`, default +z), revolutions
 *   and branch for multi-revolution transfers, tolerance.
 * @returns velocities at both ends (km/s, input frame), iteration count and a converged flag.
 * @throws InvalidInputError for non-finite or non-positive inputs, for a transfer angle within ~1e-9 rad
 *   of 0° or 180° (the transfer plane is undefined: split the arc or give an out-of-plane position), and
 *   for a transfer plane containing the reference normal (prograde/retrograde undefined), and for a time
 *   of flight below the minimum for the requested revolutions (the message gives that minimum).
 */
export function solveLambert(
  r1Km: Vec3, r2Km: Vec3, timeOfFlightS: number, muKm3S2: number, options: LambertOptions,
): LambertSolution {
  const settings = checkInputs(r1Km, r2Km, timeOfFlightS, muKm3S2, options);
  const { revolutions } = settings;
  const g = transferGeometry(r1Km, r2Km, settings.normal, options.direction);
  const timeScale = Math.sqrt((2 * muKm3S2) / (g.s * g.s * g.s));
  const t = timeScale * timeOfFlightS;
  let x0: number;
  if (revolutions === 0) {
    x0 = initialGuess(t, g.lambda);
  } else {
    const tMin = minimumTime(g.lambda, revolutions);
    if (t < tMin) {
      throw new InvalidInputError('timeOfFlightS', `${timeOfFlightS} s is below the minimum ${(tMin / timeScale).toFixed(3)} s `
        + `for ${revolutions} complete revolution(s) on this geometry`, 'LAMBERT_NO_SOLUTION');
    }
    x0 = multiRevolutionGuess(t, revolutions, settings.branch);
  }
  const { x, iterations, converged } = householderRoot(x0, t, g.lambda, settings);
  const residual = Math.abs(izzoTimeOfFlight(x, g.lambda, revolutions) - t);
  const { v1KmS, v2KmS } = endVelocities(g, x, muKm3S2);
  return {
    v1KmS, v2KmS, iterations, converged: converged && v1KmS.every(Number.isFinite) && v2KmS.every(Number.isFinite),
    transferAngleRad: g.angle, x, revolutions, residual, method: 'izzo-2015-householder',
  };
}
