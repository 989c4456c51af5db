/**
 * The force model compiled from a ForceModelSpec and an ephemeris: evaluates the spacecraft's
 * acceleration (km/s^2, J2000 equatorial, relative to the central body) and, on request, its analytic
 * gradient ∂a/∂r (1/s^2; ∂a/∂v = 0 for every force here). No allocation per evaluation.
 */
import type { BodyPositionsPlan, Ephemeris } from '../ephemeris/ephemeris.ts';
import { planBodyPositions } from '../ephemeris/body-positions-plan.ts';
import type { ForceModelSpec } from '../run/propagation-types.ts';
import type { BodyName } from '../types.ts';
import { checkForceModel, type CheckedForceModel } from './force-model-checks.ts';
import { addJ2 } from './zonal-j2.ts';
import { addPointMass } from './point-mass.ts';
import { addSolarPressure } from './solar-pressure.ts';
import { addThirdBody } from './third-body.ts';
import { MovingCentre } from './moving-centre.ts';

export class ForceModel {
  readonly centralBody: BodyName;
  readonly centralGmKm3S2: number;
  readonly centralRadiusKm: number;
  readonly perturbingBodies: readonly BodyName[];
  readonly perturbingGmKm3S2: Float64Array;
  readonly perturbingRadiiKm: Float64Array;
  /** Positions (km, from the central body) of the perturbing bodies at the last evaluated epoch. */
  readonly bodyPositionsKm: Float64Array;
  readonly ephemeris: Ephemeris;
  /** Present when the spec's referenceBody differs from the central body: the state handed to
   * accelerationInto is then the shifted coordinate y of moving-centre.ts, not the position from the centre. */
  readonly movingCentre: MovingCentre | null;
  /** Number of acceleration evaluations so far. */
  evaluations = 0;
  /** Spec mass over current mass (dimensionless, > 0): scales the SRP term while a finite burn burns
   * propellant (SRP acceleration goes as area over mass). 1 unless a thrust arc sets it. */
  srpMassScale = 1;
  private readonly config: CheckedForceModel;
  private readonly sunPosition = new Float64Array(3);
  /** All perturbers relative to the central body in one call per epoch; the Sun alone when SRP needs it
   * and it is not a perturber. */
  private readonly bodyPlan: BodyPositionsPlan;
  private readonly sunPlan: BodyPositionsPlan | null;
  private lastEpoch = Number.NaN;

  /** Validates the spec (InvalidInputError naming the field) and prepares buffers. */
  constructor(spec: ForceModelSpec, ephemeris: Ephemeris) {
    this.config = checkForceModel(spec, ephemeris);
    this.ephemeris = ephemeris;
    this.centralBody = spec.centralBody;
    this.centralGmKm3S2 = this.config.centralGm;
    this.centralRadiusKm = this.config.centralRadiusKm;
    this.perturbingBodies = this.config.perturbingBodies;
    this.perturbingGmKm3S2 = Float64Array.from(this.config.perturbingGm);
    this.perturbingRadiiKm = Float64Array.from(this.config.perturbingRadiiKm);
    this.bodyPositionsKm = new Float64Array(3 * this.perturbingBodies.length);
    this.bodyPlan = planBodyPositions(ephemeris, this.perturbingBodies, this.centralBody);
    const srp = this.config.solarPressure;
    this.sunPlan = srp !== null && srp.sunIndex < 0 && this.centralBody !== 'sun'
      ? planBodyPositions(ephemeris, ['sun'], this.centralBody) : null;
    const ref = this.config.referenceIndex;
    this.movingCentre = ref < 0 ? null
      : new MovingCentre(ephemeris, this.centralBody, this.perturbingBodies[ref], this.centralGmKm3S2, ref, this.perturbingGmKm3S2);
  }

  /** Moving centre only: restarts its cubic at `epochTdbS` (TDB s from J2000); the caller shifts its
   * integration vector by the offset d it had there (see moving-centre.ts). */
  anchorMovingCentre(epochTdbS: number): void {
    if (this.movingCentre === null) return;
    this.movingCentre.anchorAt(epochTdbS);
    this.lastEpoch = Number.NaN;
  }

  /** Looks up the perturbing bodies' positions at `epochTdbS` (cached for repeated calls at one epoch). */
  updateBodies(epochTdbS: number): void {
    if (epochTdbS === this.lastEpoch) return;
    if (this.perturbingBodies.length > 0) this.bodyPlan.positionsInto(epochTdbS, this.bodyPositionsKm, 0);
    if (this.sunPlan !== null) this.sunPlan.positionsInto(epochTdbS, this.sunPosition, 0);
    this.movingCentre?.update(epochTdbS, this.bodyPositionsKm);
    this.lastEpoch = epochTdbS;
  }

  /** Position (km, from the central body) of perturbing body `index` at `epochTdbS` into out[0..2]. Reuses
   * the last evaluation's look-up when the epoch matches (e.g. at the end of an accepted step); otherwise
   * looks up all perturbers at once, since callers (the impact check) go through every body in turn. */
  bodyPositionInto(index: number, epochTdbS: number, out: Float64Array): void {
    this.updateBodies(epochTdbS);
    out[0] = this.bodyPositionsKm[3 * index];
    out[1] = this.bodyPositionsKm[3 * index + 1];
    out[2] = this.bodyPositionsKm[3 * index + 2];
  }

  /**
   * Acceleration at `epochTdbS` (TDB s from J2000) for the spacecraft at position state[0..2] (km,
   * J2000 equatorial, from the central body) into acc[0..2] (km/s^2); the 3x3 row-major ∂a/∂r into
   * partials[0..8] (1/s^2) when given. With a moving centre, state[0..2] is the shifted coordinate y and
   * acc is y'' (moving-centre.ts); the partials are the same.
   */
  accelerationInto(epochTdbS: number, state: Float64Array, acc: Float64Array, partials: Float64Array | null): void {
    this.evaluations += 1;
    this.updateBodies(epochTdbS);
    const moving = this.movingCentre;
    const rx = moving === null ? state[0] : state[0] - moving.shiftKm[0];
    const ry = moving === null ? state[1] : state[1] - moving.shiftKm[1];
    const rz = moving === null ? state[2] : state[2] - moving.shiftKm[2];
    acc[0] = moving === null ? 0 : moving.frameAccelerationKmS2[0];
    acc[1] = moving === null ? 0 : moving.frameAccelerationKmS2[1];
    acc[2] = moving === null ? 0 : moving.frameAccelerationKmS2[2];
    if (partials !== null) partials.fill(0);
    addPointMass(this.centralGmKm3S2, rx, ry, rz, acc, partials);
    const pos = this.bodyPositionsKm;
    const gms = this.perturbingGmKm3S2;
    for (let b = 0; b < gms.length; b++) {
      addThirdBody(gms[b], rx, ry, rz, pos[3 * b], pos[3 * b + 1], pos[3 * b + 2], acc, partials);
    }
    const j2 = this.config.j2;
    if (j2 !== null) addJ2(this.centralGmKm3S2, j2.j2, j2.radiusKm, rx, ry, rz, acc, partials);
    const srp = this.config.solarPressure;
    if (srp !== null) {
      let sx = 0;
      let sy = 0;
      let sz = 0;
      if (srp.sunIndex >= 0) {
        sx = pos[3 * srp.sunIndex];
        sy = pos[3 * srp.sunIndex + 1];
        sz = pos[3 * srp.sunIndex + 2];
      } else if (this.centralBody !== 'sun') {
        sx = this.sunPosition[0];
        sy = this.sunPosition[1];
        sz = this.sunPosition[2];
      }
      addSolarPressure(srp.strength * this.srpMassScale, rx, ry, rz, sx, sy, sz, srp.occulterRadiusKm, acc, partials);
    }
  }
}
