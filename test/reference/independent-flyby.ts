/**
 * An INDEPENDENT re-flight of the demo flyby plan (shares no code with the project's propagator): odex (npm
 * 2.0.4, Hairer & Wanner's GBS extrapolation integrator) integrates heliocentric motion under the Sun, the
 * perturbing planets as point masses (direct and indirect terms, e.g. Battin, An Introduction to the
 * Mathematics and Methods of Astrodynamics, §8.4) with positions straight from astronomy-engine (npm
 * 2.1.19), and cannonball solar radiation pressure a = C_R (Φ/c)(A/m)(1 au/ρ)² ρ̂ (Montenbruck & Gill,
 * Satellite Orbits, §3.4; Φ = 1361 W/m², IAU 2015 Resolution B3). The closest approach is the root of r·v
 * relative to Mars and the B-plane is built from the textbook definitions (Kizner 1961): Ŝ the incoming
 * asymptote, T̂ = Ŝ×k̂/|Ŝ×k̂| with k̂ the ecliptic pole (astronomy-engine's J2000 ecliptic rotation),
 * R̂ = Ŝ×T̂, B = (h/v∞) Ŝ×ĥ. GMs are the DE440 values (Park et al. 2021, Table 8 — the same published
 * numbers the project uses). `marsOffsetKm` moves Mars by a constant vector (J2000 equatorial) in the
 * whole re-flight, for flights on an ephemeris that differs from the built-in one by a known offset.
 * A finite burn is flown as constant thrust F along a fixed inertial direction with the mass integrated
 * (m' = −ṁ; the thrust acceleration F/m and the solar pressure's 1/m follow it), read from the plan's
 * `finite` block alone.
 */
import { createRequire } from 'node:module';
import { AstroTime, Body, HelioState, HelioVector, Rotation_ECL_EQJ, RotateVector, Vector } from 'astronomy-engine';
import { expect } from 'vitest';
import type { ManeuverPlan, PlanningProblem } from '../../planner/index.ts';

const TerrestrialTime = (ttDays: number): AstroTime => AstroTime.FromTerrestrialTime(ttDays);

interface OdexSolver {
  absoluteTolerance: number | number[]; relativeTolerance: number | number[]; maxSteps: number;
  solve(f: (x: number, y: number[]) => number[], x0: number, y0: number[], x1: number): { y: number[]; outcome: number };
}
const odex = createRequire(import.meta.url)('odex') as { Solver: new (n: number) => OdexSolver };

const KM_PER_AU = 149597870.7; // IAU 2012 Resolution B2 (exact)
const DAY_S = 86400;
// DE440 GMs, km³/s² (Park et al. 2021, Table 8; from memory): planets beyond Mars as system values.
const GM: Record<string, number> = {
  sun: 132712440041.279419, venus: 324858.592, earth: 398600.435507, mars: 42828.375816,
  jupiter: 126712764.1, saturn: 37940584.8418,
};
const BODY: Record<string, Body> = { venus: Body.Venus, earth: Body.Earth, mars: Body.Mars, jupiter: Body.Jupiter, saturn: Body.Saturn };
const SRP_1AU_N_M2 = 1361 / 299792458;

function helioKm(body: string, tdbS: number, marsOffsetKm: readonly number[]): number[] {
  const v = HelioVector(BODY[body], TerrestrialTime(tdbS / DAY_S)); // TT ≈ TDB (|TDB − TT| < 2 ms)
  const o = body === 'mars' ? marsOffsetKm : [0, 0, 0];
  return [v.x * KM_PER_AU + o[0], v.y * KM_PER_AU + o[1], v.z * KM_PER_AU + o[2]];
}

/** Constant thrust along a fixed J2000 equatorial unit direction, N and kg/s. */
export interface InertialThrust { thrustN: number; massFlowKgS: number; direction: readonly number[] }

/** [r, v, m] (km, km/s, kg; Sun-centred J2000 equatorial) carried from t0 to t1 (TDB s), thrusting when `thrust` is given. */
function propagateIndependently(problem: PlanningProblem, y0: number[], t0: number, t1: number,
  marsOffsetKm: readonly number[], thrust?: InertialThrust): number[] {
  const bodies = problem.forceModel.perturbingBodies;
  const sp = problem.spacecraft.solarPressure;
  // C_R (Φ/c) A (1 au)², kg·km³/s²: divided by the current mass and r³ it gives the SRP acceleration's factor.
  const srpTimesMass = problem.forceModel.solarPressure && sp ? (sp.reflectivityCoefficient * SRP_1AU_N_M2 * sp.areaM2 / 1000) * KM_PER_AU ** 2 : 0;
  const f = (x: number, y: number[]): number[] => {
    const t = t0 + x;
    const r = Math.hypot(y[0], y[1], y[2]);
    const k = (-GM.sun + srpTimesMass / y[6]) / r ** 3;
    const a = [k * y[0], k * y[1], k * y[2]];
    for (const b of bodies) {
      const p = helioKm(b, t, marsOffsetKm);
      const d = [p[0] - y[0], p[1] - y[1], p[2] - y[2]];
      const dn = Math.hypot(...d);
      const pn = Math.hypot(...p);
      for (let i = 0; i < 3; i++) a[i] += GM[b] * (d[i] / dn ** 3 - p[i] / pn ** 3);
    }
    if (thrust !== undefined) for (let i = 0; i < 3; i++) a[i] += (thrust.thrustN / 1000 / y[6]) * thrust.direction[i];
    return [y[3], y[4], y[5], ...a, thrust === undefined ? 0 : -thrust.massFlowKgS];
  };
  const solver = new odex.Solver(7);
  solver.relativeTolerance = 1e-13;
  solver.absoluteTolerance = [1e-5, 1e-5, 1e-5, 1e-11, 1e-11, 1e-11, 1e-9];
  solver.maxSteps = 200000;
  const res = solver.solve(f, 0, y0, t1 - t0);
  expect(res.outcome).toBe(0);
  return res.y;
}

function marsRelative(y: number[], tdbS: number, o: readonly number[]): number[] {
  const s = HelioState(Body.Mars, TerrestrialTime(tdbS / DAY_S));
  const k = KM_PER_AU / DAY_S;
  return [y[0] - s.x * KM_PER_AU - o[0], y[1] - s.y * KM_PER_AU - o[1], y[2] - s.z * KM_PER_AU - o[2],
    y[3] - s.vx * k, y[4] - s.vy * k, y[5] - s.vz * k];
}

export const cross = (a: number[], b: number[]): number[] => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
export const dot = (a: number[], b: number[]): number => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
const unit = (a: number[]): number[] => a.map((v) => v / Math.hypot(a[0], a[1], a[2]));

/** B·T, B·R (km) and the B-plane axes Ŝ, T̂, R̂ (J2000 equatorial) of a Mars-relative state. */
export function bPlane(rel: number[]): { bDotTKm: number; bDotRKm: number; axes: number[][] } {
  const mu = GM.mars;
  const r = rel.slice(0, 3);
  const v = rel.slice(3);
  const h = cross(r, v);
  const vinf = Math.sqrt(dot(v, v) - (2 * mu) / Math.hypot(...r));
  const ev = r.map((ri, i) => ((dot(v, v) - mu / Math.hypot(...r)) * ri - dot(r, v) * v[i]) / mu);
  const e = Math.hypot(...ev);
  const eh = unit(ev);
  const hh = unit(h);
  const hxe = cross(hh, eh);
  const s = eh.map((x, i) => x / e + (Math.sqrt(e * e - 1) / e) * hxe[i]);
  const poleVec = RotateVector(Rotation_ECL_EQJ(), new Vector(0, 0, 1, TerrestrialTime(0)));
  const k = [poleVec.x, poleVec.y, poleVec.z];
  const tHat = unit(cross(s, k));
  const rHat = cross(s, tHat);
  const b = cross(s, hh).map((x) => (x * Math.hypot(...h)) / vinf);
  return { bDotTKm: dot(b, tHat), bDotRKm: dot(b, rHat), axes: [s, tHat, rHat] };
}


/** A burn as the re-flight flies it: impulsive (Δv at an epoch) or finite (inertial thrust from ignition). */
export type FlownBurn =
  | { model: 'impulsive'; epochTdbS: number; deltaVInertialKmS: readonly number[]; massBeforeKg: number; massAfterKg: number }
  | { model: 'finite'; startTdbS: number; durationS: number; massBeforeKg: number; thrust: InertialThrust };

/** The plan's first burn as the plan JSON states it (a finite burn from its `finite` block; inertial axes only). */
export function plannedBurn(plan: ManeuverPlan): FlownBurn {
  const b = plan.burns[0];
  const f = b.finite;
  if (b.model !== 'finite' || f === undefined) {
    return { model: 'impulsive', epochTdbS: b.epoch.tdbS, deltaVInertialKmS: b.deltaVInertialKmS, massBeforeKg: b.massBeforeKg, massAfterKg: b.massAfterKg };
  }
  if (f.axes !== 'inertial') throw new Error(`the re-flight holds the thrust inertially; the plan's burn is held in ${f.axes} axes`);
  return { model: 'finite', startTdbS: f.startTdbS, durationS: f.durationS, massBeforeKg: f.massBeforeKg,
    thrust: { thrustN: f.thrustN, massFlowKgS: f.massFlowKgS, direction: f.directionInertial } };
}

/** The state [r, v, m] just after `burn` (at the impulse, or at cut-off) and its epoch. */
function flyBurn(problem: PlanningProblem, y0: number[], t0: number, burn: FlownBurn, o: readonly number[]): { y: number[]; tdbS: number } {
  if (burn.model === 'impulsive') {
    const yb = propagateIndependently(problem, [...y0, burn.massBeforeKg], t0, burn.epochTdbS, o);
    return { y: [...yb.slice(0, 3), ...yb.slice(3, 6).map((v, i) => v + burn.deltaVInertialKmS[i]), burn.massAfterKg], tdbS: burn.epochTdbS };
  }
  const ys = propagateIndependently(problem, [...y0, burn.massBeforeKg], t0, burn.startTdbS, o);
  const end = burn.startTdbS + burn.durationS;
  return { y: propagateIndependently(problem, ys, burn.startTdbS, end, o, burn.thrust), tdbS: end };
}

/** The plan's burn flown independently from the problem's initial state (or `burn`, e.g. an impulsive
 * plan flown as a finite burn); the closest approach to Mars (moved by `marsOffsetKm`) found as the root
 * of r·v by secant steps from the plan's requested epoch. */
export function reflyDemoPlan(problem: PlanningProblem, plan: ManeuverPlan, marsOffsetKm: readonly number[] = [0, 0, 0], burn: FlownBurn = plannedBurn(plan)):
  { bDotTKm: number; bDotRKm: number; closestApproachTdbS: number; axes: number[][] } {
  const t0 = plan.createdFrom.initialEpoch.tdbS;
  const y0 = [...problem.initialState.positionKm, ...problem.initialState.velocityKmS];
  const after = flyBurn(problem, y0, t0, burn, marsOffsetKm);
  const tGuess = plan.targets.find((t) => t.kind === 'closest-approach-epoch')?.requested as number;
  // Carry to one hour before the requested approach (or the burn's end, if later), then find the root of
  // r·v (secant on short arcs).
  const tStart = Math.max(tGuess - 3600, after.tdbS);
  const yStart = propagateIndependently(problem, after.y, after.tdbS, tStart, marsOffsetKm);
  const g = (t: number): { g: number; rel: number[] } => {
    const y = propagateIndependently(problem, yStart, tStart, t, marsOffsetKm);
    const rel = marsRelative(y, t, marsOffsetKm);
    return { g: dot(rel.slice(0, 3), rel.slice(3)), rel };
  };
  let ta = Math.max(tGuess - 600, tStart);
  let tb = tGuess + 600;
  let ga = g(ta).g;
  let gb = g(tb).g;
  for (let i = 0; i < 30 && Math.abs(tb - ta) > 1e-4; i++) {
    const tc = tb - (gb * (tb - ta)) / (gb - ga);
    ta = tb; ga = gb; tb = tc; gb = g(tc).g;
  }
  return { ...bPlane(g(tb).rel), closestApproachTdbS: tb };
}
