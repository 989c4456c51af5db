/**
 * Universal-variable Kepler solver: two-body propagation of a Cartesian state over any time span for
 * elliptic, parabolic and hyperbolic orbits, forward and backward in time.
 *
 * Method: Vallado, "Fundamentals of Astrodynamics and Applications" (4th ed., 2013), Algorithm 8 (KEPLER):
 * universal variable χ, Stumpff functions c2, c3, Lagrange coefficients f, g, ḟ, ġ. Vallado's plain Newton
 * iteration is safeguarded here by a bracket: the time equation F(χ) is strictly increasing
 * (dF/dχ = r > 0 for F(χ) = √μ·t(χ) − √μ·Δt), so a Newton step leaving the bracket is replaced by bisection and
 * convergence is guaranteed.
 */
import { InvalidInputError } from '../../contract/errors.ts';
import type { Vec3 } from '../types.ts';
import { stumpff23 } from './stumpff.ts';

/** The solved universal variable and the Lagrange coefficients of one Kepler step. */
export interface KeplerSolution {
  /** Position after dtS, km, same inertial axes as the input. */
  positionKm: Vec3;
  /** Velocity after dtS, km/s. */
  velocityKmS: Vec3;
  /** Universal variable χ, km^(1/2). */
  chi: number;
  /** ψ = αχ² (dimensionless). */
  psi: number;
  /** α = 1/a = 2/r0 − v0²/μ, 1/km (0 for a parabola, < 0 for a hyperbola). */
  alphaPerKm: number;
  /** Lagrange coefficients: r = f r0 + g v0, v = ḟ r0 + ġ v0 (g in s, ḟ in 1/s). */
  f: number;
  g: number;
  fDot: number;
  gDot: number;
  /** Newton/bisection iterations used. */
  iterations: number;
}

const MAX_ITERATIONS = 200;

function checkVec(name: string, v: ArrayLike<number>): void {
  if (v.length !== 3 || !Number.isFinite(v[0]) || !Number.isFinite(v[1]) || !Number.isFinite(v[2])) {
    throw new InvalidInputError(name, `must be three finite numbers, got [${Array.from(v).join(', ')}]`);
  }
}

/** Universal functions U0..U3 at χ for α (Battin 1999 §4.5): U_n = χ^n c_n(αχ²). */
function timeEquation(chi: number, alpha: number, r0: number, sigma0: number) {
  const psi = alpha * chi * chi;
  const { c2, c3 } = stumpff23(psi);
  const u2 = chi * chi * c2;
  const u3 = chi * chi * chi * c3;
  const u1 = chi * (1 - psi * c3);
  const u0 = 1 - psi * c2;
  // √μ·t(χ) = r0 U1 + σ0 U2 + U3 and r(χ) = r0 U0 + σ0 U1 + U2 (σ0 = r0·v0/√μ).
  return { psi, c2, c3, u0, u1, u2, u3, sqrtMuT: r0 * u1 + sigma0 * u2 + u3, r: r0 * u0 + sigma0 * u1 + u2 };
}

/**
 * Propagates a two-body state over dtS seconds.
 * @param r0Km initial position, km, any inertial axes (the output uses the same axes)
 * @param v0KmS initial velocity, km/s
 * @param dtS time step, s, any sign (backward propagation for dtS < 0); |dtS| up to ~1e4 orbital periods
 * @param muKm3S2 gravitational parameter GM of the attracting body, km^3/s^2, > 0
 * @throws InvalidInputError for non-finite input, μ ≤ 0, r0 = 0
 */
// Kept whole (~90 lines): the per-step kernel of Encke's reference orbit; guess, bracket and Newton share scalars.
export function keplerSolve(r0Km: ArrayLike<number>, v0KmS: ArrayLike<number>, dtS: number,
  muKm3S2: number): KeplerSolution {
  checkVec('r0Km', r0Km);
  checkVec('v0KmS', v0KmS);
  if (!Number.isFinite(dtS)) throw new InvalidInputError('dtS', `must be finite, got ${dtS}`);
  if (!(muKm3S2 > 0) || !Number.isFinite(muKm3S2)) {
    throw new InvalidInputError('muKm3S2', `must be a finite number > 0, got ${muKm3S2}`);
  }
  const x = r0Km[0], y = r0Km[1], z = r0Km[2];
  const vx = v0KmS[0], vy = v0KmS[1], vz = v0KmS[2];
  const r0 = Math.hypot(x, y, z);
  if (!(r0 > 0)) throw new InvalidInputError('r0Km', 'position must not be zero');
  const v2 = vx * vx + vy * vy + vz * vz;
  const sqrtMu = Math.sqrt(muKm3S2);
  const sigma0 = (x * vx + y * vy + z * vz) / sqrtMu;
  const alpha = 2 / r0 - v2 / muKm3S2;
  const target = sqrtMu * dtS;

  if (dtS === 0) {
    return { positionKm: [x, y, z], velocityKmS: [vx, vy, vz], chi: 0, psi: 0, alphaPerKm: alpha,
      f: 1, g: 0, fDot: 0, gDot: 1, iterations: 0 };
  }
  // Initial guess (Vallado Alg. 8): elliptic χ ≈ √μ Δt α; otherwise the near-start estimate Δt√μ/r0.
  let chi = alpha > 1e-12 ? target * alpha : target / r0;
  if (alpha < -1e-12) {
    // Hyperbolic guess (Vallado Alg. 8): χ0 = sgn(Δt)√(−a) ln[−2μαΔt / (r0·v0 + sgn(Δt)√(−μa)(1 − r0α))].
    const a = 1 / alpha;
    const sgn = Math.sign(dtS);
    const arg = (-2 * muKm3S2 * alpha * dtS) / (sigma0 * sqrtMu + sgn * Math.sqrt(-muKm3S2 * a) * (1 - r0 * alpha));
    if (arg > 1) chi = sgn * Math.sqrt(-a) * Math.log(arg);
  }
  // Bracket [lo, hi] with F(lo) < 0 < F(hi), F(χ) = √μ t(χ) − √μ Δt, F increasing, F(0) = −√μΔt.
  let lo = dtS > 0 ? 0 : -Infinity;
  let hi = dtS > 0 ? Infinity : 0;
  let step = Math.max(Math.min(Math.abs(chi), Math.abs(target / r0)), 1e-8) * (dtS > 0 ? 1 : -1);
  let probe = step;
  // Expand until the far side of the bracket is found (overflow → counts as beyond).
  for (let k = 0; k < 2100; k++) {
    const value = timeEquation(probe, alpha, r0, sigma0).sqrtMuT - target;
    const beyond = !Number.isFinite(value) || (dtS > 0 ? value > 0 : value < 0);
    if (beyond) {
      if (dtS > 0) hi = probe; else lo = probe;
      break;
    }
    if (dtS > 0) lo = probe; else hi = probe;
    step *= 2;
    probe += step;
  }
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) {
    throw new InvalidInputError('dtS', `no universal-variable bracket found for dt = ${dtS} s`);
  }
  if (!(chi > lo && chi < hi)) chi = 0.5 * (lo + hi);

  let iterations = 0;
  let previousResidual = Infinity;
  let ev = timeEquation(chi, alpha, r0, sigma0);
  for (; iterations < MAX_ITERATIONS; iterations++) {
    let residual = ev.sqrtMuT - target;
    // An overflowed evaluation lies beyond the root on the side of travel.
    if (!Number.isFinite(residual)) residual = dtS > 0 ? Infinity : -Infinity;
    if (residual > 0) hi = chi; else if (residual < 0) lo = chi; else break;
    let next = chi - residual / ev.r;
    // Bisect when Newton leaves the bracket or stalls (|residual| not halving, e.g. far on an exponential).
    const stalled = Math.abs(residual) > 0.5 * previousResidual;
    previousResidual = Math.abs(residual);
    if (!(next > lo && next < hi) || !Number.isFinite(next) || (stalled && iterations > 2)) {
      next = 0.5 * (lo + hi);
    }
    const change = Math.abs(next - chi);
    chi = next;
    ev = timeEquation(chi, alpha, r0, sigma0);
    if (change <= 4e-16 * Math.max(Math.abs(chi), 1e-300) || hi - lo <= 4e-16 * Math.abs(chi)) {
      iterations++;
      break;
    }
  }
  if (iterations >= MAX_ITERATIONS) {
    throw new InvalidInputError('dtS', `universal Kepler iteration did not converge for dt = ${dtS} s `
      + `(α = ${alpha} 1/km, r0 = ${r0} km)`);
  }
  const r = ev.r;
  const f = 1 - ev.u2 / r0;
  const g = (r0 * ev.u1 + sigma0 * ev.u2) / sqrtMu; // equals dt − U3/√μ without its cancellation
  const fDot = (-sqrtMu * ev.u1) / (r * r0);
  const gDot = 1 - ev.u2 / r;
  return {
    positionKm: [f * x + g * vx, f * y + g * vy, f * z + g * vz],
    velocityKmS: [fDot * x + gDot * vx, fDot * y + gDot * vy, fDot * z + gDot * vz],
    chi, psi: ev.psi, alphaPerKm: alpha, f, g, fDot, gDot, iterations,
  };
}

/**
 * Two-body position and velocity after dtS seconds (universal variables, Vallado Algorithm 8).
 * @param r0Km position, km (inertial axes; output in the same axes)
 * @param v0KmS velocity, km/s
 * @param dtS time step, s (any sign)
 * @param muKm3S2 GM, km^3/s^2 (> 0)
 * @returns position km and velocity km/s after dtS
 */
export function keplerPropagate(r0Km: ArrayLike<number>, v0KmS: ArrayLike<number>, dtS: number,
  muKm3S2: number): { positionKm: Vec3; velocityKmS: Vec3 } {
  const s = keplerSolve(r0Km, v0KmS, dtS, muKm3S2);
  return { positionKm: s.positionKm, velocityKmS: s.velocityKmS };
}
