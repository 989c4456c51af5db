/**
 * The corrector's free variables: each free Δv component of each burn (km/s, in the burn's own frame) and
 * each free burn epoch (s, offset from the problem's initial epoch of that burn), with their scales, step
 * limits, finite-difference steps and bounds.
 */
import type { Vec3 } from '../../propagator/index.ts';
import type { ControlDescriptor } from '../../contract/plan-types.ts';
import type { ProblemEpochs } from '../problem-checks.ts';
import type { PlanningProblem } from '../../contract/problem-schema.ts';
import type { FiniteSeed, FiniteSetting } from './finite-types.ts';

export interface ControlLayout {
  descriptors: ControlDescriptor[];
  initial: number[];
  scales: number[];
  maxStep: number[];
  finiteDifferenceStep: number[];
  lower: number[];
  upper: number[];
  /** The finite stage only: per burn, the seed of a finite burn (undefined for impulsive burns). */
  finiteSeeds?: (FiniteSeed | undefined)[];
}

/** A burn as the evaluator uses it: epoch and Δv in the burn's frame. */
export interface BurnSetting {
  epochTdbS: number;
  frame: 'inertial' | 'RTN' | 'VNB';
  deltaVLocalKmS: Vec3;
  /** A finite burn (then `epochTdbS` is its ignition and `deltaVLocalKmS` is not used). */
  finite?: FiniteSetting;
}

const AXIS_NAMES: Record<'inertial' | 'RTN' | 'VNB', [string, string, string]> = {
  inertial: ['x', 'y', 'z'], RTN: ['R', 'T', 'N'], VNB: ['V', 'N', 'B'],
};

/** Control scale of a Δv component: 1 m/s (typical size of a correction), km/s. */
const DV_SCALE_KMS = 1e-3;
/** Finite-difference step of a Δv component: 1 mm/s, km/s (common practice: ~1e-3 of the scale). */
const DV_FD_STEP_KMS = 1e-6;
/** Control scale and finite-difference step of a free epoch, s. */
const EPOCH_SCALE_S = 600;
const EPOCH_FD_STEP_S = 0.5;

/** Lays out the controls of a validated problem. */
export function controlLayout(problem: PlanningProblem, epochs: ProblemEpochs): ControlLayout {
  const out: ControlLayout = { descriptors: [], initial: [], scales: [], maxStep: [], finiteDifferenceStep: [], lower: [], upper: [] };
  problem.burns.forEach((b, i) => {
    const label = b.label ?? `burn ${i + 1}`;
    b.freeComponents.forEach((free, k) => {
      if (!free) return;
      out.descriptors.push({ burnIndex: i, kind: (['dv0', 'dv1', 'dv2'] as const)[k], name: `${label} Δv ${AXIS_NAMES[b.frame][k]}`, unit: 'km/s' });
      out.initial.push(b.deltaVGuessKmS[k]);
      out.scales.push(DV_SCALE_KMS);
      out.maxStep.push(problem.corrector.maxStepKmS);
      out.finiteDifferenceStep.push(DV_FD_STEP_KMS);
      out.lower.push(b.boundsKmS?.lower[k] ?? -Infinity);
      out.upper.push(b.boundsKmS?.upper[k] ?? Infinity);
    });
    const w = epochs.burnWindowTdbS[i];
    if (w) {
      out.descriptors.push({ burnIndex: i, kind: 'epoch', name: `${label} epoch shift`, unit: 's' });
      out.initial.push(0);
      out.scales.push(EPOCH_SCALE_S);
      out.maxStep.push(problem.corrector.maxEpochStepS);
      out.finiteDifferenceStep.push(EPOCH_FD_STEP_S);
      out.lower.push(w.earliestTdbS - epochs.burnTdbS[i]);
      out.upper.push(w.latestTdbS - epochs.burnTdbS[i]);
    }
  });
  return out;
}

/** Burn settings (epochs and Δv) for a control vector; fixed components keep the problem's values. */
export function burnSettings(problem: PlanningProblem, epochs: ProblemEpochs, layout: ControlLayout, x: readonly number[]): BurnSetting[] {
  const settings: BurnSetting[] = problem.burns.map((b, i) => ({
    epochTdbS: epochs.burnTdbS[i], frame: b.frame, deltaVLocalKmS: [...b.deltaVGuessKmS] as Vec3,
  }));
  layout.descriptors.forEach((d, j) => {
    const s = settings[d.burnIndex];
    if (d.kind === 'epoch') s.epochTdbS = epochs.burnTdbS[d.burnIndex] + x[j];
    else if (d.kind === 'dv0' || d.kind === 'dv1' || d.kind === 'dv2') s.deltaVLocalKmS[Number(d.kind[2])] = x[j];
  });
  return settings;
}
