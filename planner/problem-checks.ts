/**
 * parseProblem: the zod shape check, then the checks that relate fields to each other, all before any
 * computation. Every failure is an InvalidInputError naming the dotted path of the first bad field. The result
 * is a CheckedProblem, the only form the planner takes: each door parses once and nothing downstream re-checks.
 * (The schema lives in contract/; the checks live here because reading epochs needs the propagator's time scales.)
 */
import type * as z from 'zod';
import {
  BUILTIN_EPHEMERIS_SPAN, BUILTIN_LEAP_SECONDS, InvalidInputError, OutOfSpanError, formatEpoch, parseEpoch, RADIUS_KM, J2_EARTH,
} from '../propagator/index.ts';
import type { BodyName, LeapSecondTable } from '../propagator/index.ts';
import { issuePath } from '../contract/errors.ts';
import { problemSchema } from '../contract/problem-schema.ts';
import type { PlanningProblem, ProblemTarget } from '../contract/problem-schema.ts';

/** The first zod issue as an InvalidInputError naming its dotted path (all issues listed in the message). */
export function fromZodError(error: z.ZodError): InvalidInputError {
  const issues = error.issues.map((i) => `${issuePath(i.path)}: ${i.message}`);
  const first = error.issues[0];
  const field = first ? issuePath(first.path) : '(problem)';
  const err = new InvalidInputError(field, issues.length === 1
    ? (first?.message ?? 'invalid') : `${issues.length} problems: ${issues.join('; ')}`);
  return err;
}

/** Epochs of a problem as TDB seconds from J2000, parsed once. */
export interface ProblemEpochs {
  initialTdbS: number;
  endTdbS: number;
  burnTdbS: number[];
  burnWindowTdbS: ({ earliestTdbS: number; latestTdbS: number } | undefined)[];
  /** Epoch of each target when the target states one (closest-approach-epoch, position, state). */
  targetTdbS: (number | undefined)[];
}

/** Parses every epoch of the problem (names the field of a bad one); UTC through `leapSeconds`. */
export function problemEpochs(problem: PlanningProblem, leapSeconds: LeapSecondTable = BUILTIN_LEAP_SECONDS): ProblemEpochs {
  const epoch = (text: string, field: string): number => parseEpoch(text, undefined, field, leapSeconds);
  const initialTdbS = epoch(problem.initialState.epoch, 'initialState.epoch');
  const endTdbS = epoch(problem.endEpoch, 'endEpoch');
  const burnTdbS = problem.burns.map((b, i) => epoch(b.epoch, `burns[${i}].epoch`));
  const burnWindowTdbS = problem.burns.map((b, i) => (b.epochWindow ? {
    earliestTdbS: epoch(b.epochWindow.earliest, `burns[${i}].epochWindow.earliest`),
    latestTdbS: epoch(b.epochWindow.latest, `burns[${i}].epochWindow.latest`),
  } : undefined));
  const targetTdbS = problem.targets.map((t, i) => ('epoch' in t ? epoch(t.epoch, `targets[${i}].epoch`) : undefined));
  return { initialTdbS, endTdbS, burnTdbS, burnWindowTdbS, targetTdbS };
}

function targetBody(t: ProblemTarget): BodyName | undefined {
  return 'body' in t ? t.body : undefined;
}

/** The semantic checks; throws InvalidInputError naming the field. UTC epochs go through `leapSeconds`
 * (the built-in table unless the door loaded a leap-seconds.list). */
export function checkProblem(problem: PlanningProblem, leapSeconds: LeapSecondTable = BUILTIN_LEAP_SECONDS): ProblemEpochs {
  const e = problemEpochs(problem, leapSeconds);
  const fm = problem.forceModel;
  const modelled = new Set<BodyName>([fm.centralBody, ...fm.perturbingBodies]);
  checkSpanAndForceModel(problem, e, modelled);
  checkBurns(problem, e);
  checkTargets(problem, e, modelled);
  return e;
}

/** The span, the force model and the initial state (in that order). */
function checkSpanAndForceModel(problem: PlanningProblem, e: ProblemEpochs, modelled: ReadonlySet<BodyName>): void {
  const fm = problem.forceModel;
  if (e.endTdbS <= e.initialTdbS) {
    throw new InvalidInputError('endEpoch', 'the end of the span must come after initialState.epoch');
  }
  checkInsideEphemerisSpan(e);
  fm.perturbingBodies.forEach((b, i) => {
    if (b === fm.centralBody) {
      throw new InvalidInputError(`forceModel.perturbingBodies[${i}]`, `'${b}' is already the central body`);
    }
  });
  if (fm.centralJ2 && fm.centralBody !== 'earth') {
    throw new InvalidInputError('forceModel.centralJ2', `no J2 constant is known for '${fm.centralBody}' (only earth, J2 = ${J2_EARTH})`);
  }
  if (fm.solarPressure && !problem.spacecraft.solarPressure) {
    throw new InvalidInputError('spacecraft.solarPressure', 'forceModel.solarPressure is on but the spacecraft gives no areaM2 and reflectivityCoefficient');
  }
  if (problem.initialState.centre !== fm.centralBody && !modelled.has(problem.initialState.centre)) {
    throw new InvalidInputError('initialState.centre', `'${problem.initialState.centre}' is neither the central body nor a perturbing body`);
  }
  checkCovariance(problem);
  const r = Math.hypot(...problem.initialState.positionKm);
  if (r <= RADIUS_KM[problem.initialState.centre]) {
    throw new InvalidInputError('initialState.positionKm', `|r| = ${r.toFixed(3)} km is inside ${problem.initialState.centre} (radius ${RADIUS_KM[problem.initialState.centre]} km)`);
  }
}

/** Each burn: epoch in the span and in order, its window, finite-burn limits, Lambert seed, bounds; then at
 * least one free variable over all burns. */
function checkBurns(problem: PlanningProblem, e: ProblemEpochs): void {
  const fm = problem.forceModel;
  let freeCount = 0;
  problem.burns.forEach((b, i) => {
    const t = e.burnTdbS[i];
    if (t < e.initialTdbS || t > e.endTdbS) {
      throw new InvalidInputError(`burns[${i}].epoch`, 'burn epoch outside the span [initialState.epoch, endEpoch]');
    }
    if (i > 0 && t <= e.burnTdbS[i - 1]) {
      throw new InvalidInputError(`burns[${i}].epoch`, 'burns must be in time order, each after the one before');
    }
    const w = e.burnWindowTdbS[i];
    if (w) {
      if (w.latestTdbS <= w.earliestTdbS) {
        throw new InvalidInputError(`burns[${i}].epochWindow.latest`, 'window end must come after its start');
      }
      if (w.earliestTdbS < e.initialTdbS || w.latestTdbS > e.endTdbS) {
        throw new InvalidInputError(`burns[${i}].epochWindow`, 'epoch window outside the span [initialState.epoch, endEpoch]');
      }
      if (t < w.earliestTdbS || t > w.latestTdbS) {
        throw new InvalidInputError(`burns[${i}].epoch`, 'initial burn epoch outside its epochWindow');
      }
      freeCount += 1;
    }
    freeCount += b.freeComponents.filter(Boolean).length;
    if (b.model === 'finite') {
      // The finite stage solves for pointing and duration: all three components move.
      if (b.freeComponents.some((f) => !f)) throw new InvalidInputError(`burns[${i}].freeComponents`, 'a finite burn needs all three components free (its direction and duration are solved for)');
      if (b.boundsKmS) throw new InvalidInputError(`burns[${i}].boundsKmS`, 'not available for a finite burn (bound its ignition with epochWindow)');
    }
    if (b.guessFromLambert) {
      const ok = problem.targets.some((tg, k) => (tg.kind === 'position' || tg.kind === 'state')
        && tg.centre === fm.centralBody && (e.targetTdbS[k] as number) > t);
      if (!ok) {
        throw new InvalidInputError(`burns[${i}].guessFromLambert`, `needs a position or state target relative to the central body (${fm.centralBody}) after the burn`);
      }
    }
    if (b.boundsKmS) {
      for (let k = 0; k < 3; k++) {
        if (b.boundsKmS.lower[k] > b.boundsKmS.upper[k]) {
          throw new InvalidInputError(`burns[${i}].boundsKmS.lower[${k}]`, 'lower bound above upper bound');
        }
        const g = b.deltaVGuessKmS[k];
        if (g < b.boundsKmS.lower[k] || g > b.boundsKmS.upper[k]) {
          throw new InvalidInputError(`burns[${i}].deltaVGuessKmS[${k}]`, 'initial guess outside boundsKmS');
        }
      }
    }
  });
  if (freeCount === 0) {
    throw new InvalidInputError('burns', 'no free variable: mark at least one Δv component free (freeComponents) or give an epochWindow');
  }
}

/** Each target: its bodies modelled, its epoch after the last burn and inside the span, physical bounds. */
function checkTargets(problem: PlanningProblem, e: ProblemEpochs, modelled: ReadonlySet<BodyName>): void {
  const lastBurnLatest = Math.max(...problem.burns.map((_, i) => e.burnWindowTdbS[i]?.latestTdbS ?? e.burnTdbS[i]));
  problem.targets.forEach((tg, i) => {
    const body = targetBody(tg);
    if (body && !modelled.has(body)) {
      throw new InvalidInputError(`targets[${i}].body`, `'${body}' is not in the force model (central body or perturbingBodies)`);
    }
    if ((tg.kind === 'position' || tg.kind === 'state') && !modelled.has(tg.centre) && tg.centre !== 'sun') {
      throw new InvalidInputError(`targets[${i}].centre`, `'${tg.centre}' is not in the force model`);
    }
    const tt = e.targetTdbS[i];
    if (tt !== undefined) {
      if (tt > e.endTdbS) throw new InvalidInputError(`targets[${i}].epoch`, 'target epoch after the end of the span (endEpoch)');
      if (tt <= lastBurnLatest) {
        throw new InvalidInputError(`targets[${i}].epoch`, 'target epoch not after the last burn (a burn would come after its target)');
      }
    }
    if (tg.kind === 'periapsis-radius' && tg.radiusKm <= RADIUS_KM[tg.body]) {
      throw new InvalidInputError(`targets[${i}].radiusKm`, `periapsis ${tg.radiusKm} km is below the surface of ${tg.body} (radius ${RADIUS_KM[tg.body]} km)`);
    }
    if (tg.kind === 'periapsis-altitude' && tg.altitudeKm <= 0) {
      throw new InvalidInputError(`targets[${i}].altitudeKm`, `periapsis altitude ${tg.altitudeKm} km is below the surface of ${tg.body}`);
    }
    if (tg.kind === 'b-plane' && Math.hypot(tg.bDotTKm, tg.bDotRKm) <= RADIUS_KM[tg.body]) {
      throw new InvalidInputError(`targets[${i}].bDotTKm`, `|B| = ${Math.hypot(tg.bDotTKm, tg.bDotRKm).toFixed(1)} km is inside ${tg.body}'s radius (${RADIUS_KM[tg.body]} km): an impact, not a flyby`);
    }
  });
}

function checkCovariance(problem: PlanningProblem): void {
  const c = problem.initialState.covarianceKmKmS;
  if (!c) return;
  for (let i = 0; i < 6; i++) {
    if (c[i][i] < 0) throw new InvalidInputError(`initialState.covarianceKmKmS[${i}][${i}]`, 'variance must be >= 0');
    for (let j = 0; j < i; j++) {
      const scale = Math.max(Math.abs(c[i][j]), Math.abs(c[j][i]), 1e-300);
      if (Math.abs(c[i][j] - c[j][i]) > 1e-9 * scale) {
        throw new InvalidInputError(`initialState.covarianceKmKmS[${i}][${j}]`, 'covariance must be symmetric');
      }
      if (c[i][j] * c[i][j] > c[i][i] * c[j][j] * (1 + 1e-9)) {
        throw new InvalidInputError(`initialState.covarianceKmKmS[${i}][${j}]`, 'correlation above 1: not a covariance');
      }
    }
  }
}

/** Brand of a problem that passed the checks (see CheckedProblem); a symbol, so JSON and hashes never see it. */
const CHECKED: unique symbol = Symbol('veer.checked-problem');

/** What the checks established about a problem: its epochs as TDB seconds, read with `leapSeconds`. */
export interface ProblemChecks {
  readonly epochs: ProblemEpochs;
  /** The table its UTC epochs were read with; the plan records it and its problem hash covers it. */
  readonly leapSeconds: LeapSecondTable;
}

/**
 * A problem that passed parseProblem (zod shape with defaults, then the relation checks), carrying its epochs
 * in TDB and the leap-second table they were read with. The planner takes only this and never checks again.
 * The record is a non-enumerable symbol property: JSON, hashes and structured clone (a thread boundary) drop
 * it, and so does a copy made by spreading, so an edited copy cannot pass with stale epochs (checksOf throws).
 */
export type CheckedProblem = PlanningProblem & { readonly [CHECKED]: ProblemChecks };

/** The relation checks on a problem the zod schema already parsed (the HTTP door's body schema embeds it):
 * returns it as a CheckedProblem; throws InvalidInputError naming the field. */
export function checkParsedProblem(problem: PlanningProblem, leapSeconds: LeapSecondTable = BUILTIN_LEAP_SECONDS): CheckedProblem {
  const checks: ProblemChecks = { epochs: checkProblem(problem, leapSeconds), leapSeconds };
  Object.defineProperty(problem, CHECKED, { value: checks, enumerable: false, configurable: true }); // a re-check replaces it
  return problem as CheckedProblem;
}

/** The epochs and table of a checked problem; a TypeError (a bug, final for the queue) when the value never
 * passed the checks, e.g. a spread copy of a checked problem. */
export function checksOf(problem: CheckedProblem): ProblemChecks {
  const checks = (problem as Partial<CheckedProblem>)[CHECKED];
  if (!checks) throw new TypeError('not a checked problem: parse it with parseProblem first (a spread copy is no longer checked)');
  return checks;
}

/**
 * Validates anything from outside (a parsed JSON file, a request body, job data) as a retargeting problem:
 * the zod shape first (every issue listed, the first one's path as `field`), then the semantic checks.
 * Throws InvalidInputError; returns the problem with defaults filled in, checked (CheckedProblem).
 */
export function parseProblem(input: unknown, leapSeconds: LeapSecondTable = BUILTIN_LEAP_SECONDS): CheckedProblem {
  const parsed = problemSchema.safeParse(input);
  if (!parsed.success) throw fromZodError(parsed.error);
  return checkParsedProblem(parsed.data, leapSeconds);
}

/** The planner runs on the built-in ephemeris: both ends of the span must lie inside it (never clipped). */
function checkInsideEphemerisSpan(e: ProblemEpochs): void {
  const { startTdbS, endTdbS } = BUILTIN_EPHEMERIS_SPAN;
  // Written only for a refusal: every submission passes here, and formatting two epochs costs more than the check.
  const span = (): string => `[${formatEpoch(startTdbS, 'TDB', 0)}, ${formatEpoch(endTdbS, 'TDB', 0)}]`;
  if (e.initialTdbS < startTdbS || e.initialTdbS > endTdbS) {
    throw new OutOfSpanError('initialState.epoch', `outside the built-in ephemeris span ${span()}`);
  }
  if (e.endTdbS > endTdbS) throw new OutOfSpanError('endEpoch', `after the end of the built-in ephemeris span ${span()}`);
}
