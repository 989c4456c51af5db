/**
 * Encke's method: the integration vector holds the deviation δ = x − x_ref of the true state from an
 * osculating reference conic x_ref(t), which the universal-variable Kepler solver advances exactly.
 *
 * Deviation acceleration in Battin's cancellation-free form (Battin 1999, §8.4): with ρ the reference
 * position and r = ρ + δ the true position,
 *     δ̈ = −(μ/r³) (δ − f(q) ρ) + a_p,   q = δ·(δ + 2ρ)/ρ²,   f(q) = (1 + q)^{3/2} − 1
 * (f evaluated as q(3 + 3q + q²)/(1 + (1 + q)^{3/2}), forces/battinF), so the difference of the two large
 * central accelerations is never formed by subtraction. a_p is the perturbing acceleration of the same
 * force model Cowell uses (third bodies, J2, SRP), taken as the model's total acceleration minus its
 * central point-mass term at r: that difference carries only the round-off of the total acceleration,
 * i.e. the same absolute error Cowell's right-hand side has.
 *
 * Step control: the deviation is integrated in scaled units y = δ/λ with λ_r = (atol + rtol·|r0|)/atol and
 * λ_v = (atol + rtol·|v0|)/atol (|r0|, |v0| at the run's start), so the stepper's per-component error scale
 * atol + rtol·|y| ≈ atol corresponds to atol + rtol·|x| in km and km/s: the error is judged against the
 * size of the whole state, as Cowell's relative tolerance does, not against the (small) deviation.
 *
 * Rectification: when |δr|/|ρ| exceeds ENCKE_DEFAULTS.rectificationRatio the reference conic is restarted
 * from the current true state (δ = 0); the run counts each one.
 *
 * Clock: inside the right-hand side (and at rectification) the reference conic is advanced by τ, an extra
 * component of the integration vector with τ' = 1 (last entry), not by the epoch label t − t_ref. Near
 * t ~ 1e9 s the stepper's epoch labels carry a rounding of up to 6e-8 s per step that the integrated
 * interval does not; evaluating the conic at the label made δ and Φ inconsistent with ρ (Φ errors of 1e-6
 * measured at t = 8e8 s against 4e-10 at 1e5 s). The Cartesian read-out uses the label.
 *
 * Added acceleration (a thrust arc, finite-burn/thrust-arc-dynamics.ts): an optional term evaluated at the
 * true state (position and velocity) before the force model and added to a_p; runs without the STM only
 * (its partials are not carried here).
 *
 * STM: y[6..41] holds M with Φ = Φ_K(τ)·M (encke-stm.ts): the reference conic's analytic two-body STM
 * carries the fast part of Φ, and the integrated M follows only the deviation's variational part, so the
 * STM costs no extra steps. Φ stays out of the error norm, as in Cowell's variational equations. Φ is a
 * property of the true trajectory, unaffected by rectification (M is folded into Φ at each restart).
 */
import type { ForceModel } from '../forces/index.ts';
import { battinF } from '../forces/index.ts';
import { keplerSolve } from '../kepler/universal-kepler.ts';
import { keplerStmInto, KeplerStmWork } from '../kepler/two-body-stm.ts';
import { deviationStmRatesInto, EnckeStmScratch, foldReferenceStm, keplerGradientInto } from './encke-stm.ts';

/** Settings of Encke's method (dimensionless ratios), one frozen object that code and README point to. */
export const ENCKE_DEFAULTS = Object.freeze({
  /** Rectify when |δr|/|ρ| exceeds this (dimensionless). Battin §8.4 rectifies once the deviation grows
   * large; the value 1e-2 is ours (common practice). */
  rectificationRatio: 1e-2,
  /** Degenerate reference conic guard: |1 − e| below this is treated as parabolic. */
  parabolicGuard: 1e-6,
  /** Degenerate reference conic guard: |r × v| / (|r||v|) below this is rectilinear. */
  rectilinearGuard: 1e-10,
});

/** Why the reference conic of a Cartesian state (km, km/s, any inertial axes, from the attracting body;
 * μ in km³/s²) cannot serve Encke's method — near-parabolic or rectilinear (ENCKE_DEFAULTS guards) — or
 * null when it can. */
export function degenerateReason(state: ArrayLike<number>, mu: number): string | null {
  const [x, y, z, vx, vy, vz] = [state[0], state[1], state[2], state[3], state[4], state[5]];
  const r = Math.hypot(x, y, z);
  const v = Math.hypot(vx, vy, vz);
  const hx = y * vz - z * vy;
  const hy = z * vx - x * vz;
  const hz = x * vy - y * vx;
  const h = Math.hypot(hx, hy, hz);
  if (!(h > ENCKE_DEFAULTS.rectilinearGuard * r * v)) {
    return `zero angular momentum (|h| = ${h.toExponential(3)} km^2/s)`;
  }
  const rv = x * vx + y * vy + z * vz;
  const c = v * v - mu / r;
  const e = Math.hypot(c * x - rv * vx, c * y - rv * vy, c * z - rv * vz) / mu;
  if (Math.abs(1 - e) < ENCKE_DEFAULTS.parabolicGuard) {
    return `near-parabolic reference conic (|1 − e| = ${Math.abs(1 - e).toExponential(3)} < ${ENCKE_DEFAULTS.parabolicGuard})`;
  }
  return null;
}

/** An acceleration added to the force model's, km/s², J2000 equatorial, at the true state (km, km/s, from
 * the model's centre) and epoch TDB s; evaluated before the force model (it may set the model's mass scale). */
export interface AddedAcceleration {
  accelerationInto(epochTdbS: number, state: ArrayLike<number>, out: Float64Array): void;
}

/** Encke formulation over one force model (one central body); shaped as PropagationDynamics. */
export class EnckeDynamics {
  readonly forces: ForceModel;
  readonly withStm: boolean;
  readonly method = 'encke';
  /** The deviation only (Φ stays out of the error norm, as in Cowell's variational equations). */
  readonly errorComponents = 6;
  readonly initialY: Float64Array;
  /** First trial step: 1e-3 of the reference conic's time scale √(r³/μ) (δ = 0 at the start gives the
   * stepper's own estimate nothing to work with). */
  readonly initialStepS: number;
  /** Reference-conic restarts driven by the deviation threshold. */
  rectifications = 0;
  private readonly mu: number;
  private readonly lengthKm: number;
  private readonly speedKmS: number;
  /** Index of Encke's own clock τ (time since the reference epoch) in the integration vector. */
  private readonly clock: number;
  /** The reference conic's start: position (km) and velocity (km/s) at refEpoch. */
  private readonly refR = new Float64Array(3);
  private readonly refV = new Float64Array(3);
  private refEpoch: number;
  private readonly acc = new Float64Array(3);
  private readonly grad = new Float64Array(9);
  private readonly total = new Float64Array(6);
  private readonly scratch = new Float64Array(6);
  private readonly gradK = new Float64Array(9);
  private readonly stmScratch = new EnckeStmScratch();
  // keplerStmInto's work space and outputs: the STM path evaluates it at every right-hand side.
  private readonly keplerWork = new KeplerStmWork();
  private readonly refStateAtTau = new Float64Array(6);
  private readonly refStm = new Float64Array(36);
  private readonly added: AddedAcceleration | null;
  private readonly addedAcc = new Float64Array(3);

  /**
   * @param epoch0 start epoch, TDB s from J2000
   * @param total0 true state at epoch0 (km, km/s, J2000 equatorial, from the force model's centre)
   * @param tolerances the run's relative and absolute tolerances (they set the deviation's scaling)
   * @param added an acceleration added to the force model's (without the STM only)
   */
  constructor(forces: ForceModel, epoch0: number, total0: ArrayLike<number>, withStm: boolean,
    tolerances: { relativeTolerance: number; absoluteTolerance: number }, added: AddedAcceleration | null = null) {
    if (added !== null && withStm) throw new Error('EnckeDynamics: an added acceleration runs without the STM only');
    this.forces = forces;
    this.withStm = withStm;
    this.added = added;
    this.mu = forces.centralGmKm3S2;
    const { relativeTolerance: rtol, absoluteTolerance: atol } = tolerances;
    this.lengthKm = (atol + rtol * Math.hypot(total0[0], total0[1], total0[2])) / atol;
    this.speedKmS = (atol + rtol * Math.hypot(total0[3], total0[4], total0[5])) / atol;
    this.refEpoch = epoch0;
    this.setReference(total0);
    this.initialStepS = 1e-3 * Math.sqrt(Math.hypot(total0[0], total0[1], total0[2]) ** 3 / this.mu);
    this.clock = withStm ? 42 : 6;
    this.initialY = new Float64Array(this.clock + 1);
    if (withStm) for (let i = 0; i < 6; i++) this.initialY[6 + 7 * i] = 1;
  }

  /** Restarts the reference conic at the true state `total` (δ = 0 and τ = 0 from here). */
  private setReference(total: ArrayLike<number>): void {
    for (let i = 0; i < 3; i++) {
      this.refR[i] = total[i];
      this.refV[i] = total[3 + i];
    }
  }

  /** Reference conic after τ seconds (τ from the integration vector, not from the epoch label). */
  private reference(tau: number): { r: number[]; v: number[] } {
    const s = keplerSolve(this.refR, this.refV, tau, this.mu);
    return { r: s.positionKm, v: s.velocityKmS };
  }

  /** Reference conic after τ seconds into refStateAtTau (r km, v km/s) with its analytic STM Φ_K(τ) into
   * refStm (row-major 6x6); no allocation. */
  private referenceWithStm(tau: number): void {
    keplerStmInto(this.refR, this.refV, tau, this.mu, this.keplerWork, this.refStateAtTau, this.refStm);
  }

  readonly rhs = (t: number, y: Float64Array, dydt: Float64Array): void => {
    const L = this.lengthKm;
    const V = this.speedKmS;
    let rho: ArrayLike<number>;
    // The reference velocity, without the STM (where an added acceleration may need the true velocity).
    let refV: ArrayLike<number> = this.refV;
    if (this.withStm) {
      this.referenceWithStm(y[this.clock]);
      rho = this.refStateAtTau;
    } else {
      const ref = this.reference(y[this.clock]);
      rho = ref.r;
      refV = ref.v;
    }
    dydt[this.clock] = 1;
    const d0 = y[0] * L;
    const d1 = y[1] * L;
    const d2 = y[2] * L;
    const tot = this.total;
    tot[0] = rho[0] + d0;
    tot[1] = rho[1] + d1;
    tot[2] = rho[2] + d2;
    const rho2 = rho[0] * rho[0] + rho[1] * rho[1] + rho[2] * rho[2];
    const q = (d0 * (d0 + 2 * rho[0]) + d1 * (d1 + 2 * rho[1]) + d2 * (d2 + 2 * rho[2])) / rho2;
    const f = battinF(q);
    const r2 = tot[0] * tot[0] + tot[1] * tot[1] + tot[2] * tot[2];
    const k = this.mu / (r2 * Math.sqrt(r2));
    // Perturbation = the model's total minus its central term −μr/r³. A perturbation-only evaluation would
    // avoid this cancellation but needs a switch in ForceModel (forces/), which the STM also needs: the
    // gradient must keep the central term. The cost is an absolute round-off of ~1e-16·μ/r² in the
    // perturbation — the same absolute error Cowell carries in its total acceleration.
    const extra = this.addedAcc;
    if (this.added !== null) {
      for (let i = 0; i < 3; i++) tot[3 + i] = refV[i] + y[3 + i] * V;
      this.added.accelerationInto(t, tot, extra);
    }
    this.forces.accelerationInto(t, tot, this.acc, this.withStm ? this.grad : null);
    const acc = this.acc;
    if (this.added !== null) for (let i = 0; i < 3; i++) acc[i] += extra[i];
    dydt[0] = (y[3] * V) / L;
    dydt[1] = (y[4] * V) / L;
    dydt[2] = (y[5] * V) / L;
    dydt[3] = (-k * (d0 - f * rho[0]) + (acc[0] + k * tot[0])) / V;
    dydt[4] = (-k * (d1 - f * rho[1]) + (acc[1] + k * tot[1])) / V;
    dydt[5] = (-k * (d2 - f * rho[2]) + (acc[2] + k * tot[2])) / V;
    if (this.withStm) {
      // ΔG = G(x) − G_K(ρ): the part of the gravity gradient the reference conic's Φ_K does not carry.
      keplerGradientInto(rho, this.mu, this.gradK);
      for (let k = 0; k < 9; k++) this.gradK[k] = this.grad[k] - this.gradK[k];
      deviationStmRatesInto(this.refStm, this.gradK, y, 6, dydt, this.stmScratch);
    }
  };

  /** True state (km, km/s, from the centre) at `epochTdbS` for integration vector y into out[0..5]. */
  cartesianInto(epochTdbS: number, y: Float64Array, out: Float64Array): void {
    // Output at the epoch label (so an unperturbed run reproduces the Kepler solution at that epoch); the
    // dynamics use τ. The two differ by the stepper's accumulated label rounding (~1e-7 s), which only
    // shifts the small deviation δ.
    const { r, v } = this.reference(epochTdbS - this.refEpoch);
    for (let i = 0; i < 3; i++) {
      out[i] = r[i] + y[i] * this.lengthKm;
      out[3 + i] = v[i] + y[3 + i] * this.speedKmS;
    }
  }

  /** |δr| / |ρ| for integration vector y at `epochTdbS`. */
  deviationRatio(_epochTdbS: number, y: Float64Array): number {
    const { r } = this.reference(y[this.clock]);
    return (Math.hypot(y[0], y[1], y[2]) * this.lengthKm) / Math.hypot(r[0], r[1], r[2]);
  }

  /**
   * Rectifies when |δr|/|ρ| is past the threshold: restarts the reference at the true state and zeroes
   * δ in `y` (Φ kept). Returns true when it did (the caller then resets its stepper with y).
   */
  maybeRectify(epochTdbS: number, y: Float64Array): boolean {
    if (this.deviationRatio(epochTdbS, y) <= ENCKE_DEFAULTS.rectificationRatio) return false;
    this.restartAt(epochTdbS, y);
    this.rectifications += 1;
    return true;
  }

  /** Folds the reference conic's STM into y[6..41] and restarts the conic at the current state, so that
   * y[6..41] holds Φ itself (the propagation loop reads Φ there at burns and at the end). */
  settleStm(epochTdbS: number, y: Float64Array): void {
    if (this.withStm) this.restartAt(epochTdbS, y);
  }

  private restartAt(epochTdbS: number, y: Float64Array): void {
    // The new conic starts from the state the dynamics have reached (τ-consistent), labelled epochTdbS.
    const tau = y[this.clock];
    if (this.withStm && tau !== 0) {
      this.referenceWithStm(tau);
      foldReferenceStm(this.refStm, y, 6, this.stmScratch);
    } else {
      const { r, v } = this.reference(tau);
      for (let i = 0; i < 3; i++) {
        this.refStateAtTau[i] = r[i];
        this.refStateAtTau[3 + i] = v[i];
      }
    }
    for (let i = 0; i < 3; i++) {
      this.scratch[i] = this.refStateAtTau[i] + y[i] * this.lengthKm;
      this.scratch[3 + i] = this.refStateAtTau[3 + i] + y[3 + i] * this.speedKmS;
    }
    this.refEpoch = epochTdbS;
    this.setReference(this.scratch);
    for (let i = 0; i < 6; i++) y[i] = 0;
    y[this.clock] = 0;
  }

  /** Subtracts `shift` (km, km/s) from the state at `epochTdbS`; the reference conic restarts at the
   * new state (not counted as a rectification). */
  translate(epochTdbS: number, y: Float64Array, shift: ArrayLike<number>): void {
    for (let i = 0; i < 3; i++) {
      y[i] -= shift[i] / this.lengthKm;
      y[3 + i] -= shift[3 + i] / this.speedKmS;
    }
    this.restartAt(epochTdbS, y);
  }

  /** Adds Δv (km/s, J2000 equatorial, signed for the direction of time) at `epochTdbS`; the reference
   * conic restarts at the new state (not counted as a rectification). */
  applyImpulse(epochTdbS: number, y: Float64Array, dvKmS: ArrayLike<number>): void {
    for (let i = 0; i < 3; i++) y[3 + i] += dvKmS[i] / this.speedKmS;
    this.restartAt(epochTdbS, y);
  }
}
