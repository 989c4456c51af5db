/**
 * The retargeting problem: the ONE zod definition used by the CLI, the API (and its OpenAPI document), the
 * queue's job data and the console's forms. Shape checks only; the checks that relate fields to each other
 * (epochs in the span, bodies modelled, periapsis above the surface...) live in problem-checks.ts.
 *
 * Units are in the field names (km, s, km/s, kg; `MS` = m/s). Epochs are ISO-8601 text with the time scale
 * named: `2030-05-01T00:00:00Z` (UTC) or `2030-05-01T00:00:00 TDB` (also TAI, TT).
 * No transforms here, so the schema converts to JSON Schema as-is.
 */
import * as z from 'zod';
import { ephemerisSetNameSchema } from './ephemeris-set-name.ts';
import { BODY_NAMES, INERTIAL_FRAMES } from './bodies.ts';
import { freeTextSchema } from './free-text.ts';
import { PROBLEM_BOUNDS as BOUNDS, RELATIVE_TOLERANCE_RANGE } from './problem-bounds.ts';

/** An ISO-8601 epoch with its time scale: `...Z` or `... UTC|TAI|TT|TDB`. Parsed in problem-checks.ts. */
export const epochTextSchema = z.string().min(10).max(64)
  .describe("ISO-8601 epoch with the scale named: '2030-05-01T00:00:00Z' (UTC) or '2030-05-01T00:00:00 TDB'");

const bodySchema = z.enum(BODY_NAMES);
/** A number in [-limit, limit]. */
const within = (limit: number) => z.number().min(-limit).max(limit);
/** Three numbers, each in [-limit, limit]. */
const vec3Within = (limit: number) => z.tuple([within(limit), within(limit), within(limit)]);
/** A number in [range.min, range.max]. */
const inRange = (range: { min: number; max: number }) => z.number().min(range.min).max(range.max);
const positionKmSchema = vec3Within(BOUNDS.positionKm);
const velocityKmSSchema = vec3Within(BOUNDS.velocityKmS);
const deltaVKmSSchema = vec3Within(BOUNDS.deltaVKmS);

/** Reference plane of a B-plane or inclination target: the J2000 mean ecliptic or the J2000 mean Earth
 * equator (ICRF-aligned). */
export const REFERENCE_PLANES = ['ecliptic', 'equator'] as const;
export type ReferencePlane = (typeof REFERENCE_PLANES)[number];
const referencePlaneSchema = z.enum(REFERENCE_PLANES);

const spacecraftSchema = z.object({
  name: freeTextSchema({ min: 1, max: 80, visible: true }),
  /** Wet mass at the initial epoch, kg. */
  massKg: z.number().positive().max(BOUNDS.massKg),
  /** Usable propellant on board at the initial epoch, kg; when given, burns needing more are flagged. */
  propellantKg: z.number().positive().max(BOUNDS.massKg).optional(),
  engine: z.object({
    /** Specific impulse, s. */
    ispS: z.number().positive().max(BOUNDS.ispS),
    /** Thrust, N. */
    thrustN: z.number().positive().max(BOUNDS.thrustN),
  }).strict(),
  /** Cannonball solar radiation pressure model (used when forceModel.solarPressure is true). */
  solarPressure: z.object({
    areaM2: z.number().positive().max(BOUNDS.areaM2),
    reflectivityCoefficient: z.number().min(1).max(2),
  }).strict().optional(),
}).strict();

const initialStateSchema = z.object({
  epoch: epochTextSchema,
  centre: bodySchema,
  frame: z.enum(INERTIAL_FRAMES),
  positionKm: positionKmSchema,
  velocityKmS: velocityKmSSchema,
  /** Optional 6x6 orbit-determination covariance of [r, v] in the state's frame: km², km²/s, km²/s². */
  covarianceKmKmS: z.array(z.array(within(BOUNDS.covarianceEntry)).length(6)).length(6).optional(),
}).strict();

const forceModelSchema = z.object({
  centralBody: bodySchema,
  perturbingBodies: z.array(bodySchema).max(10).default([]),
  /** Central body's J2 (known for Earth only). */
  centralJ2: z.boolean().default(false),
  /** Solar radiation pressure from spacecraft.solarPressure. */
  solarPressure: z.boolean().default(false),
  method: z.enum(['cowell', 'encke']).default('cowell'),
  /** Relative tolerance of the integrator's step control. */
  relativeTolerance: inRange(RELATIVE_TOLERANCE_RANGE).default(1e-11),
  /** Switch the integration centre inside a perturbing body's sphere of influence. */
  switching: z.boolean().default(false),
  /** A named ephemeris set of the service (GET /v1/ephemerides): its OEM files serve the bodies they tabulate,
   * the built-in series the rest. Absent: the built-in series throughout. */
  ephemerisSet: ephemerisSetNameSchema.optional(),
}).strict();

const burnSchema = z.object({
  /** Short label for reports, e.g. `TCM-1`. */
  label: freeTextSchema({ min: 1, max: 40, visible: true }).optional(),
  /** Burn epoch (the initial one when epochWindow makes it free). */
  epoch: epochTextSchema,
  /** Axes of the Δv components: `inertial` = J2000 equatorial; RTN and VNB are taken at the burn state
   * relative to the integration centre. */
  frame: z.enum(['inertial', 'RTN', 'VNB']),
  /** Initial guess of the Δv, km/s, in `frame`. */
  deltaVGuessKmS: deltaVKmSSchema,
  /** Which of the three components the corrector may change. */
  freeComponents: z.tuple([z.boolean(), z.boolean(), z.boolean()]).default([true, true, true]),
  /** Optional per-component bounds, km/s, in `frame`. */
  boundsKmS: z.object({ lower: deltaVKmSSchema, upper: deltaVKmSSchema }).strict().optional(),
  /** Replace the free components' initial guess by a Lambert transfer (Izzo 2015, two-body about the
   * central body) from the burn point to the first position or state target after it. */
  guessFromLambert: z.boolean().default(false),
  /** When given, the burn epoch is also free within [earliest, latest]. */
  epochWindow: z.object({ earliest: epochTextSchema, latest: epochTextSchema }).strict().optional(),
  /** `impulsive` (absent means impulsive): an instantaneous Δv at `epoch`. `finite`: the engine fires at its
   * thrust for a duration along a direction held fixed in `frame` axes (inertial = J2000 equatorial; RTN /
   * VNB turn with the instantaneous state). The corrector first solves the impulsive problem, then the
   * finite burn (pointing and duration; ignition too when epochWindow is given, the window bounding the
   * ignition) starting from a burn centred on the impulsive epoch. A finite burn frees all three
   * components (freeComponents all true, no boundsKmS). */
  model: z.enum(['impulsive', 'finite']).optional(),
}).strict();

const toleranceKm = inRange(BOUNDS.toleranceKm);

const targetSchema = z.discriminatedUnion('kind', [
  z.object({
    kind: z.literal('b-plane'),
    /** Flyby body; the B-plane is taken at closest approach to it after the last burn. */
    body: bodySchema,
    referencePlane: referencePlaneSchema.default('ecliptic'),
    bDotTKm: within(BOUNDS.distanceKm),
    bDotRKm: within(BOUNDS.distanceKm),
    toleranceKm,
  }).strict(),
  z.object({
    kind: z.literal('closest-approach-epoch'),
    body: bodySchema,
    epoch: epochTextSchema,
    toleranceS: inRange(BOUNDS.toleranceS),
  }).strict(),
  z.object({
    kind: z.literal('periapsis-radius'),
    body: bodySchema,
    radiusKm: z.number().positive().max(BOUNDS.distanceKm),
    toleranceKm,
  }).strict(),
  z.object({
    kind: z.literal('periapsis-altitude'),
    body: bodySchema,
    altitudeKm: within(BOUNDS.distanceKm),
    toleranceKm,
  }).strict(),
  z.object({
    kind: z.literal('periapsis-inclination'),
    body: bodySchema,
    referencePlane: referencePlaneSchema.default('equator'),
    inclinationDeg: z.number().min(0).max(180),
    toleranceDeg: inRange(BOUNDS.toleranceDeg),
  }).strict(),
  z.object({
    kind: z.literal('position'),
    epoch: epochTextSchema,
    centre: bodySchema,
    /** J2000 equatorial position relative to `centre`, km. */
    positionKm: positionKmSchema,
    toleranceKm,
  }).strict(),
  z.object({
    kind: z.literal('state'),
    epoch: epochTextSchema,
    centre: bodySchema,
    /** J2000 equatorial position and velocity relative to `centre`. */
    positionKm: positionKmSchema,
    velocityKmS: velocityKmSSchema,
    toleranceKm,
    velocityToleranceKmS: inRange(BOUNDS.velocityToleranceKmS),
  }).strict(),
]);

/** Gates (1963) execution-error model, all 1σ: fixed and proportional magnitude, fixed and proportional
 * pointing. */
const executionErrorsSchema = z.object({
  fixedMagnitudeMS: z.number().min(0).max(BOUNDS.executionErrorMS),
  /** Fraction of |Δv| (e.g. 0.005 for 0.5 %). */
  proportionalMagnitudeFraction: z.number().min(0).max(0.5),
  /** Fixed pointing error expressed as a velocity per transverse axis, m/s. */
  fixedPointingMS: z.number().min(0).max(BOUNDS.executionErrorMS),
  /** Proportional pointing error: angle per transverse axis, deg. */
  proportionalPointingDeg: z.number().min(0).max(30),
}).strict();

const dispersionSchema = z.object({
  /** Monte Carlo samples (0 = linear mapping only). */
  samples: z.number().int().min(0).max(100_000).default(200),
  /** Seed of the per-sample PRNG: sample i depends on (seed, i) only. */
  seed: z.number().int().min(0).max(2 ** 32 - 1).default(1),
}).strict();

const correctorSchema = z.object({
  maxIterations: z.number().int().min(1).max(100).default(15),
  /** Largest change of any Δv component in one iteration, km/s. */
  maxStepKmS: z.number().positive().max(BOUNDS.deltaVKmS).default(0.05),
  /** Largest change of a free burn epoch in one iteration, s. */
  maxEpochStepS: z.number().positive().max(BOUNDS.maxEpochStepS).default(3600),
}).strict();

const limitsSchema = z.object({
  /** Closest approach below this altitude over the target body raises a critical caveat, km. */
  safeAltitudeKm: z.number().min(0).max(BOUNDS.distanceKm).default(300),
  /** Impact probability above this raises a critical caveat. */
  impactProbabilityLimit: z.number().min(0).max(1).default(1e-4),
  /** Burn duration above this fraction of the time from the burn to its first target flags the impulsive
   * approximation. */
  impulsiveDurationFraction: z.number().positive().max(1).default(0.01),
  /** The cross-check passes when every target differs between methods by at most this fraction of its
   * tolerance. */
  crossCheckToleranceFraction: z.number().positive().max(10).default(0.01),
  /** Jacobian condition numbers above this raise the ill-conditioning caveat. */
  conditionNumberLimit: inRange(BOUNDS.conditionNumberLimit).default(1e8),
}).strict();

export const problemSchema = z.object({
  /** Free text: what this retargeting is for. */
  title: freeTextSchema({ max: 200 }).optional(),
  spacecraft: spacecraftSchema,
  initialState: initialStateSchema,
  /** End of the propagation span. */
  endEpoch: epochTextSchema,
  forceModel: forceModelSchema,
  burns: z.array(burnSchema).min(1).max(6),
  targets: z.array(targetSchema).min(1).max(12),
  executionErrors: executionErrorsSchema.optional(),
  dispersion: dispersionSchema.default({ samples: 200, seed: 1 }),
  corrector: correctorSchema.default({ maxIterations: 15, maxStepKmS: 0.05, maxEpochStepS: 3600 }),
  limits: limitsSchema.default({
    safeAltitudeKm: 300, impactProbabilityLimit: 1e-4, impulsiveDurationFraction: 0.01,
    crossCheckToleranceFraction: 0.01, conditionNumberLimit: 1e8,
  }),
}).strict();

/** A validated retargeting problem (defaults filled in). */
export type PlanningProblem = z.infer<typeof problemSchema>;
/** The problem as written by a user (defaults optional). */
export type PlanningProblemInput = z.input<typeof problemSchema>;
export type ProblemBurn = PlanningProblem['burns'][number];
export type ProblemTarget = PlanningProblem['targets'][number];
export type TargetKind = ProblemTarget['kind'];
export type ExecutionErrors = NonNullable<PlanningProblem['executionErrors']>;
