/**
 * Shared types of the ODE integrators. The independent variable is time in seconds (TDB s from J2000
 * when the integrators are driven by the propagator); the state is any Float64Array.
 */

/** Right-hand side y' = f(t, y). Writes f into `dydt`; must not keep references to `y` or `dydt`,
 * and should not allocate (it runs 12–15 times per step). */
export type RhsFunction = (t: number, y: Float64Array, dydt: Float64Array) => void;

/** Result of one call to a stepper's `step()`. */
export type StepStatus = 'accepted' | 'step-size-underflow';

/** How an integration run ended; not finishing is data, not an exception. */
export type IntegrationOutcome = 'finished' | 'stopped-by-event' | 'step-size-underflow' | 'max-steps' | 'cancelled';

/** Work counters, as in Hairer's codes. */
export interface IntegratorCounts {
  /** Step attempts, accepted plus rejected. */
  steps: number;
  acceptedSteps: number;
  rejectedSteps: number;
  /** Right-hand-side evaluations, including the initial one and dense-output stages. */
  evaluations: number;
}

/** Options of the adaptive Dormand–Prince 8(5,3) stepper. */
export interface Dop853Options {
  /** Relative error tolerance per component, in [1e-16, 1). */
  relativeTolerance: number;
  /** Absolute error tolerance per component (units of the state), > 0. */
  absoluteTolerance: number;
  /** First trial step, s (magnitude; the sign comes from the direction). Default: Hairer's estimate. */
  initialStepS?: number;
  /** Largest step magnitude, s. @defaultValue Infinity */
  maxStepS?: number;
  /** Where the run is heading (same time units). Bounds the starting-step estimate, whose trial
   * evaluation would otherwise land beyond it (Hairer's HINIT uses |xend - x| the same way). */
  endTime?: number;
  /** Only the first `errorComponents` entries of the state enter the error norm (e.g. 6 when the STM
   * rides along). @defaultValue the whole state */
  errorComponents?: number;
  /** The state's trailing components obey linear equations driven by the leading ones (the STM's
   * variational equations): a trial step computes the tail only once it is accepted. @defaultValue none */
  linearTail?: LinearTail;
}

/**
 * y = [head, tail] with head' = f(t, head) and tail' = A(t, head) · tail. The stepper integrates a trial
 * step's head first — the error norm sees the head alone (offset ≥ errorComponents) — and the tail only
 * when the step is accepted, from the A kept at each stage; head and tail together must equal the
 * right-hand side component by component, so the numbers are those of the full right-hand side.
 */
export interface LinearTail {
  /** Index of the tail's first component. */
  readonly offset: number;
  /** Head derivative at (t, y) into dydt[0..offset); keeps A(t, y) for stage `stage` (2..12). */
  head(t: number, y: Float64Array, dydt: Float64Array, stage: number): void;
  /** Tail derivative A(stage) · y[offset..] into dydt[offset..]. */
  tail(y: Float64Array, dydt: Float64Array, stage: number): void;
}
