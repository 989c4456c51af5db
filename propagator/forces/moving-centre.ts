/**
 * A run about a central body C that keeps the physics of a run about a reference body R (what
 * central-body switching needs: switching must change nothing but the numerics).
 *
 * About R, the spacecraft's acceleration is r'' = Σ direct terms − a_R, with a_R the Newtonian
 * acceleration of R from the model's bodies. About C the usual equations subtract a_C instead, and C's
 * Newtonian acceleration is not how the ephemeris moves C relative to R (bodies left out of the model,
 * series fitted to observations): the two runs then differ by far more than integration error.
 *
 * Here C moves relative to R exactly as the ephemeris tabulates it, p(t), and no ephemeris is
 * differentiated. The integration coordinate is y = r − c(t), with c(t) a cubic in τ = t − t_a anchored on
 * the ephemeris state of C at t_a (value, rate, and the Newtonian two-body R–C acceleration and jerk).
 * With ρ = y − d(t), d(t) = p(t) − c(t), the position from C:
 *     y'' = r'' − c''(t) = f_C(ρ) + a_C − a_R − c''(t),
 * where f_C is the usual C-centred acceleration (its indirect terms are −a_C). The last three terms do
 * not depend on the spacecraft (no partials), and y, ρ differ by d, which stays small (km over days for a
 * planet) until the run re-anchors. Because y + c(t) obeys the R-centred equations from the same initial
 * state, the run reproduces the R-centred run to integration accuracy for any ephemeris source.
 * Frame J2000 equatorial; km, s, km/s; TDB s from J2000.
 */
import type { Ephemeris } from '../ephemeris/ephemeris.ts';
import type { BodyName } from '../types.ts';

export class MovingCentre {
  readonly centre: BodyName;
  readonly reference: BodyName;
  /** Offset d = p − c at the last epoch given to update(), km. */
  readonly shiftKm = new Float64Array(3);
  /** a_C − a_R − c'' at the last epoch given to update(), km/s². */
  readonly frameAccelerationKmS2 = new Float64Array(3);
  private readonly ephemeris: Ephemeris;
  private readonly centreGm: number;
  private readonly pairGm: number;
  private readonly referenceIndex: number;
  private readonly perturbingGm: Float64Array;
  /** Anchor: epoch and C relative to R (position, velocity, two-body acceleration, jerk). */
  private anchorEpoch = Number.NaN;
  private readonly anchor = new Float64Array(12);
  private readonly scratch = new Float64Array(6);

  /**
   * @param referenceIndex index of R among the model's perturbing bodies (whose positions, km from C,
   *   update() receives); perturbingGm their GM (km³/s²); centreGm the GM of C
   */
  constructor(ephemeris: Ephemeris, centre: BodyName, reference: BodyName, centreGm: number,
    referenceIndex: number, perturbingGm: Float64Array) {
    this.ephemeris = ephemeris;
    this.centre = centre;
    this.reference = reference;
    this.centreGm = centreGm;
    this.referenceIndex = referenceIndex;
    this.perturbingGm = perturbingGm;
    this.pairGm = centreGm + perturbingGm[referenceIndex];
  }

  /** True once anchor() has been called. */
  get anchored(): boolean {
    return !Number.isNaN(this.anchorEpoch);
  }

  /** Restarts the cubic c(t) on the ephemeris state of C relative to R at `epochTdbS` (d = 0 there). */
  anchorAt(epochTdbS: number): void {
    const a = this.anchor;
    this.ephemeris.stateInto(this.centre, this.reference, epochTdbS, a, 0);
    const [x, y, z, vx, vy, vz] = [a[0], a[1], a[2], a[3], a[4], a[5]];
    const r2 = x * x + y * y + z * z;
    const k = this.pairGm / (r2 * Math.sqrt(r2));
    const rv = (3 * (x * vx + y * vy + z * vz)) / r2;
    a[6] = -k * x;
    a[7] = -k * y;
    a[8] = -k * z;
    a[9] = -k * (vx - rv * x);
    a[10] = -k * (vy - rv * y);
    a[11] = -k * (vz - rv * z);
    this.anchorEpoch = epochTdbS;
  }

  /** c(t) − c(t_a) (km) into out[0..2] and, when `withRate`, ċ(t) (km/s) into out[3..5]. The anchor
   * position is left out so callers subtract it from the ephemeris position first: two nearby large
   * numbers subtract exactly, so d carries only the ephemeris's own rounding. */
  private cubicInto(epochTdbS: number, out: Float64Array, withRate: boolean): void {
    const a = this.anchor;
    const t = epochTdbS - this.anchorEpoch;
    const h = 0.5 * t * t;
    const c = (h * t) / 3;
    for (let i = 0; i < 3; i++) {
      out[i] = a[3 + i] * t + a[6 + i] * h + a[9 + i] * c;
      if (withRate) out[3 + i] = a[3 + i] + a[6 + i] * t + a[9 + i] * h;
    }
  }

  /**
   * From the perturbing bodies' positions at `epochTdbS` (km from C, 3 per body, the model's order) sets
   * shiftKm = d(t) and frameAccelerationKmS2 = a_C − a_R − c''(t). No allocation.
   */
  update(epochTdbS: number, bodyPositionsKm: Float64Array): void {
    const pos = bodyPositionsKm;
    const gms = this.perturbingGm;
    const k0 = 3 * this.referenceIndex;
    const sx = pos[k0];
    const sy = pos[k0 + 1];
    const sz = pos[k0 + 2];
    // a_C − a_R: every body's pull on C minus its pull on R (C's own pull on R included, R's on C).
    let ax = 0;
    let ay = 0;
    let az = 0;
    for (let b = 0; b < gms.length; b++) {
      const bx = pos[3 * b];
      const by = pos[3 * b + 1];
      const bz = pos[3 * b + 2];
      const b2 = bx * bx + by * by + bz * bz;
      const kb = gms[b] / (b2 * Math.sqrt(b2));
      ax += kb * bx;
      ay += kb * by;
      az += kb * bz;
      if (3 * b === k0) continue;
      const dx = bx - sx;
      const dy = by - sy;
      const dz = bz - sz;
      const d2 = dx * dx + dy * dy + dz * dz;
      const kd = gms[b] / (d2 * Math.sqrt(d2));
      ax -= kd * dx;
      ay -= kd * dy;
      az -= kd * dz;
    }
    const s2 = sx * sx + sy * sy + sz * sz;
    const kc = this.centreGm / (s2 * Math.sqrt(s2));
    ax += kc * sx;
    ay += kc * sy;
    az += kc * sz;
    const a = this.anchor;
    const t = epochTdbS - this.anchorEpoch;
    const c = this.scratch;
    this.cubicInto(epochTdbS, c, false);
    // p = −s (C from R); d = p − c.
    this.shiftKm[0] = (-sx - a[0]) - c[0];
    this.shiftKm[1] = (-sy - a[1]) - c[1];
    this.shiftKm[2] = (-sz - a[2]) - c[2];
    this.frameAccelerationKmS2[0] = ax - (a[6] + a[9] * t);
    this.frameAccelerationKmS2[1] = ay - (a[7] + a[10] * t);
    this.frameAccelerationKmS2[2] = az - (a[8] + a[11] * t);
  }

  /** d(t) and ḋ(t) (km, km/s) into out[0..5] from the ephemeris state of C relative to R at `epochTdbS`:
   * the read-out of the position and velocity from C is y − d, ẏ − ḋ. */
  shiftStateInto(epochTdbS: number, out: Float64Array): void {
    const c = this.scratch;
    this.ephemeris.stateInto(this.centre, this.reference, epochTdbS, out, 0);
    this.cubicInto(epochTdbS, c, true);
    for (let i = 0; i < 3; i++) out[i] = (out[i] - this.anchor[i]) - c[i];
    for (let i = 3; i < 6; i++) out[i] -= c[i];
  }
}
