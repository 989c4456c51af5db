/**
 * Reference check of the demo flyby plan: after the planned burn, an INDEPENDENT re-propagation meets every
 * target within its tolerance, and the STM-chained Jacobian agrees with finite differences.
 *
 * The independent re-propagation shares no code with the project's propagator: odex (npm 2.0.4, Hairer &
 * Wanner's GBS extrapolation integrator) integrates heliocentric motion under the Sun, the perturbing
 * planets as point masses (direct and indirect terms, e.g. Battin, An Introduction to the Mathematics and
 * Methods of Astrodynamics, §8.4) with positions straight from astronomy-engine (npm 2.1.19), and cannonball
 * solar radiation pressure a = C_R (Φ/c)(A/m)(1 au/ρ)² ρ̂ (Montenbruck & Gill, Satellite Orbits, §3.4;
 * Φ = 1361 W/m², IAU 2015 Resolution B3). The closest approach is the root of r·v relative to Mars and the
 * B-plane is built from the textbook definitions (Kizner 1961): Ŝ the incoming asymptote, T̂ = Ŝ×k̂/|Ŝ×k̂|
 * with k̂ the ecliptic pole (astronomy-engine's J2000 ecliptic rotation), R̂ = Ŝ×T̂, B = (h/v∞) Ŝ×ĥ.
 * GMs are the DE440 values (Park et al. 2021, Table 8 — the same published numbers the project uses).
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { AstroTime, Body, HelioState, HelioVector, Rotation_ECL_EQJ, RotateVector, Vector } from 'astronomy-engine';

const TerrestrialTime = (ttDays: number): AstroTime => AstroTime.FromTerrestrialTime(ttDays);
import { describe, expect, it } from 'vitest';
import { parseProblem, planManeuvers } from '../../planner/index.ts';
import type { ManeuverPlan, PlanningProblem } from '../../planner/index.ts';

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

function helioKm(body: string, tdbS: number): number[] {
  const v = HelioVector(BODY[body], TerrestrialTime(tdbS / DAY_S)); // TT ≈ TDB (|TDB − TT| < 2 ms)
  return [v.x * KM_PER_AU, v.y * KM_PER_AU, v.z * KM_PER_AU];
}

function propagateIndependently(problem: PlanningProblem, y0: number[], t0: number, t1: number, massKg: number): number[] {
  const bodies = problem.forceModel.perturbingBodies;
  const sp = problem.spacecraft.solarPressure;
  const srp = problem.forceModel.solarPressure && sp ? (sp.reflectivityCoefficient * SRP_1AU_N_M2 * sp.areaM2 / massKg / 1000) * KM_PER_AU ** 2 : 0;
  const f = (x: number, y: number[]): number[] => {
    const t = t0 + x;
    const r = Math.hypot(y[0], y[1], y[2]);
    const k = (-GM.sun + srp) / r ** 3;
    const a = [k * y[0], k * y[1], k * y[2]];
    for (const b of bodies) {
      const p = helioKm(b, t);
      const d = [p[0] - y[0], p[1] - y[1], p[2] - y[2]];
      const dn = Math.hypot(...d);
      const pn = Math.hypot(...p);
      for (let i = 0; i < 3; i++) a[i] += GM[b] * (d[i] / dn ** 3 - p[i] / pn ** 3);
    }
    return [y[3], y[4], y[5], ...a];
  };
  const solver = new odex.Solver(6);
  solver.relativeTolerance = 1e-13;
  solver.absoluteTolerance = [1e-5, 1e-5, 1e-5, 1e-11, 1e-11, 1e-11];
  solver.maxSteps = 200000;
  const res = solver.solve(f, 0, y0, t1 - t0);
  expect(res.outcome).toBe(0);
  return res.y;
}

function marsRelative(y: number[], tdbS: number): number[] {
  const s = HelioState(Body.Mars, TerrestrialTime(tdbS / DAY_S));
  const k = KM_PER_AU / DAY_S;
  return [y[0] - s.x * KM_PER_AU, y[1] - s.y * KM_PER_AU, y[2] - s.z * KM_PER_AU, y[3] - s.vx * k, y[4] - s.vy * k, y[5] - s.vz * k];
}

const cross = (a: number[], b: number[]): number[] => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
const dot = (a: number[], b: number[]): number => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
const unit = (a: number[]): number[] => a.map((v) => v / Math.hypot(a[0], a[1], a[2]));

function bPlane(rel: number[]): { bDotTKm: number; bDotRKm: number } {
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
  return { bDotTKm: dot(b, tHat), bDotRKm: dot(b, rHat) };
}

describe('demo flyby retargeting (examples/flyby-demo.json)', () => {
  const json = JSON.parse(readFileSync(new URL('../../examples/flyby-demo.json', import.meta.url), 'utf8')) as Record<string, unknown>;
  const problem = parseProblem({ ...json, dispersion: { samples: 0, seed: 1 } });
  let plan: ManeuverPlan;

  describe('when the planner solves it', () => {
    it('should converge, pass its cross-check and match STM and finite-difference Jacobians', async () => {
      plan = await planManeuvers(problem, { monteCarlo: 'skip', verifyJacobian: true });
      expect(plan.status).toBe('converged');
      expect(plan.crossCheck.passed).toBe(true);
      expect(plan.targets.every((t) => t.met)).toBe(true);
      // Central differences (1 mm/s steps) against the STM chain, relative to each row's largest entry.
      // Observed 3.4e-5 (2026-12), the same with 0.1, 1 and 10 mm/s steps and at tolerance 1e-12, so it is
      // not step noise: the STM chain leaves out the change of the solar-pressure acceleration through the
      // propellant mass the burn uses (∂m/∂Δv). With solar pressure off it falls to 3.5e-7 at 1 mm/s
      // (3e-6 at 0.1 mm/s: round-off noise; 3e-6 at 10 mm/s: truncation). Limit about 3× the observed value.
      expect(plan.sensitivities?.stmVersusFiniteDifference).toBeLessThan(1e-4);
    });
  });

  describe('when the planned burn is re-propagated independently (odex + astronomy-engine)', () => {
    it('should meet every target within its tolerance', () => {
      const t0 = plan.createdFrom.initialEpoch.tdbS;
      const burn = plan.burns[0];
      const y0 = [...problem.initialState.positionKm, ...problem.initialState.velocityKmS];
      const yb = propagateIndependently(problem, y0, t0, burn.epoch.tdbS, burn.massBeforeKg);
      const after = [...yb.slice(0, 3), ...yb.slice(3).map((v, i) => v + burn.deltaVInertialKmS[i])];
      const caTarget = problem.targets.find((t) => t.kind === 'closest-approach-epoch');
      const bTarget = problem.targets.find((t) => t.kind === 'b-plane');
      if (!caTarget || caTarget.kind !== 'closest-approach-epoch' || !bTarget || bTarget.kind !== 'b-plane') throw new Error('demo targets changed');
      const tGuess = plan.targets.find((t) => t.kind === 'closest-approach-epoch')?.requested as number;
      // Carry to one hour before the requested approach, then find the root of r·v (secant on short arcs).
      const tStart = tGuess - 3600;
      const yStart = propagateIndependently(problem, after, burn.epoch.tdbS, tStart, burn.massAfterKg);
      const g = (t: number): { g: number; rel: number[] } => {
        const y = propagateIndependently(problem, yStart, tStart, t, burn.massAfterKg);
        const rel = marsRelative(y, t);
        return { g: dot(rel.slice(0, 3), rel.slice(3)), rel };
      };
      let ta = tGuess - 600;
      let tb = tGuess + 600;
      let ga = g(ta).g;
      let gb = g(tb).g;
      for (let i = 0; i < 30 && Math.abs(tb - ta) > 1e-4; i++) {
        const tc = tb - (gb * (tb - ta)) / (gb - ga);
        ta = tb; ga = gb; tb = tc; gb = g(tc).g;
      }
      const ca = g(tb);
      const bp = bPlane(ca.rel);
      const achieved = (kind: string, component?: string) => plan.targets.find((t) => t.kind === kind && (component === undefined || t.component.includes(component)))?.achieved as number;
      console.info(`independent re-flight vs requested: B·T ${(bp.bDotTKm - bTarget.bDotTKm).toExponential(2)} km, B·R ${(bp.bDotRKm - bTarget.bDotRKm).toExponential(2)} km, `
        + `approach ${(tb - tGuess).toExponential(2)} s; vs the plan's achieved: B·T ${(bp.bDotTKm - achieved('b-plane', 'T')).toExponential(2)} km, `
        + `B·R ${(bp.bDotRKm - achieved('b-plane', 'R')).toExponential(2)} km, approach ${(tb - achieved('closest-approach-epoch')).toExponential(2)} s`);
      expect(Math.abs(bp.bDotTKm - bTarget.bDotTKm)).toBeLessThan(bTarget.toleranceKm);
      expect(Math.abs(bp.bDotRKm - bTarget.bDotRKm)).toBeLessThan(bTarget.toleranceKm);
      expect(Math.abs(tb - tGuess)).toBeLessThan(caTarget.toleranceS);
      // Agreement of the two propagations (independent re-flight against the plan's own achieved values):
      // measured 0.022 km (B·T), 0.010 km (B·R) and 0.013 s (2026-12-03, printed above on every run); limits
      // about 5x that (the two differ in ephemeris evaluation — cache versus direct — and integrator).
      expect(Math.abs(bp.bDotTKm - achieved('b-plane', 'T'))).toBeLessThan(0.1);
      expect(Math.abs(bp.bDotRKm - achieved('b-plane', 'R'))).toBeLessThan(0.1);
      expect(Math.abs(tb - achieved('closest-approach-epoch'))).toBeLessThan(0.07);
    });
  });
});
