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
 *
 * Encke's method evaluates this at every right-hand side, so the jets live in slots of one preallocated
 * array (KeplerStmWork) rather than as objects (jet.ts): the same arithmetic in the same order, no
 * allocation per call.
 */
import type { Vec3 } from '../types.ts';
import { stumpff } from './stumpff.ts';
import { keplerSolve } from './universal-kepler.ts';

/** Two-body state after Δt with its 6x6 state transition matrix (row-major, 36 numbers). */
export interface KeplerStmResult {
  positionKm: Vec3;
  velocityKmS: Vec3;
  /** Φ[i*6+j] = ∂x_i(t0+Δt)/∂x_j(t0), x = (r km, v km/s). */
  stm: number[];
}

/** A jet here: slot s holds its value at [7s] and its gradient ∂/∂(r0, v0) at [7s+1 .. 7s+6]. */
const N = 7;
const R0 = 0, SIGMA0 = 1, ALPHA = 2, CHI = 3, CHI2 = 4, PSI = 5, C2 = 6, C3 = 7;
const U0 = 8, U1 = 9, U2 = 10, U3 = 11, K = 12, R = 13, F = 14, G = 15, F_DOT = 16, G_DOT = 17, T1 = 18, T2 = 19;
const SLOTS = 20;

/** Work space of keplerStmInto: reuse one per caller (not shared between concurrent callers). */
export class KeplerStmWork {
  readonly jets = new Float64Array(SLOTS * N);
}

// In-place jet arithmetic; the output slot may be an input slot. Formulas as jet.ts, in its order.
function mul(w: Float64Array, o: number, a: number, b: number): void {
  const av = w[a * N], bv = w[b * N];
  for (let i = 1; i < N; i++) w[o * N + i] = bv * w[a * N + i] + av * w[b * N + i];
  w[o * N] = av * bv;
}
function div(w: Float64Array, o: number, a: number, b: number): void {
  const bv = w[b * N];
  const q = w[a * N] / bv;
  const ka = 1 / bv, kb = -q / bv;
  for (let i = 1; i < N; i++) w[o * N + i] = ka * w[a * N + i] + kb * w[b * N + i];
  w[o * N] = q;
}
/** o = a + sign·b (sign ±1). */
function add(w: Float64Array, o: number, a: number, b: number, sign: 1 | -1): void {
  for (let i = 1; i < N; i++) w[o * N + i] = w[a * N + i] + sign * w[b * N + i];
  w[o * N] = w[a * N] + sign * w[b * N];
}
/** o = a·k for a number k. */
function scale(w: Float64Array, o: number, a: number, k: number): void {
  for (let i = 1; i < N; i++) w[o * N + i] = k * w[a * N + i];
  w[o * N] = w[a * N] * k;
}
/** o = a/k for a number k (the gradient times 1/k, as jet.ts divides by a number). */
function divideBy(w: Float64Array, o: number, a: number, k: number): void {
  const inv = 1 / k;
  for (let i = 1; i < N; i++) w[o * N + i] = inv * w[a * N + i];
  w[o * N] = w[a * N] / k;
}
/** o = 1 − a. */
function oneMinus(w: Float64Array, o: number, a: number): void {
  for (let i = 1; i < N; i++) w[o * N + i] = -1 * w[a * N + i];
  w[o * N] = -w[a * N] + 1;
}
/** o = h(a) given h(a.v) and h'(a.v). */
function apply(w: Float64Array, o: number, a: number, value: number, derivative: number): void {
  for (let i = 1; i < N; i++) w[o * N + i] = derivative * w[a * N + i];
  w[o * N] = value;
}

/** Universal functions U0..U3 (slots U0..U3) as jets of χ (slot CHI) and α (slot ALPHA). */
function universalJets(w: Float64Array): void {
  mul(w, CHI2, CHI, CHI);
  mul(w, PSI, ALPHA, CHI2);
  const c = stumpff(w[PSI * N]);
  apply(w, C2, PSI, c.c2, c.c4 - c.c3 / 2);
  apply(w, C3, PSI, c.c3, (3 * c.c5 - c.c4) / 2);
  mul(w, U2, CHI2, C2);
  mul(w, T1, CHI2, CHI);
  mul(w, U3, T1, C3);
  mul(w, T1, ALPHA, U3);
  add(w, U1, CHI, T1, -1);
  mul(w, T1, ALPHA, U2);
  oneMinus(w, U0, T1);
}

/** r0 U0 + σ0 U1 + U2 style sums: o = (a·b + c·d) + e. */
function sumOfProducts(w: Float64Array, o: number, a: number, b: number, c: number, d: number, e: number): void {
  mul(w, T1, a, b);
  mul(w, T2, c, d);
  add(w, o, T1, T2, 1);
  add(w, o, o, e, 1);
}

/** The jets of |r0|, σ0 = r0·v0/√μ and α = 2/|r0| − v0²/μ, written directly (they are closed forms of r0, v0). */
function initialJets(w: Float64Array, r0: ArrayLike<number>, v0: ArrayLike<number>, mu: number, sqrtMu: number): void {
  const [x, y, z, vx, vy, vz] = [r0[0], r0[1], r0[2], v0[0], v0[1], v0[2]];
  const rr = Math.sqrt(x * x + y * y + z * z);
  const h = 0.5 / rr;
  const kAlpha = -2 / (rr * rr);
  const grad = [x + x, y + y, z + z];
  const kSigma = 1 / sqrtMu;
  const sigmaGrad = [vx, vy, vz, x, y, z];
  const kMu = 1 / mu;
  const v2Grad = [vx + vx, vy + vy, vz + vz];
  w[R0 * N] = rr;
  w[SIGMA0 * N] = (x * vx + y * vy + z * vz) / sqrtMu;
  w[ALPHA * N] = 2 / rr - (vx * vx + vy * vy + vz * vz) / mu;
  for (let j = 0; j < 6; j++) {
    const dr = j < 3 ? h * grad[j] : 0;
    w[R0 * N + 1 + j] = dr;
    w[SIGMA0 * N + 1 + j] = kSigma * sigmaGrad[j];
    w[ALPHA * N + 1 + j] = kAlpha * dr - (j < 3 ? 0 : kMu * v2Grad[j - 3]);
  }
}

/**
 * Two-body propagation with its analytic state transition matrix, written into caller-owned arrays.
 * @param r0Km initial position, km (inertial axes; outputs in the same axes)
 * @param v0KmS initial velocity, km/s
 * @param dtS time step, s (any sign)
 * @param muKm3S2 GM of the attracting body, km^3/s^2 (> 0)
 * @param stateOut receives (r km, v km/s) after dtS in [0..5]
 * @param stmOut receives Φ row-major in [0..35] (Φ[i*6+j] = ∂x_i(t0+Δt)/∂x_j(t0))
 * @throws InvalidInputError as keplerSolve
 */
export function keplerStmInto(r0Km: ArrayLike<number>, v0KmS: ArrayLike<number>, dtS: number, muKm3S2: number,
  work: KeplerStmWork, stateOut: Float64Array, stmOut: Float64Array | number[]): void {
  const solution = keplerSolve(r0Km, v0KmS, dtS, muKm3S2);
  const w = work.jets;
  const sqrtMu = Math.sqrt(muKm3S2);
  initialJets(w, r0Km, v0KmS, muKm3S2, sqrtMu);

  // χ(x0) implicitly: K(χ, x0) = r0 U1 + σ0 U2 + U3 − √μ Δt = 0, ∂K/∂χ = r  ⇒  dχ/dx0 = −(∂K/∂x0)/r.
  w.fill(0, CHI * N, CHI * N + N);
  w[CHI * N] = solution.chi;
  universalJets(w);
  sumOfProducts(w, K, R0, U1, SIGMA0, U2, U3);
  const rScalar = w[R0 * N] * w[U0 * N] + w[SIGMA0 * N] * w[U1 * N] + w[U2 * N];
  for (let i = 1; i < N; i++) w[CHI * N + i] = -w[K * N + i] / rScalar;

  universalJets(w);
  sumOfProducts(w, R, R0, U0, SIGMA0, U1, U2);
  div(w, T1, U2, R0);
  oneMinus(w, F, T1); // f = 1 − U2/r0
  mul(w, T1, R0, U1);
  mul(w, T2, SIGMA0, U2);
  add(w, G, T1, T2, 1);
  divideBy(w, G, G, sqrtMu); // g = (r0 U1 + σ0 U2)/√μ
  scale(w, T1, U1, -sqrtMu);
  mul(w, T2, R, R0);
  div(w, F_DOT, T1, T2); // ḟ = −√μ U1/(r r0)
  div(w, T1, U2, R);
  oneMinus(w, G_DOT, T1); // ġ = 1 − U2/r

  // r = f r0 + g v0, v = ḟ r0 + ġ v0; r0 and v0 are the independent variables (unit gradients).
  for (let i = 0; i < 3; i++) {
    const x = r0Km[i], v = v0KmS[i];
    for (let j = 0; j < 6; j++) {
      const ex = j === i ? 1 : 0, ev = j === 3 + i ? 1 : 0;
      stmOut[i * 6 + j] = (w[F * N] * ex + x * w[F * N + 1 + j]) + (w[G * N] * ev + v * w[G * N + 1 + j]);
      stmOut[(3 + i) * 6 + j] = (w[F_DOT * N] * ex + x * w[F_DOT * N + 1 + j]) + (w[G_DOT * N] * ev + v * w[G_DOT * N + 1 + j]);
    }
    stateOut[i] = solution.positionKm[i];
    stateOut[3 + i] = solution.velocityKmS[i];
  }
}

/**
 * Two-body propagation with its analytic state transition matrix (allocating form of keplerStmInto).
 * @param r0Km initial position, km (inertial axes; outputs in the same axes)
 * @param v0KmS initial velocity, km/s
 * @param dtS time step, s (any sign)
 * @param muKm3S2 GM of the attracting body, km^3/s^2 (> 0)
 * @throws InvalidInputError as keplerSolve
 */
export function keplerStm(r0Km: readonly number[], v0KmS: readonly number[], dtS: number,
  muKm3S2: number): KeplerStmResult {
  const state = new Float64Array(6);
  const stm: number[] = new Array(36);
  keplerStmInto(r0Km, v0KmS, dtS, muKm3S2, new KeplerStmWork(), state, stm);
  return { positionKm: [state[0], state[1], state[2]], velocityKmS: [state[3], state[4], state[5]], stm };
}
