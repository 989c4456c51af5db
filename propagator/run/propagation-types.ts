/**
 * Request and result of one propagation (Cowell or Encke), the contract between propagator/ and its
 * callers. All vectors J2000 equatorial unless a field says otherwise; km, s, km/s, kg; TDB s from J2000.
 */
import type { Ephemeris } from '../ephemeris/ephemeris.ts';
import type { BodyName, StateVector, Vec3 } from '../types.ts';

/** Cannonball solar radiation pressure. */
export interface SolarPressureSpec {
  /** Cross-section facing the Sun, m^2 (> 0). */
  areaM2: number;
  /** Reflectivity coefficient C_R in [1, 2]. */
  reflectivityCoefficient: number;
  /** Spacecraft mass, kg (> 0). */
  massKg: number;
  /** Shadow model: 'cylindrical' (the central body casts a cylindrical shadow, no penumbra) or 'none'.
   * @defaultValue 'cylindrical' */
  shadow?: 'none' | 'cylindrical';
}

/** Which forces act. The central body is a point mass (plus J2 when asked); perturbing bodies are point
 * masses in Battin's f(q) form with the indirect term on the central body. */
export interface ForceModelSpec {
  centralBody: BodyName;
  perturbingBodies: BodyName[];
  /** Add the central body's J2 (only where a J2 constant is known; otherwise InvalidInputError). */
  centralJ2?: boolean;
  solarPressure?: SolarPressureSpec;
  /** Override GM (km^3/s^2, > 0) of some bodies; the rest come from GM_KM3_S2 in constants.ts. */
  gmOverridesKm3S2?: Partial<Record<BodyName, number>>;
  /**
   * The body whose equations the run keeps (the central body or a perturbing one): the frame's
   * acceleration is this body's Newtonian acceleration from the model's bodies, and the central body
   * moves relative to it as the ephemeris tabulates (forces/moving-centre.ts). Switching sets it to the
   * request's central body in every segment, so a switched run reproduces the unswitched one.
   * @defaultValue centralBody
   */
  referenceBody?: BodyName;
}

/** An impulsive Δv applied at an epoch; the integrator stops exactly there. */
export interface VelocityImpulse {
  epochTdbS: number;
  /** Δv in km/s, J2000 equatorial. */
  deltaVKmS: Vec3;
}

/** Axes in which a finite burn's thrust direction is held fixed: J2000 equatorial ('inertial'), or the
 * local RTN / VNB axes of the instantaneous state relative to the integration centre (they turn with it). */
export type ThrustAxes = 'inertial' | 'RTN' | 'VNB';

/**
 * A constant-thrust burn of finite duration: thrust `thrustN` along a fixed direction in `axes` from
 * `startTdbS` for `durationS`, the mass falling at `massFlowKgS` (ṁ = F/(Isp·g0) for an engine of
 * specific impulse Isp). The integrator lands steps on ignition and cut-off.
 */
export interface FiniteBurnSpec {
  /** Ignition, TDB s from J2000. */
  startTdbS: number;
  /** Burn duration, s (> 0). */
  durationS: number;
  /** Thrust, N (> 0). */
  thrustN: number;
  /** Mass flow, kg/s (≥ 0). */
  massFlowKgS: number;
  axes: ThrustAxes;
  /** Unit thrust direction in `axes` components (|u| = 1 within 1e-9; used as given). */
  direction: Vec3;
}

/** One finite burn as flown: epochs TDB s from J2000, masses kg, states J2000 equatorial relative to the
 * integration centre (km, km/s). */
export interface FiniteBurnRecord {
  startTdbS: number;
  endTdbS: number;
  massBeforeKg: number;
  massAfterKg: number;
  /** Ideal Δv of the burn, (F/ṁ)·ln(m_before/m_after) (rocket equation), km/s; F/m·duration when ṁ = 0. */
  idealDeltaVKmS: number;
  /** Thrust direction at ignition and at cut-off, J2000 equatorial unit vectors. */
  directionAtStartInertial: Vec3;
  directionAtEndInertial: Vec3;
  stateAtStart: StateVector;
  stateAtEnd: StateVector;
}

/**
 * Sensitivities of the final state (6: km, km/s, J2000 equatorial) to one finite burn's parameters, when
 * withStm was set: the direction components as given in its axes (6x3 row-major), ignition epoch with the
 * duration held (per s) and duration with the ignition held (per s). Mass couples later burns to this
 * one's duration; the SRP term's dependence on mass is left out of these partials (it is ~1e-9 of the
 * thrust acceleration for a spacecraft of ordinary area-to-mass).
 */
export interface FiniteBurnSensitivity {
  direction: number[];
  startTdbS: number[];
  durationS: number[];
}

/** Events located on the dense output (time tolerance 1e-6 s or better). */
export type EventSpec =
  | { kind: 'periapsis'; body: BodyName; stop?: boolean }
  | { kind: 'apoapsis'; body: BodyName; stop?: boolean }
  | { kind: 'closest-approach'; body: BodyName; stop?: boolean }
  | { kind: 'altitude'; body: BodyName; altitudeKm: number; stop?: boolean }
  | { kind: 'epoch'; epochTdbS: number; stop?: boolean };
// Sphere-of-influence entry/exit and impact are always reported when switching / bodies apply.

/** An event located during a run (epoch TDB s from J2000; state km, km/s, J2000 equatorial). */
export interface EventRecord {
  kind: EventSpec['kind'] | 'soi-entry' | 'soi-exit' | 'impact';
  body?: BodyName;
  epochTdbS: number;
  /** Spacecraft state at the event, relative to `body` when given, else to the integration centre. */
  state: StateVector;
  /** Distance to `body` at the event, km (where a body applies). */
  distanceKm?: number;
}

/** Central-body switching at spheres of influence (radii km). */
export interface SwitchingSpec {
  /** Switch the integration centre to a perturbing body inside its sphere of influence. */
  enabled: boolean;
  /** Override the Laplace sphere-of-influence radius per body, km. */
  radiusKm?: Partial<Record<BodyName, number>>;
}

/** Cowell (the total acceleration integrated directly) or Encke (the deviation from a reference conic). */
export type PropagationMethod = 'cowell' | 'encke';

/** One propagation: initial state, end epoch (TDB s from J2000), forces, ephemeris and options. */
export interface PropagationRequest {
  /** Initial state; any centre and inertial frame (translated/rotated to the integration frame). */
  initial: StateVector;
  /** Final epoch, TDB s from J2000; may precede the initial epoch (backward propagation). */
  endEpochTdbS: number;
  forces: ForceModelSpec;
  ephemeris: Ephemeris;
  method?: PropagationMethod;
  /** Relative and absolute error tolerances of the step control (defaults in PROPAGATION_DEFAULTS). */
  relativeTolerance?: number;
  absoluteTolerance?: number;
  maxSteps?: number;
  burns?: VelocityImpulse[];
  /** Finite burns (forward propagations only; none may overlap another or contain an impulsive burn). */
  finiteBurns?: FiniteBurnSpec[];
  /** Method of the finite burns' thrust arcs; @defaultValue `method`. With the STM an arc runs in Cowell
   * form whatever is asked (its parameter partials exist in that form only). */
  arcMethod?: PropagationMethod;
  /** Spacecraft mass at the initial epoch, kg (> 0); needed with finite burns unless forces.solarPressure
   * gives it (both given: they must agree). The mass falls during finite burns only; it scales SRP. */
  initialMassKg?: number;
  /** When set, the result holds states every outputStepS seconds (plus start and end). */
  outputStepS?: number;
  /** Integrate the 6x6 state transition matrix alongside the state. */
  withStm?: boolean;
  events?: EventSpec[];
  switching?: SwitchingSpec;
}

/** How a run ended: reached the end epoch, or why it stopped early (a result, never a throw). */
export type PropagationOutcome =
  | 'finished' | 'stopped-by-event' | 'impact' | 'step-size-underflow' | 'max-steps' | 'cancelled';

/** Integration counts of a run (all segments of a switched run summed). */
export interface PropagationStats {
  steps: number;
  acceptedSteps: number;
  rejectedSteps: number;
  /** Right-hand-side evaluations (each evaluates every force once). */
  evaluations: number;
  /** Encke reference-conic rectifications. */
  rectifications: number;
  /** Central-body switches, in order. */
  switches: { epochTdbS: number; from: BodyName; to: BodyName }[];
}

/** The method that integrated a run: the requested one unless Encke fell back to Cowell (see
 * `warnings`); 'mixed' when the segments of a switched run used different methods. */
export type MethodUsed = PropagationMethod | 'mixed';

/** The outcome and final state of a run (J2000 equatorial, km, km/s, TDB s from J2000), with samples,
 * events, the STM on request, counts and warnings. */
export interface PropagationResult {
  outcome: PropagationOutcome;
  /** The method actually used (may differ from the request's `method`; see MethodUsed). */
  methodUsed: MethodUsed;
  /** Why the run ended early, with the numbers needed to diagnose it. */
  message?: string;
  /** Last state reached (J2000 equatorial, relative to the central body in force at the end). */
  final: StateVector;
  /** d(final state)/d(initial state), 6x6 row-major (36 numbers), when withStm was set. */
  stm?: number[];
  /** d(final state)/d(Δv) of each burn, 6x3 row-major (18 numbers), when withStm was set. */
  burnSensitivities?: number[][];
  /** Per finite burn (request order), when the request had finite burns. */
  finiteBurns?: FiniteBurnRecord[];
  /** Per finite burn (request order), when the request had finite burns and withStm was set. */
  finiteBurnSensitivities?: FiniteBurnSensitivity[];
  /** ∂(final state)/∂(initial mass), 6 numbers (km/kg, km/s/kg), when the request had finite burns and
   * withStm was set. */
  initialMassSensitivity?: number[];
  /** Mass at the final epoch, kg, when the request had finite burns. */
  finalMassKg?: number;
  /** States at the output step, when outputStepS was set. */
  samples: StateVector[];
  events: EventRecord[];
  stats: PropagationStats;
  warnings: string[];
}

/** Progress and cancellation of a run. */
export interface PropagationOptions {
  /** Called with the fraction of the span done, in [0, 1], at most every few milliseconds. */
  onProgress?: (fraction: number) => void;
  /** Stops the run promptly (outcome 'cancelled'). */
  signal?: AbortSignal;
}
