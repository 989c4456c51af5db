/**
 * The Δv budget's plain-data shapes (JSON-serialisable, no NaN: a number that could not be computed is
 * null). Vectors J2000 equatorial; km, s, km/s, kg, m/s where the name says MS.
 */
import type { Vec3 } from './bodies.ts';
import type { BPlaneEllipse, Caveat, ManeuverPlan } from './plan-types.ts';

/** Which path produced a sample or a summary. */
export type BudgetPath = 'linear' | 'nonlinear';

/** One burn of the nominal sequence with what the linear path needs (plain data: crosses threads/jobs). */
export interface NominalBurn {
  label: string;
  epochTdbS: number;
  frame: 'inertial' | 'RTN' | 'VNB';
  /** Nominal Δv, J2000 equatorial, km/s. */
  deltaVInertialKmS: Vec3;
  /** Nominal Δv in the burn's own frame, km/s (the re-plan's starting point). */
  deltaVLocalKmS: Vec3;
  /** Which components the re-plan may change (the problem's freeComponents). */
  freeComponents: [boolean, boolean, boolean];
  /** Nominal state just before the burn, [r km, v km/s], J2000 equatorial, integration centre. */
  preBurnState: number[];
  massBeforeKg: number;
  /** Linear gain: commanded Δv correction (inertial, km/s) = −gain · (estimated state deviation), 3x6. */
  gain: number[][];
  /** State transition from just after this burn to just before the next (6x6); null for the last burn. A
   * finite burn: from its ignition (preBurnState) through its arc to the next burn. */
  transitionToNext: number[][] | null;
  /** A finite burn (model 'finite'): d(state just before the next burn)/d(equivalent Δv, J2000 equatorial),
   * 6x3 (a change of Δv along the burn is a duration change, across it a pointing change); null for the last
   * burn. Absent for impulsive burns, whose Δv adds to the velocity. */
  deltaVToNext?: number[][] | null;
  /** 'finite' when the nominal burn is a finite burn (epochTdbS is its ignition, Δv its equivalent Δv);
   * @defaultValue 'impulsive' */
  model?: 'impulsive' | 'finite';
}

/** The nominal sequence: the converged plan the budget is made around, and the linear model. */
export interface BudgetNominal {
  plan: ManeuverPlan;
  burns: NominalBurn[];
  /** Initial state → first burn (6x6). */
  transitionToFirst: number[][];
  /** Every component (targets, then auxiliary) reached by the nominal sequence. */
  nominalValues: number[];
  /** d(components)/d(state just after the last burn), components x 6; a finite last burn: d/d(state at its
   * ignition), with its equivalent Δv held. */
  deliveryJacobian: number[][];
  /** A finite last burn: d(components)/d(its equivalent Δv, J2000 equatorial), components x 3; else absent. */
  deliveryBurnJacobian?: number[][] | null;
  /** Component names and units, in `nominalValues` order; the first `targetCount` are targets. */
  components: { name: string; unit: string }[];
  targetCount: number;
  /** Index of B·T, B·R and closest-approach epoch among the components, when there is a B-plane target. */
  bPlane: { body: string; bDotT: number; bDotR: number; closestApproach: number; bodyRadiusKm: number; impactRadiusKm: number | null; vInfinityKmS: number | null; gmKm3S2: number } | null;
  /** Initial covariance (J2000 equatorial) and each burn's knowledge covariance, 6x6, or null when zero. */
  initialCovariance: number[][] | null;
  knowledgeCovariances: number[][][];
}

/** One burn of one sample. */
export interface SampleBurn {
  /** Commanded Δv (the re-plan's answer), J2000 equatorial, km/s. */
  commandedKmS: Vec3;
  /** |commanded Δv|, m/s: what the budget counts. */
  magnitudeMS: number;
  /** Propellant by the rocket equation on the executed Δv, from this sample's mass before the burn, kg. */
  propellantKg: number;
}

/** One sample of either path. */
export interface BudgetSample {
  index: number;
  /** Burns done, in order; shorter than the sequence when the sample stopped (impact, no convergence). */
  burns: SampleBurn[];
  /** Every component delivered (null when not reached). */
  delivered: (number | null)[];
  /** Closest-approach altitude over the B-plane / first approach body, km (null when not evaluated). */
  closestApproachAltitudeKm: number | null;
  impact: boolean;
  /** Burn index whose re-plan did not converge, or null. */
  notConvergedAt: number | null;
  /** Why the sample stopped early (impact, re-plan failure, propagation failure), or null. */
  stopReason: string | null;
}

/** Distribution of one scalar over the samples. */
export interface Distribution {
  count: number;
  mean: number;
  sigma: number;
  p95: number;
  p99: number;
  /** Distribution-free 95 % interval of the 99th percentile (binomial order statistics). */
  p99Interval: { lower: number; upper: number } | null;
  max: number;
}

/** Budget of one burn over the samples. */
export interface BurnBudgetSummary {
  label: string;
  epochTdbS: number;
  nominalMagnitudeMS: number;
  deltaVMS: Distribution;
  propellantKg: Distribution;
  /** Histogram of |Δv|, m/s: equal bins from 0 to the largest sample. */
  histogram: { binWidthMS: number; counts: number[] };
}

export interface LimitCrossing {
  /** Samples crossing, out of `evaluated`. */
  count: number;
  evaluated: number;
  probability: number;
  /** Wilson 95 % interval. */
  lower95: number;
  upper95: number;
}

/** Everything one path gives. */
export interface BudgetSummary {
  path: BudgetPath;
  samples: number;
  seed: number;
  /** Samples in the Δv statistics (all burns done). */
  used: number;
  /** Samples whose re-plan did not converge: counted and listed (first 100 indices), left out of the
   * Δv statistics. */
  notConverged: { count: number; indices: number[] };
  /** Samples that stopped for another reason (impact before the last burn, propagation failure). */
  stopped: { count: number; indices: number[] };
  burns: BurnBudgetSummary[];
  /** From the per-sample totals (not summed percentiles). */
  total: { deltaVMS: Distribution; propellantKg: Distribution };
  delivery: {
    components: { name: string; unit: string; mean: number | null; sigma: number | null }[];
    bPlane: BPlaneEllipse | null;
    meanBDotTKm: number | null;
    meanBDotRKm: number | null;
    closestApproachSigmaS: number | null;
    /** Up to 500 delivered B-plane points, km. */
    points: { bDotTKm: number; bDotRKm: number }[];
  };
  limits: { impact: LimitCrossing; belowSafeAltitude: LimitCrossing | null; safeAltitudeKm: number };
}

/**
 * Linear vs non-linear for one burn, by the plan's linear/Monte Carlo check (mean χ² test and covariance
 * likelihood-ratio test with p-values) on the burn's free Δv components along its nominal local axes, m/s.
 */
export interface BurnAgreement {
  label: string;
  /** Non-linear samples checked (those that did every burn). */
  samples: number;
  /** The checked quantities, e.g. `Δv T` (free components only). */
  components: string[];
  /** |Δv| of each path, m/s, for reading beside the check. */
  linear: { mean: number; sigma: number; p99: number };
  nonlinear: { mean: number; sigma: number; p99: number };
  /** False when the check could not run (too few samples, a component without dispersion): see `message`. */
  checked: boolean;
  meanStatistic: number | null;
  meanPValue: number | null;
  covarianceStatistic: number | null;
  covariancePValue: number | null;
  /** Non-linear / linear σ per component. */
  sigmaRatios: number[];
  /** Checked, and both p-values ≥ the significance. */
  passed: boolean;
  message: string;
}

export interface BudgetAgreement {
  /** Every burn checked and passed. */
  passed: boolean;
  /** A p-value below this fails the burn. */
  significance: number;
  burns: BurnAgreement[];
  message: string;
}

/** The result: a study, never a plan to approve. */
export interface BudgetResult {
  budgetFormatVersion: 1;
  kind: 'delta-v-budget';
  problemHash: string;
  /** SHA-256 of the canonical validated budget request. */
  requestHash: string;
  softwareVersion: string;
  spacecraftName: string;
  title: string | null;
  /** Which source served each body of the nominal plan and its re-plans (the plan's record; absent in older studies). */
  ephemerisSources?: ManeuverPlan['ephemerisSources'];
  nominal: { status: ManeuverPlan['status']; crossCheckPassed: boolean; burns: { label: string; epochTdbS: number; epochTdb: string; /** UTC through the nominal plan's leap-second table (null before 1972; absent in older studies). */ epochUtc?: string | null; magnitudeMS: number }[]; totalDeltaVMS: number };
  linear: BudgetSummary | null;
  nonlinear: BudgetSummary | null;
  agreement: BudgetAgreement | null;
  caveats: Caveat[];
  notes: string[];
}

/** Progress of a budget run; `fraction` in [0, 1]. */
export interface BudgetProgress {
  stage: 'nominal' | 'linear' | 'nonlinear' | 'summary' | 'done';
  fraction: number;
  message: string;
  samplesDone?: number;
  samplesTotal?: number;
}
