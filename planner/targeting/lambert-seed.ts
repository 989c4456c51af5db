/**
 * Initial guesses from a Lambert transfer: for each burn that asks, the state just before the burn (earlier
 * burns at their guesses, full force model) and the first position or state target after it (relative to
 * the central body) define a two-body transfer about the central body, solved by Izzo's (2015) method;
 * Δv = v_departure − v_before, written in the burn's frame. Only the burn's free components take the seed.
 */
import { GM_KM3_S2 } from '../../propagator/index.ts';
import type { Vec3 } from '../../propagator/index.ts';
import { solveLambert } from '../lambert/index.ts';
import type { ProblemEpochs } from '../problem-checks.ts';
import type { PlanningProblem } from '../../contract/problem-schema.ts';
import { burnSettings } from './controls.ts';
import type { ControlLayout } from './controls.ts';
import { evaluateTrajectory } from './evaluate-trajectory.ts';
import type { EvaluationContext } from './evaluate-trajectory.ts';
import { axesFromInertial, localAxes } from '../../propagator/index.ts';

export interface LambertSeed {
  burnIndex: number;
  /** Seeded Δv, km/s, J2000 equatorial. */
  deltaVInertialKmS: Vec3;
  message: string;
}

/** Returns the seeded initial controls (a copy of layout.initial) and what was seeded. */
export async function lambertSeeds(problem: PlanningProblem, epochs: ProblemEpochs, layout: ControlLayout,
  evaluation: EvaluationContext, signal?: AbortSignal): Promise<{ initial: number[]; seeds: LambertSeed[] }> {
  const initial = layout.initial.slice();
  const seeds: LambertSeed[] = [];
  const fm = problem.forceModel;
  for (let i = 0; i < problem.burns.length; i++) {
    const burn = problem.burns[i];
    if (!burn.guessFromLambert) continue;
    const tBurn = epochs.burnTdbS[i];
    const earlier = burnSettings(problem, epochs, layout, initial).slice(0, i);
    const ev = await evaluateTrajectory({ ...evaluation, components: [], endTdbS: tBurn }, earlier, {
      withStm: false, method: fm.method, relativeTolerance: fm.relativeTolerance, signal,
    });
    if (!ev.ok) {
      seeds.push({ burnIndex: i, deltaVInertialKmS: [0, 0, 0], message: `no seed: ${ev.reason}` });
      continue;
    }
    const k = problem.targets.findIndex((t, j) => (t.kind === 'position' || t.kind === 'state') && t.centre === fm.centralBody && (epochs.targetTdbS[j] as number) > tBurn);
    const target = problem.targets[k];
    if (!target || (target.kind !== 'position' && target.kind !== 'state')) continue;
    const r1 = ev.final.positionKm;
    const v0 = ev.final.velocityKmS;
    const h: Vec3 = [r1[1] * v0[2] - r1[2] * v0[1], r1[2] * v0[0] - r1[0] * v0[2], r1[0] * v0[1] - r1[1] * v0[0]];
    try {
      const sol = solveLambert(r1, target.positionKm, (epochs.targetTdbS[k] as number) - tBurn, GM_KM3_S2[fm.centralBody], { direction: 'prograde', referenceNormal: h });
      if (!sol.converged) throw new Error(`Lambert did not converge (residual ${sol.residual})`);
      const dv: Vec3 = [sol.v1KmS[0] - v0[0], sol.v1KmS[1] - v0[1], sol.v1KmS[2] - v0[2]];
      const local = axesFromInertial(localAxes(burn.frame, r1, v0), dv);
      layout.descriptors.forEach((d, j) => {
        if (d.burnIndex === i && d.kind !== 'epoch') initial[j] = local[Number(d.kind[2])];
      });
      seeds.push({ burnIndex: i, deltaVInertialKmS: dv, message: `Lambert (Izzo 2015) seed toward target ${k}` });
    } catch (error) {
      seeds.push({ burnIndex: i, deltaVInertialKmS: [0, 0, 0], message: `no seed: ${(error as Error).message}` });
    }
  }
  return { initial, seeds };
}
