/**
 * Controls of finite burns. Each finite burn starts from its seed — the impulsive solution converted to a
 * burn centred on the impulsive epoch: direction along the impulsive Δv (in the burn's frame axes),
 * duration = propellant / ṁ from the rocket equation (ṁ = F/(Isp·g0)), ignition half a duration before the
 * impulsive epoch. Its controls: two pointing offsets a, b (rad) with direction u = (u0 + a·e1 + b·e2)/|…|
 * (e1, e2 ⟂ u0: a chart with no singularity near the seed, unlike azimuth/elevation at a pole), the
 * duration (s) and, when the burn has an epoch window, the ignition shift (s) from the seed's ignition.
 */
import { cross3 as cross, type Vec3 } from '../../propagator/index.ts';
import type { ControlDescriptor, FiniteControlKind } from '../../contract/plan-types.ts';
import type { PlanningProblem } from '../../contract/problem-schema.ts';
import type { ProblemEpochs } from '../problem-checks.ts';
import { burnSettings, type BurnSetting, type ControlLayout } from './controls.ts';
import type { FiniteSeed } from './finite-types.ts';

const unit = (v: readonly number[]): Vec3 => {
  const n = Math.hypot(v[0], v[1], v[2]);
  return [v[0] / n, v[1] / n, v[2] / n];
};

/** Two unit vectors completing `u` (unit) to a right-handed triad. */
export function acrossOf(u: Vec3): [Vec3, Vec3] {
  const helper: Vec3 = Math.abs(u[2]) < 0.9 ? [0, 0, 1] : [1, 0, 0];
  const e1 = unit(cross(helper, u));
  return [e1, cross(u, e1)];
}

/** Pointing-offset scale: the angle that moves 1 m/s of the burn's Δv across its direction, rad. */
const pointingScale = (seed: FiniteSeed): number => Math.min(0.1, 1e-3 / Math.max(seed.impulsiveDeltaVKmS, 1e-9));
/** Duration scale: the time that adds 1 m/s at the seed's initial acceleration F/m0 — approximated with the
 * seed's mean acceleration |Δv|/D, s. */
const durationScale = (seed: FiniteSeed): number => Math.max(1e-3, 1e-3 * seed.durationS / Math.max(seed.impulsiveDeltaVKmS, 1e-9));

/**
 * The corrector layout of the finite stage: impulsive burns keep their controls (initial values from the
 * impulsive solution `x`), finite burns take the controls of the file comment.
 */
export function finiteControlLayout(problem: PlanningProblem, epochs: ProblemEpochs, impulsive: ControlLayout, x: readonly number[],
  seeds: (FiniteSeed | undefined)[]): ControlLayout {
  const out: ControlLayout = { descriptors: [], initial: [], scales: [], maxStep: [], finiteDifferenceStep: [], lower: [], upper: [], finiteSeeds: seeds };
  const push = (d: ControlDescriptor, initial: number, scale: number, maxStep: number, fd: number, lower: number, upper: number): void => {
    out.descriptors.push(d);
    out.initial.push(initial);
    out.scales.push(scale);
    out.maxStep.push(maxStep);
    out.finiteDifferenceStep.push(fd);
    out.lower.push(lower);
    out.upper.push(upper);
  };
  problem.burns.forEach((b, i) => {
    const seed = seeds[i];
    const label = b.label ?? `burn ${i + 1}`;
    if (seed === undefined) {
      impulsive.descriptors.forEach((d, j) => {
        if (d.burnIndex === i) push(d, x[j], impulsive.scales[j], impulsive.maxStep[j], impulsive.finiteDifferenceStep[j], impulsive.lower[j], impulsive.upper[j]);
      });
      return;
    }
    const kind = (k: FiniteControlKind, name: string, unitName: ControlDescriptor['unit']): ControlDescriptor => ({ burnIndex: i, kind: k, name: `${label} ${name}`, unit: unitName });
    const ps = pointingScale(seed);
    // Finite-difference steps worth 1 mm/s of the burn, as for an impulsive Δv component (controls.ts).
    push(kind('point0', 'pointing offset 1', 'rad'), 0, ps, 0.2, ps * 1e-3, -0.5, 0.5);
    push(kind('point1', 'pointing offset 2', 'rad'), 0, ps, 0.2, ps * 1e-3, -0.5, 0.5);
    const ds = durationScale(seed);
    push(kind('duration', 'duration', 's'), seed.durationS, ds, Math.max(ds, 0.25 * seed.durationS), ds * 1e-3, 1e-3 * seed.durationS, Infinity);
    const w = epochs.burnWindowTdbS[i];
    if (w) {
      push(kind('ignition', 'ignition shift', 's'), 0, 600, problem.corrector.maxEpochStepS, 0.5, w.earliestTdbS - seed.startTdbS, w.latestTdbS - seed.startTdbS);
    }
  });
  return out;
}

/** Burn settings for a control vector of either stage: {@link burnSettings} plus the finite burns. */
export function controlSettings(problem: PlanningProblem, epochs: ProblemEpochs, layout: ControlLayout, x: readonly number[]): BurnSetting[] {
  const settings = burnSettings(problem, epochs, layout, x);
  applyFiniteControls(settings, layout, x);
  return settings;
}

/** Fills `settings[i].finite` for the seeded burns from the control vector `x` of `layout`. */
function applyFiniteControls(settings: BurnSetting[], layout: ControlLayout, x: readonly number[]): void {
  const seeds = layout.finiteSeeds ?? [];
  seeds.forEach((seed, i) => {
    if (seed === undefined) return;
    let a = 0;
    let b = 0;
    let durationS = seed.durationS;
    let shift = 0;
    layout.descriptors.forEach((d, j) => {
      if (d.burnIndex !== i) return;
      if (d.kind === 'point0') a = x[j];
      else if (d.kind === 'point1') b = x[j];
      else if (d.kind === 'duration') durationS = x[j];
      else if (d.kind === 'ignition') shift = x[j];
    });
    const [e1, e2] = seed.across;
    const w = [0, 1, 2].map((k) => seed.direction[k] + a * e1[k] + b * e2[k]);
    const n = Math.hypot(w[0], w[1], w[2]);
    const u = unit(w);
    // ∂u/∂a = (I − uuᵀ) e1 / |w|.
    const partial = (e: Vec3): Vec3 => {
      const dot = u[0] * e[0] + u[1] * e[1] + u[2] * e[2];
      return [(e[0] - dot * u[0]) / n, (e[1] - dot * u[1]) / n, (e[2] - dot * u[2]) / n];
    };
    const startTdbS = seed.startTdbS + shift;
    settings[i].epochTdbS = startTdbS;
    settings[i].finite = {
      startTdbS, durationS, thrustN: seed.thrustN, massFlowKgS: seed.massFlowKgS, directionLocal: u, directionPartials: [partial(e1), partial(e2)],
    };
  });
}
