/**
 * B-plane geometry of a hyperbolic approach and its exact partial derivatives with respect to the
 * approach state (for a targeting Jacobian).
 *
 * Definitions (Kizner 1961; Sergeyevsky, Snyder & Cunniff 1983, "Interplanetary Mission Design Handbook",
 * JPL Publ. 82-43, B-plane section): Ŝ is the direction of the incoming asymptote (velocity at infinity on
 * approach); T̂ = (Ŝ × k̂)/|Ŝ × k̂| with k̂ the pole of the reference plane; R̂ = Ŝ × T̂; B is the vector
 * from the body's centre to the point where the incoming asymptote pierces the plane normal to Ŝ;
 * θ = atan2(B·R, B·T).
 *
 * Closed forms used (derived from the conic; e = eccentricity vector, h = r × v, v∞² = v² − 2μ/r):
 *   Ŝ = [e + (v∞/μ) h × e] / e²,   B = [(μ(e²−1)/v∞²) e − (1/v∞) h × e] / e²,   |B| = μ√(e²−1)/v∞².
 * Time to periapsis from the hyperbolic Kepler equation M = e sinh H − H, e sinh H = r·v/√(μ|a|).
 * Linearized time of flight: −(r·Ŝ)/v∞, the time to reach the B-plane moving in a straight line along
 * the asymptote at v∞ (the rectilinear model of the encounter; it differs from the time to periapsis by
 * the slowly varying gravitational delay).
 * Partials: every quantity is computed once on forward-mode jets, so the derivatives are exact (chain
 * rule on these closed forms, no finite differences).
 */
import { InvalidInputError } from '../../contract/errors.ts';
import { Jet, type Jet3, cross3, dot3, scale3, stateJets } from '../kepler/jet.ts';
import type { BodyName, Vec3 } from '../types.ts';
import { type BPlaneReference, referencePole } from './reference-plane.ts';

/** B-plane quantities of one approach. Vectors J2000 equatorial; km, s, km/s, rad. */
export interface BPlane {
  sHat: Vec3;
  tHat: Vec3;
  rHat: Vec3;
  bVectorKm: Vec3;
  bDotTKm: number;
  bDotRKm: number;
  bMagnitudeKm: number;
  /** atan2(B·R, B·T), rad, (−π, π]. */
  thetaRad: number;
  vInfinityKmS: number;
  eccentricity: number;
  periapsisRadiusKm: number;
  /** Time from the state's epoch to periapsis on the osculating hyperbola, s (negative after periapsis). */
  timeToPeriapsisS: number;
  /** −(r·Ŝ)/v∞, s: straight-line time to the B-plane along the asymptote. */
  linearizedTimeOfFlightS: number;
  referencePlane: BPlaneReference;
}

/** The scalar outputs that have partials, in the row order of BPlanePartials.rows. */
export const B_PLANE_PARTIAL_ROWS = [
  'bDotTKm', 'bDotRKm', 'bMagnitudeKm', 'thetaRad', 'timeToPeriapsisS', 'linearizedTimeOfFlightS',
] as const;

/** A B-plane with the analytic partials of its scalars with respect to the approach state. */
export interface BPlanePartials {
  value: BPlane;
  /** rows[k][j] = ∂(quantity k)/∂(state j), state = (r km, v km/s) relative to the body, J2000 equatorial. */
  rows: Record<(typeof B_PLANE_PARTIAL_ROWS)[number], number[]>;
}

function jets(state: readonly number[], mu: number, gradients: 'state' | 'none') {
  const { r, v } = stateJets(state, gradients);
  const rm = dot3(r, r).sqrt();
  const v2 = dot3(v, v);
  const rv = dot3(r, v);
  const energyTerm = v2.sub(rm.apply(2 * mu / rm.v, -2 * mu / (rm.v * rm.v))); // v∞² = v² − 2μ/r
  const h = cross3(r, v);
  const muOverR = rm.apply(mu / rm.v, -mu / (rm.v * rm.v));
  const ev: Jet3 = [0, 1, 2].map((i) => v2.sub(muOverR).mul(r[i]).sub(rv.mul(v[i])).div(mu)) as Jet3;
  const e2 = dot3(ev, ev);
  return { r, rm, rv, energyTerm, h, ev, e2 };
}

/**
 * B-plane of a state relative to the approached body; derivatives in `partials` when asked.
 * @param stateRelToBody [x, y, z km, vx, vy, vz km/s] relative to the body, J2000 equatorial
 * @param muKm3S2 the body's GM, km^3/s^2 (> 0)
 * @param referencePlane 'ecliptic' (J2000 mean ecliptic) or 'equator' (needs `body`)
 * @param body the approached body, for the equator pole
 * @throws InvalidInputError when the state is not on a hyperbola about the body (e ≤ 1 or v∞² ≤ 0), or
 *   when Ŝ is parallel to the reference pole (T undefined)
 */
export function bPlanePartials(stateRelToBody: readonly number[], muKm3S2: number,
  referencePlane: BPlaneReference = 'ecliptic', body?: BodyName): BPlanePartials {
  const { value, scalars } = bPlaneJets(stateRelToBody, muKm3S2, referencePlane, body, 'state');
  const row = (j: Jet) => Array.from(j.d);
  return { value, rows: {
    bDotTKm: row(scalars.bt), bDotRKm: row(scalars.br), bMagnitudeKm: row(scalars.bMag), thetaRad: row(scalars.theta),
    timeToPeriapsisS: row(scalars.tp), linearizedTimeOfFlightS: row(scalars.ltof),
  } };
}

/** The B-plane on jets (see bPlanePartials): with gradients 'none' the jets carry no derivatives, and every
 * value comes from the same operations in the same order, so it is the same number to the last bit. */
function bPlaneJets(stateRelToBody: readonly number[], muKm3S2: number, referencePlane: BPlaneReference,
  body: BodyName | undefined, gradients: 'state' | 'none'): { value: BPlane; scalars: Record<'bt' | 'br' | 'bMag' | 'theta' | 'tp' | 'ltof', Jet> } {
  if (stateRelToBody.length !== 6 || !stateRelToBody.every(Number.isFinite)) {
    throw new InvalidInputError('stateRelToBody', 'must be six finite numbers (km, km/s)');
  }
  if (!(muKm3S2 > 0)) throw new InvalidInputError('muKm3S2', `must be > 0, got ${muKm3S2}`);
  const pole = referencePole(referencePlane, body);
  const mu = muKm3S2;
  const n = gradients === 'none' ? 0 : 6;
  const { r, rm, rv, energyTerm, h, ev, e2 } = jets(stateRelToBody, mu, gradients);
  if (!(energyTerm.v > 0) || !(e2.v > 1)) {
    throw new InvalidInputError('stateRelToBody', `not on a hyperbola about ${body ?? 'the body'}: `
      + `e = ${Math.sqrt(e2.v).toPrecision(6)}, v∞² = ${energyTerm.v.toPrecision(6)} km^2/s^2 at r = ${rm.v.toPrecision(6)} km`);
  }
  const vInf = energyTerm.sqrt();
  const hxe = cross3(h, ev);
  const sHat: Jet3 = [0, 1, 2].map((i) => ev[i].add(vInf.div(mu).mul(hxe[i])).div(e2)) as Jet3;
  const e2m1 = e2.sub(1);
  const bCoef = e2m1.mul(mu).div(energyTerm);
  const bVec: Jet3 = [0, 1, 2].map((i) => bCoef.mul(ev[i]).sub(hxe[i].div(vInf)).div(e2)) as Jet3;
  const k: Jet3 = pole.map((c) => Jet.constant(c, n)) as Jet3;
  const sxk = cross3(sHat, k);
  const sxkNorm = dot3(sxk, sxk).sqrt();
  if (!(sxkNorm.v > 1e-10)) {
    throw new InvalidInputError('referencePlane', 'incoming asymptote is parallel to the reference pole: T undefined');
  }
  const tHat = scale3(sxk, Jet.constant(1, n).div(sxkNorm));
  const rHat = cross3(sHat, tHat);
  const bt = dot3(bVec, tHat);
  const br = dot3(bVec, rHat);
  const bMag = e2m1.sqrt().mul(mu).div(energyTerm);
  const den = bt.v * bt.v + br.v * br.v;
  const theta = new Jet(Math.atan2(br.v, bt.v), bt.d.map((dx, i) => (bt.v * br.d[i] - br.v * dx) / den));
  // Time to periapsis: |a| = μ/v∞², n = v∞³/μ, σ = e sinh H = r·v/√(μ|a|) = r·v·v∞/μ.
  const e = e2.sqrt();
  const sigma = rv.mul(vInf).div(mu);
  const x = sigma.div(e);
  const bigH = x.apply(Math.asinh(x.v), 1 / Math.sqrt(1 + x.v * x.v));
  const meanAnomaly = sigma.sub(bigH);
  const tp = meanAnomaly.mul(mu).div(energyTerm.mul(vInf)).neg();
  const ltof = dot3(r, sHat).div(vInf).neg();
  const rp = e.sub(1).mul(mu).div(energyTerm); // r_p = |a|(e − 1)
  const val = (j: Jet3) => j.map((c) => c.v) as Vec3;
  const value: BPlane = {
    sHat: val(sHat), tHat: val(tHat), rHat: val(rHat), bVectorKm: val(bVec), bDotTKm: bt.v, bDotRKm: br.v,
    bMagnitudeKm: bMag.v, thetaRad: theta.v, vInfinityKmS: vInf.v, eccentricity: e.v, periapsisRadiusKm: rp.v,
    timeToPeriapsisS: tp.v, linearizedTimeOfFlightS: ltof.v, referencePlane,
  };
  return { value, scalars: { bt, br, bMag, theta, tp, ltof } };
}

/**
 * B-plane of a state relative to the approached body (values only; see bPlanePartials for the
 * definitions, units, frames and errors).
 */
export function computeBPlane(stateRelToBody: readonly number[], muKm3S2: number,
  referencePlane: BPlaneReference = 'ecliptic', body?: BodyName): BPlane {
  return bPlaneJets(stateRelToBody, muKm3S2, referencePlane, body, 'none').value;
}
