/**
 * The problem's force model for a given spacecraft mass, and one burn-free propagation segment with the
 * problem's method, tolerance and switching (used by the trajectory evaluator and the Δv budget).
 * States J2000 equatorial relative to the integration centre; km, s, km/s; TDB s from J2000.
 */
import { CancelledError, propagateAsync } from '../../propagator/index.ts';
import type { Ephemeris, FiniteBurnSpec, ForceModelSpec, PropagationMethod, PropagationResult, StateVector } from '../../propagator/index.ts';
import type { PlanningProblem } from '../../contract/problem-schema.ts';

/** Force model of the problem; SRP uses `massKg` (kg, the mass at that point of the trajectory). */
export function forcesFor(problem: PlanningProblem, massKg: number): ForceModelSpec {
  const fm = problem.forceModel;
  const sp = problem.spacecraft.solarPressure;
  return {
    centralBody: fm.centralBody,
    perturbingBodies: [...fm.perturbingBodies],
    centralJ2: fm.centralJ2,
    solarPressure: fm.solarPressure && sp ? { areaM2: sp.areaM2, reflectivityCoefficient: sp.reflectivityCoefficient, massKg } : undefined,
  };
}

export interface SegmentOptions {
  method: PropagationMethod;
  relativeTolerance: number;
  withStm: boolean;
  signal?: AbortSignal;
  /** Finite burns flown inside the segment (the Δv budget flies one from its ignition); their records and,
   * with the STM, their parameter sensitivities carried to `endTdbS` come back in the result.
   * @defaultValue none */
  finiteBurns?: FiniteBurnSpec[];
}

/**
 * Propagates `state` (J2000 equatorial, integration centre) to `endTdbS` (TDB s) with no events and no
 * burns but `opts.finiteBurns` (mass `massKg` at the start); the result's outcome says whether it finished (an impact ends it early).
 * @throws CancelledError when `signal` fires.
 */
export async function propagateSegment(problem: PlanningProblem, ephemeris: Ephemeris, state: StateVector, massKg: number,
  endTdbS: number, opts: SegmentOptions): Promise<PropagationResult> {
  if (opts.signal?.aborted) throw new CancelledError();
  const result = await propagateAsync({
    initial: state, endEpochTdbS: endTdbS, forces: forcesFor(problem, massKg), ephemeris,
    method: opts.method, relativeTolerance: opts.relativeTolerance, withStm: opts.withStm, events: [],
    switching: problem.forceModel.switching ? { enabled: true } : undefined,
    ...(opts.finiteBurns?.length ? { finiteBurns: opts.finiteBurns, initialMassKg: massKg } : {}),
  }, { signal: opts.signal });
  if (result.outcome === 'cancelled') throw new CancelledError();
  return result;
}
