/**
 * Everything a planning run derives from a validated problem before propagating: parsed epochs, target
 * components (plus auxiliary ones the dispersion needs), the control layout, the ephemeris (a view over
 * the span of a Chebyshev cache of the built-in source: the caller's shared EphemerisCache, or one of its
 * own; a block's fit never depends on which, so the plan does not either) and the initial state in J2000 equatorial axes
 * relative to the central body.
 */
import {
  BUILTIN_EPHEMERIS_SPAN, changeCentre, InvalidInputError, covarianceBetweenFrames, createBuiltinEphemeris, EphemerisCache, stateToFrame,
} from '../../propagator/index.ts';
import type { BodyName, Ephemeris, LeapSecondTable, StateVector, TdbSpan, Vec3 } from '../../propagator/index.ts';
import type { PlanEphemerisSource } from '../../contract/plan-types.ts';
import { ephemerisWithFiles, type EphemerisFileTable } from '../ephemeris-files.ts';
import { checksOf, type CheckedProblem, type ProblemEpochs } from '../problem-checks.ts';
import type { PlanningProblem } from '../../contract/problem-schema.ts';
import { controlLayout } from '../targeting/controls.ts';
import type { ControlLayout } from '../targeting/controls.ts';
import type { EvaluationContext } from '../targeting/evaluate-trajectory.ts';
import { targetComponents } from '../targeting/target-components.ts';
import type { TargetComponent } from '../targeting/target-components.ts';

export interface PlanningContext {
  problem: CheckedProblem;
  /** The table every UTC epoch of this run is read and written with. */
  leapSeconds: LeapSecondTable;
  epochs: ProblemEpochs;
  /** Target components first (the corrector's residuals), then auxiliary ones (dispersion only). */
  components: TargetComponent[];
  targetCount: number;
  layout: ControlLayout;
  ephemeris: Ephemeris;
  ephemerisName: string;
  /** Which source served each body (built-in or an OEM file). */
  ephemerisSources: PlanEphemerisSource[];
  evaluation: EvaluationContext;
  /** Index in `components` of B·T, B·R and closest-approach epoch at the B-plane body, when any. */
  bPlaneIndex: { body: BodyName; bDotT: number; bDotR: number; closestApproach: number } | null;
  /** 6x6 initial covariance rotated to J2000 equatorial, or null. */
  initialCovariance: number[][] | null;
}

const MARGIN_S = 2 * 86400;

function rotateCovarianceToEquatorial(problem: PlanningProblem): number[][] | null {
  const c = problem.initialState.covarianceKmKmS;
  return c ? covarianceBetweenFrames(c, problem.initialState.frame, 'J2000_EQUATORIAL') : null;
}

/** The bodies a plan of `problem` takes from the ephemeris (central, perturbing, initial centre, target
 * bodies, the Sun) and the span it needs them over (TDB s from J2000: first to last epoch); what a file must
 * cover. The service checks an ephemeris set against it at submission, the planner again when it runs. */
export function ephemerisNeeds(problem: PlanningProblem, epochs: ProblemEpochs,
  components: readonly TargetComponent[] = targetComponents(problem, epochs)): { bodies: BodyName[]; span: TdbSpan } {
  const fm = problem.forceModel;
  const bodies = [...new Set<BodyName>([fm.centralBody, ...fm.perturbingBodies, problem.initialState.centre,
    ...components.flatMap((c) => (c.body ? [c.body] : [])), 'sun'])];
  return { bodies, span: { startTdbS: Math.min(epochs.initialTdbS, epochs.endTdbS), endTdbS: Math.max(epochs.initialTdbS, epochs.endTdbS) } };
}

/** Builds the context of a checked problem from the epochs and leap-second table its checks recorded (no
 * check runs again); `cache`: the process's shared ephemeris cache (a fresh one when absent). */
export function planningContext(problem: CheckedProblem, cache?: EphemerisCache,
  files: readonly EphemerisFileTable[] = []): PlanningContext {
  const { epochs, leapSeconds } = checksOf(problem);
  const components = targetComponents(problem, epochs);
  const targetCount = components.length;
  let bPlaneIndex: PlanningContext['bPlaneIndex'] = null;
  const bt = components.findIndex((c) => c.quantity.q === 'bdott');
  if (bt >= 0) {
    const body = components[bt].body as BodyName;
    const br = components.findIndex((c) => c.quantity.q === 'bdotr' && c.body === body);
    let ca = components.findIndex((c) => c.quantity.q === 'ca-epoch' && c.body === body);
    if (ca < 0) {
      components.push({
        targetIndex: -1, kind: 'closest-approach-epoch', component: 'closest-approach epoch (auxiliary)', unit: 's',
        body, requested: 0, tolerance: 1, quantity: { q: 'ca-epoch', body }, station: { kind: 'approach', body },
      });
      ca = components.length - 1;
    }
    bPlaneIndex = { body, bDotT: bt, bDotR: br, closestApproach: ca };
  }
  const layout = controlLayout(problem, epochs);
  const fm = problem.forceModel;
  const { bodies, span: problemSpan } = ephemerisNeeds(problem, epochs, components);
  if (fm.ephemerisSet !== undefined && files.length === 0) {
    // Planning on the built-in series instead would silently change the problem's physics.
    throw new InvalidInputError('forceModel.ephemerisSet', `'${fm.ephemerisSet}' names an ephemeris set of the service, and no `
      + 'ephemeris files were given here: submit the problem to the service, or give the set\'s files (veer plan --ephemeris FILE)');
  }
  const builtin = createBuiltinEphemeris();
  // Files replace the bodies they tabulate (span checked against the problem's); the margin stays inside them.
  // Errors name the problem's set when it chose one (the service), else the files given (the CLI).
  const { source, sources } = ephemerisWithFiles(files, problemSpan, bodies, fm.ephemerisSet === undefined ? 'ephemeris' : 'forceModel.ephemerisSet', leapSeconds);
  const start = Math.max(source.span.startTdbS, BUILTIN_EPHEMERIS_SPAN.startTdbS, problemSpan.startTdbS - MARGIN_S);
  const end = Math.min(source.span.endTdbS, BUILTIN_EPHEMERIS_SPAN.endTdbS, problemSpan.endTdbS + MARGIN_S);
  const ephemeris = bodies.length === 1 && bodies[0] === 'sun'
    ? builtin
    : (cache ?? new EphemerisCache()).ephemerisFor(source, bodies, { startTdbS: start, endTdbS: end });
  let initial: StateVector = {
    epochTdbS: epochs.initialTdbS, centre: problem.initialState.centre, frame: problem.initialState.frame,
    positionKm: [...problem.initialState.positionKm] as Vec3, velocityKmS: [...problem.initialState.velocityKmS] as Vec3,
  };
  initial = stateToFrame(initial, 'J2000_EQUATORIAL');
  if (initial.centre !== fm.centralBody) initial = changeCentre(initial, fm.centralBody, ephemeris);
  return {
    problem, leapSeconds, epochs, components, targetCount, layout, ephemeris, ephemerisName: source.name, ephemerisSources: sources,
    evaluation: {
      problem, initial, endTdbS: epochs.endTdbS, components, ephemeris,
      controlMap: layout.descriptors.map((d) => ({ burnIndex: d.burnIndex, kind: d.kind })),
    },
    bPlaneIndex,
    initialCovariance: rotateCovarianceToEquatorial(problem),
  };
}
