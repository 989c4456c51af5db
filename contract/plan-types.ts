/**
 * The maneuver plan: plain JSON-serialisable data (no class instances, no functions, no NaN — a number that
 * could not be computed is null). Consumed by queue/, api/, archive/, the console and the CCSDS writers.
 * Vectors J2000 equatorial unless a field says otherwise; km, s, km/s, kg; epochs TDB s from J2000 plus text.
 */
import type { BodyName, Vec3 } from './bodies.ts';
import type { TargetKind } from './problem-schema.ts';

/** Progress of planManeuvers; `fraction` is overall, in [0, 1]. */
export interface PlanProgress {
  stage: 'validating' | 'correcting' | 'cross-checking' | 'dispersion' | 'done';
  fraction: number;
  message: string;
  iteration?: number;
  samplesDone?: number;
  samplesTotal?: number;
}

export type CaveatSeverity = 'info' | 'warning' | 'critical';
export interface Caveat {
  code: string;
  severity: CaveatSeverity;
  text: string;
}

export interface PlanEpoch {
  /** TDB seconds from J2000. */
  tdbS: number;
  /** `...TDB` ISO text. */
  tdb: string;
  /** ISO UTC text through the plan's leap-second table (past its expiry with the last TAI − UTC assumed and
   * a caveat); null only before 1972, where UTC has no whole-second offset from TAI. */
  utc: string | null;
}

/** The leap-second table a plan used: where it came from and its content, so the plan can be re-read
 * (UTC text, Monte Carlo children, CCSDS export) with exactly the same table. */
/** Which source served one body of a plan: the built-in series (with its version) or a CCSDS OEM file (name,
 * SHA-256 of its bytes, and the span it covers, TDB). */
export type PlanEphemerisSource =
  | { body: BodyName; source: 'built-in'; version: string }
  | { body: BodyName; source: 'oem'; file: string; sha256: string; startTdb: string; endTdb: string };

export interface PlanLeapSeconds {
  source: 'built-in' | 'file';
  /** Path of the leap-seconds.list as given to the CLI or service (null for built-in). */
  path: string | null;
  /** SHA-256 (hex) of that file's bytes (null for built-in). */
  sha256: string | null;
  /** The table's expiry (`#@`), `YYYY-MM-DD` UTC: from that day on TAI − UTC is assumed, not known. */
  expiresUtc: string;
  /** The publisher's last update (`#$`), `YYYY-MM-DD` UTC, or null. */
  updatedUtc: string | null;
  /** TAI − UTC assumed past the expiry (the last step), s. */
  taiMinusUtcAfterExpiryS: number;
  description: string;
  /** Steps: [UTC date `YYYY-MM-DD` from which it applies, TAI − UTC in s]. */
  steps: [string, number][];
}

export interface PlannedBurn {
  index: number;
  label: string;
  epoch: PlanEpoch;
  /** True when the corrector moved the epoch within the burn's window. */
  epochWasFree: boolean;
  /** The frame the problem stated the burn in. */
  frame: 'inertial' | 'RTN' | 'VNB';
  deltaVInertialKmS: Vec3;
  deltaVRtnKmS: Vec3;
  deltaVVnbKmS: Vec3;
  magnitudeMS: number;
  /** Rocket equation, g0 = 9.80665 m/s², from the mass before this burn. */
  propellantKg: number;
  massBeforeKg: number;
  massAfterKg: number;
  /** At the engine's thrust, from the mass before the burn. */
  durationS: number;
  /** Time from this burn to the first target after it, s (null when unknown). */
  timeToTargetS: number | null;
  /** Absent or 'impulsive': Δv at `epoch`. 'finite': `epoch` is the ignition, `deltaVInertialKmS` the ideal
   * (rocket-equation) Δv along the thrust direction at ignition, and `finite` holds the burn as flown. */
  model?: 'impulsive' | 'finite';
  finite?: PlannedFiniteBurn;
}

/** A finite burn as planned: enough to fly it again independently. Epochs TDB s from J2000 (+ text);
 * directions unit vectors; masses kg. */
export interface PlannedFiniteBurn {
  startTdbS: number;
  durationS: number;
  thrustN: number;
  massFlowKgS: number;
  /** Thrust direction at ignition, J2000 equatorial. For inertial steering it holds for the whole burn. */
  directionInertial: Vec3;
  /** Axes the direction is held fixed in ('inertial', or RTN / VNB of the instantaneous state relative to
   * the integration centre) and its components there. */
  axes: 'inertial' | 'RTN' | 'VNB';
  directionLocal: Vec3;
  /** The local axes at ignition (rows: the three axes of `axes` in J2000 equatorial components; the
   * identity for inertial). Pointing errors of the dispersion turn the direction in these axes. */
  axesAtStart: [Vec3, Vec3, Vec3];
  /** Thrust direction at cut-off, J2000 equatorial (differs from ignition for local-axis steering). */
  directionAtEndInertial: Vec3;
  start: PlanEpoch;
  end: PlanEpoch;
  propellantKg: number;
  massBeforeKg: number;
  massAfterKg: number;
  /** Ideal Δv of the burn, (F/ṁ)·ln(m_before/m_after), m/s. */
  idealDeltaVMS: number;
  /** The impulsive Δv that met the same targets, m/s, and the finite-burn loss: ideal − impulsive, m/s. */
  impulsiveDeltaVMS: number;
  finiteBurnLossMS: number;
  /** Events inside the arc, with the numbers (closest approach to a planned body, SOI crossing); empty
   * when none. Each raises a caveat. */
  insideArc: string[];
}

/** One scalar target component, e.g. B·T of a b-plane target. */
export interface TargetResult {
  targetIndex: number;
  kind: TargetKind;
  /** Component name: 'B·T', 'B·R', 'closest-approach epoch', 'periapsis radius', 'x', 'vx'... */
  component: string;
  unit: 'km' | 's' | 'deg' | 'km/s';
  body: BodyName | null;
  requested: number;
  achieved: number | null;
  /** achieved − requested (null when the event was not found). */
  residual: number | null;
  tolerance: number;
  met: boolean;
  /** For epoch components (closest-approach epoch): requested and achieved as epochs. */
  requestedEpoch?: PlanEpoch;
  achievedEpoch?: PlanEpoch | null;
}

export interface IterationRecord {
  iteration: number;
  /** Free variables: Δv components (km/s, in each burn's frame) and free epochs (s from the initial guess). */
  controls: number[];
  /** Residuals scaled by each target tolerance (dimensionless). */
  scaledResiduals: number[];
  /** Largest |scaled residual| (≤ 1 means every target met). */
  maxScaledResidual: number;
  /** 2-norm condition number of the scaled Jacobian (null when not computed). */
  conditionNumber: number | null;
  /** Step actually taken (after limiting / line search), in control units. */
  stepNorm: number;
  jacobianSource: 'stm' | 'finite-difference' | 'none';
  note?: string;
}

/** Controls of a finite burn: two pointing offsets (rad, across the seed direction), duration and ignition
 * shift (s). */
export type FiniteControlKind = 'point0' | 'point1' | 'duration' | 'ignition';

export interface ControlDescriptor {
  burnIndex: number;
  /** 'dv0'..'dv2' (component in the burn's frame) or 'epoch'. */
  kind: 'dv0' | 'dv1' | 'dv2' | 'epoch' | FiniteControlKind;
  name: string;
  unit: 'km/s' | 's' | 'rad';
}

export interface Sensitivities {
  controls: ControlDescriptor[];
  /** Target component names, in targets[] order. */
  components: string[];
  /** d(target component)/d(control), row per component, unscaled (units of target / units of control). */
  jacobian: number[][];
  source: 'stm' | 'finite-difference';
  /** Largest relative difference between STM and finite-difference Jacobians at the solution (null when
   * only one was computed). */
  stmVersusFiniteDifference: number | null;
  /** The central finite-difference Jacobian at the solution, when verified. */
  finiteDifferenceJacobian?: number[][];
}

export interface CrossCheck {
  passed: boolean;
  /** Method used for the plan and for the check. */
  primaryMethod: 'cowell' | 'encke';
  method: 'cowell' | 'encke';
  /** Central-body switching in the plan's runs and in the check's (the check flips it, so a formulation
   * error of either shows as a disagreement). Absent in plans made before the check varied it. */
  primarySwitching?: boolean;
  switching?: boolean;
  relativeTolerance: number;
  /** Allowed |difference| per component as a fraction of its target tolerance. */
  toleranceFraction: number;
  differences: {
    component: string;
    targetIndex: number;
    primary: number | null;
    check: number | null;
    difference: number | null;
    allowed: number;
    withinTolerance: boolean;
    metByCheck: boolean;
  }[];
  message: string;
}

export interface BPlaneEllipse {
  /** Semi-major and semi-minor axes, km (1σ). */
  semiMajorKm: number;
  semiMinorKm: number;
  /** Angle of the major axis from the T axis toward R, deg. */
  orientationDeg: number;
  /** 2x2 covariance [[TT, TR], [RT, RR]], km². */
  covarianceKm2: [[number, number], [number, number]];
}

export interface LinearDispersion {
  /** Δv execution-error contribution (Gates). */
  execution: { bPlane: BPlaneEllipse | null; closestApproachSigmaS: number | null; targetSigmas: number[] };
  /** Initial-state covariance contribution, when the problem gives one. */
  initialState: { bPlane: BPlaneEllipse | null; closestApproachSigmaS: number | null; targetSigmas: number[] } | null;
  /** Both combined. */
  total: { bPlane: BPlaneEllipse | null; closestApproachSigmaS: number | null; targetSigmas: number[] };
  /** 3σ ellipse axes of the total, km. */
  threeSigma: { semiMajorKm: number; semiMinorKm: number } | null;
  impactProbability: number | null;
}

export interface DispersionSample {
  index: number;
  /** Δv actually applied per burn, J2000 equatorial km/s. */
  appliedDeltaVKmS: Vec3[];
  /** B·T, B·R (km) at the b-plane target body, when there is one. */
  bDotTKm: number | null;
  bDotRKm: number | null;
  closestApproachTdbS: number | null;
  closestApproachRadiusKm: number | null;
  impact: boolean;
  /** Achieved value of every target component (null when not found). */
  achieved: (number | null)[];
}

export interface MonteCarloSummary {
  samples: number;
  seed: number;
  bPlane: BPlaneEllipse | null;
  meanBDotTKm: number | null;
  meanBDotRKm: number | null;
  closestApproachSigmaS: number | null;
  impacts: number;
  impactProbability: number;
  /** Linear vs sample covariance: largest relative difference of the ellipse axes. */
  linearAgreement: {
    axisRatioError: number | null; orientationErrorDeg: number | null; passed: boolean;
    /** Standard error (deg) of a sample ellipse's orientation under the linear model at this sample count;
     * large when the axes are nearly equal. Absent in plans made before it was recorded. */
    orientationStandardErrorDeg?: number | null;
    /** Significance of the statistical tests (mean and covariance) of the samples against the linear model. */
    limit: number; meanPValue: number | null; covariancePValue: number | null; message: string;
  } | null;
  /** Monte Carlo impact probability with its binomial 95 % interval. */
  impactProbabilityInterval: { lower95: number; upper95: number };
  /** Up to 500 sample points in the B-plane (km) for plots. */
  bPlanePoints: { bDotTKm: number; bDotRKm: number }[];
  /** Samples whose propagation failed for a reason other than impact. */
  failedSamples: number;
  targetSigmas: (number | null)[];
}

export interface PlanDispersion {
  executionModel: { fixedMagnitudeMS: number; proportionalMagnitudeFraction: number; fixedPointingMS: number; proportionalPointingDeg: number } | null;
  linear: LinearDispersion | null;
  monteCarlo: MonteCarloSummary | null;
  /** Why a part is absent (no execution errors, skipped, not converged). */
  notes: string[];
}

export interface TrajectoryPoint {
  tdbS: number;
  /** Central-body-relative, J2000 ecliptic, km. */
  positionKm: Vec3;
  velocityKmS: Vec3;
}

/** Where a body was, for the trajectory figure: relative to the plan's central body, J2000 ecliptic axes, km. */
export interface PlanBodyPosition {
  body: BodyName;
  /** `closest-approach`: a body the trajectory approaches, at that closest approach; `initial`: at the initial epoch. */
  at: 'closest-approach' | 'initial';
  epoch: PlanEpoch;
  positionKm: Vec3;
}

export interface PlanBPlane {
  body: BodyName;
  referencePlane: 'ecliptic' | 'equator';
  targetBDotTKm: number;
  targetBDotRKm: number;
  achievedBDotTKm: number | null;
  achievedBDotRKm: number | null;
  ellipse: BPlaneEllipse | null;
  bodyRadiusKm: number;
  /** Gravity-focused radius of impact in the B-plane, km. */
  impactRadiusKm: number | null;
  samples: { bDotTKm: number; bDotRKm: number }[];
}

export interface ManeuverPlan {
  planFormatVersion: 1;
  status: 'converged' | 'not-converged';
  problemHash: string;
  softwareVersion: string;
  spacecraftName: string;
  targetSetKey: string;
  title: string | null;
  createdFrom: { initialEpoch: PlanEpoch; endEpoch: PlanEpoch; centre: BodyName; frame: string; hasCovariance: boolean };
  /** The leap-second table used for every UTC epoch read or written (the problem hash covers it); absent in
   * plans made before it was recorded (they used the built-in table of their software version). */
  leapSeconds?: PlanLeapSeconds;
  /** The source of every body the plan used (the problem hash covers any file's SHA-256). Absent in plans
   * made before plans recorded it (those used the built-in series throughout). */
  ephemerisSources?: PlanEphemerisSource[];
  forceModel: { summary: string; centralBody: BodyName; perturbingBodies: BodyName[]; centralJ2: boolean; solarPressure: boolean; method: 'cowell' | 'encke'; relativeTolerance: number; switching: boolean; ephemeris: string };
  burns: PlannedBurn[];
  totalDeltaVMS: number;
  totalPropellantKg: number;
  /** spacecraft.propellantKg of the problem (usable propellant on board, kg), when given. */
  propellantLoadKg?: number | null;
  targets: TargetResult[];
  iterations: IterationRecord[];
  convergence: {
    outcome: 'converged' | 'iteration-limit' | 'diverged' | 'singular' | 'evaluation-failed' | 'least-squares-stationary';
    message: string;
    /** Targets outnumber free variables: steps were least-squares ones. */
    leastSquares: boolean;
    /** Largest 2-norm condition number of the scaled Jacobian over the iterations. */
    maxConditionNumber: number | null;
    /** When not converged: the controls of the last iterate (diagnostics only — never a plan to execute). */
    lastIterate: { controls: number[]; burnsInertialKmS: Vec3[] } | null;
    /** Initial guesses replaced by Lambert transfers (burns with guessFromLambert). */
    seeds: { burnIndex: number; deltaVInertialKmS: Vec3; message: string }[];
  };
  sensitivities: Sensitivities | null;
  /** Always present; `passed: false` with a message when it could not run (e.g. not converged). */
  crossCheck: CrossCheck;
  dispersion: PlanDispersion;
  caveats: Caveat[];
  trajectory: TrajectoryPoint[];
  bPlane: PlanBPlane | null;
  /** Closest approaches found after the last burn (planned trajectory). */
  approaches: { body: BodyName; epoch: PlanEpoch; distanceKm: number; altitudeKm: number }[];
  /** The Sun and the force model's bodies for the trajectory figure (absent from plans made before it existed). */
  bodyPositions?: PlanBodyPosition[];
  /** The thresholds the caveats were judged against (problem.limits). */
  limits: { safeAltitudeKm: number; impactProbabilityLimit: number; impulsiveDurationFraction: number; crossCheckToleranceFraction: number; conditionNumberLimit: number };
  /** Counts of work done: propagations and wall-independent integrator effort. */
  effort: { propagations: number; evaluations: number };
}
