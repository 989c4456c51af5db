/**
 * Analytic state transition matrix of two-body motion, Φ = ∂(r, v)(t0 + Δt) / ∂(r0, v0).
 *
 * Source of the formulation: Battin, "An Introduction to the Mathematics and Methods of Astrodynamics"
 * (rev. ed. 1999), §4.5 (universal functions U_n and their derivatives) and §9.7 (state transition matrix
 * of the two-body problem from the Lagrange coefficients). The solution r = f r0 + g v0, v = ḟ r0 + ġ v0 is
 * differentiated exactly: the dependence of the universal variable χ on the initial state follows from
 * implicit differentiation of the universal Kepler equation √μ Δt = r0 U1 + σ0 U2 + U3 (its χ-derivative is
 * r), and every other term by the chain rule, carried by forward-mode jets. No finite differences.
 * Stumpff derivatives: dc_n/dψ = −½(c_{n+1} − n c_{n+2}) (from Battin's ∂U_n/∂α = −½(χU_{n+1} − nU_{n+2})).
 */
import type { Vec3 } from '../types.ts';
import { Jet, type Jet3, add3, dot3, scale3, stateJets } from './jet.ts';
import { stumpff } from './stumpff.ts';
import { keplerSolve } from './universal-kepler.ts';

/** Two-body state after Δt with its 6x6 state transition matrix (row-major, 36 numbers). */
export interface KeplerStmResult {
  positionKm: Vec3;
  velocityKmS: Vec3;
  /** Φ[i*6+j] = ∂x_i(t0+Δt)/∂x_j(t0), x = (r km, v km/s). */
  stm: number[];
}

/** Universal functions U0..U3 as jets of (χ, α). */
function universalJets(chi: Jet, alpha: Jet) {
  const chi2 = chi.mul(chi);
  const psiJet = alpha.mul(chi2);
  const c = stumpff(psiJet.v);
  const c2 = psiJet.apply(c.c2, c.c4 - c.c3 / 2);
  const c3 = psiJet.apply(c.c3, (3 * c.c5 - c.c4) / 2);
  const u2 = chi2.mul(c2);
  const u3 = chi2.mul(chi).mul(c3);
  const u1 = chi.sub(alpha.mul(u3));
  const u0 = alpha.mul(u2).neg().add(1);
  return { u0, u1, u2, u3 };
}

/**
 * Two-body propagation with its analytic state transition matrix.
 * @param r0Km initial position, km (inertial axes; outputs in the same axes)
 * @param v0KmS initial velocity, km/s
 * @param dtS time step, s (any sign)
 * @param muKm3S2 GM of the attracting body, km^3/s^2 (> 0)
 * @throws InvalidInputError as keplerSolve
 */
export function keplerStm(r0Km: readonly number[], v0KmS: readonly number[], dtS: number,
  muKm3S2: number): KeplerStmResult {
  const solution = keplerSolve(r0Km, v0KmS, dtS, muKm3S2);
  const { r: r0v, v: v0v } = stateJets([...r0Km, ...v0KmS]);
  const sqrtMu = Math.sqrt(muKm3S2);
  const r0 = dot3(r0v, r0v).sqrt();
  const sigma0 = dot3(r0v, v0v).div(sqrtMu);
  const alpha = r0.apply(2 / r0.v, -2 / (r0.v * r0.v)).sub(dot3(v0v, v0v).div(muKm3S2));

  // χ(x0) implicitly: K(χ, x0) = r0 U1 + σ0 U2 + U3 − √μ Δt = 0, ∂K/∂χ = r  ⇒  dχ/dx0 = −(∂K/∂x0)/r.
  const fixed = universalJets(Jet.constant(solution.chi, 6), alpha);
  const k = r0.mul(fixed.u1).add(sigma0.mul(fixed.u2)).add(fixed.u3);
  const rScalar = r0.v * fixed.u0.v + sigma0.v * fixed.u1.v + fixed.u2.v;
  const chi = new Jet(solution.chi, k.d.map((x) => -x / rScalar));

  const { u0, u1, u2 } = universalJets(chi, alpha);
  const r = r0.mul(u0).add(sigma0.mul(u1)).add(u2);
  const f = u2.div(r0).neg().add(1);
  const g = r0.mul(u1).add(sigma0.mul(u2)).div(sqrtMu);
  const fDot = u1.mul(-sqrtMu).div(r.mul(r0));
  const gDot = u2.div(r).neg().add(1);
  const rv: Jet3 = add3(scale3(r0v, f), scale3(v0v, g));
  const vv: Jet3 = add3(scale3(r0v, fDot), scale3(v0v, gDot));

  const stm: number[] = new Array(36);
  const rows = [...rv, ...vv];
  for (let i = 0; i < 6; i++) for (let j = 0; j < 6; j++) stm[i * 6 + j] = rows[i].d[j];
  return { positionKm: solution.positionKm, velocityKmS: solution.velocityKmS, stm };
}
