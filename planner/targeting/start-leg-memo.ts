/**
 * The coast from the very start of an evaluation, kept between the evaluations of one plan: before the
 * first burn nothing depends on the controls (unless the burn's epoch moves), so every corrector
 * evaluation would repeat the same propagation — same initial state, epochs, mass, force model, ephemeris
 * and settings — and get the same result to the last bit. A deterministic propagator makes the kept
 * result exact, not an approximation.
 */
import type { Ephemeris, PropagationMethod, PropagationResult, StateVector } from '../../propagator/index.ts';
import type { PlanningProblem } from '../../contract/problem-schema.ts';

/** Everything that decides a start coast: the objects by identity, the numbers and settings by value. */
export interface StartLeg {
  initial: StateVector;
  problem: PlanningProblem;
  ephemeris: Ephemeris;
  /** End of the coast, TDB s from J2000. */
  endTdbS: number;
  massKg: number;
  method: PropagationMethod;
  arcMethod: PropagationMethod | undefined;
  relativeTolerance: number;
  withStm: boolean;
  switching: boolean;
  outputStepS: number | undefined;
}

interface Kept {
  leg: StartLeg;
  key: string;
  result: PropagationResult;
}

/** How many different coasts one memo keeps (the corrector needs one or two: with and without the STM). */
const KEPT_LIMIT = 4;

function keyOf(leg: StartLeg): string {
  // JSON writes doubles in their shortest exact form, so equal keys mean equal numbers.
  return JSON.stringify([leg.endTdbS, leg.massKg, leg.method, leg.arcMethod ?? null, leg.relativeTolerance,
    leg.withStm, leg.switching, leg.outputStepS ?? null]);
}

/** Start coasts of one plan's evaluations; see the file comment. Results are shared: callers do not
 * modify them. */
export class StartLegMemo {
  private readonly kept: Kept[] = [];

  /** The result of an earlier run of exactly this coast, else undefined. */
  find(leg: StartLeg): PropagationResult | undefined {
    const key = keyOf(leg);
    return this.kept.find((k) => k.key === key && k.leg.initial === leg.initial && k.leg.problem === leg.problem
      && k.leg.ephemeris === leg.ephemeris)?.result;
  }

  /** Keeps a finished coast (the oldest goes when KEPT_LIMIT are kept). */
  keep(leg: StartLeg, result: PropagationResult): void {
    if (result.outcome !== 'finished') return;
    if (this.kept.length >= KEPT_LIMIT) this.kept.shift();
    this.kept.push({ leg, key: keyOf(leg), result });
  }
}
