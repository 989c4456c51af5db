/**
 * A plain driver over a DOP853 stepper: integrates to a final time with optional per-step observer,
 * step limit and AbortSignal. Not finishing is data (an outcome), never an exception.
 */
import { Dop853Stepper } from './dop853.ts';
import type { Dop853Options, IntegrationOutcome, IntegratorCounts, RhsFunction } from './integrator-types.ts';

export interface DriveOptions {
  /** Largest number of accepted-or-rejected step attempts. @defaultValue 1_000_000 */
  maxSteps?: number;
  signal?: AbortSignal;
  /** Called after every accepted step; return true to stop ('stopped-by-event'). */
  onStep?: (stepper: Dop853Stepper) => boolean | void;
}

export interface DriveResult {
  outcome: IntegrationOutcome;
  message?: string;
  /** Time reached (s, the caller's time scale). */
  t: number;
  /** State reached (a copy). */
  y: Float64Array;
  counts: IntegratorCounts;
}

/** Integrates y' = rhs(t, y) from (t0, y0) to tEnd (either direction) with DOP853. */
export function integrateDop853(
  rhs: RhsFunction, t0: number, y0: ArrayLike<number>, tEnd: number, options: Dop853Options & DriveOptions,
): DriveResult {
  const stepper = new Dop853Stepper(rhs, t0, y0, tEnd >= t0 ? 1 : -1, { endTime: tEnd, ...options });
  return driveTo(stepper, tEnd, options);
}

/** Advances an existing stepper to tEnd; see {@link integrateDop853}. */
export function driveTo(stepper: Dop853Stepper, tEnd: number, options: DriveOptions = {}): DriveResult {
  const maxSteps = options.maxSteps ?? 1_000_000;
  const done = (outcome: IntegrationOutcome, message?: string): DriveResult => ({
    outcome, message, t: stepper.t, y: Float64Array.from(stepper.y), counts: { ...stepper.counts },
  });
  while (stepper.t !== tEnd) {
    if (options.signal?.aborted) return done('cancelled', `cancelled at t = ${stepper.t}`);
    if (stepper.counts.steps >= maxSteps) return done('max-steps', `${maxSteps} steps reached at t = ${stepper.t}`);
    if (stepper.step(tEnd) === 'step-size-underflow') return done('step-size-underflow', stepper.diagnostic);
    if (options.onStep?.(stepper) === true) return done('stopped-by-event');
  }
  return done('finished');
}
