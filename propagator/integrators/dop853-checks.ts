/**
 * Checks of the DOP853 stepper's inputs, before any work: a real error naming the option for each bad
 * value (InvalidInputError).
 */
import { InvalidInputError } from '../../contract/errors.ts';
import type { Dop853Options } from './integrator-types.ts';

/** Throws InvalidInputError for a non-finite start, bad tolerances, step bounds or linear tail. */
export function validateOptions(t0: number, y0: ArrayLike<number>, options: Dop853Options): void {
  if (!Number.isFinite(t0)) throw new InvalidInputError('t0', `must be finite, got ${t0}`);
  for (let i = 0; i < y0.length; i++) {
    if (!Number.isFinite(y0[i])) throw new InvalidInputError(`y0[${i}]`, `must be finite, got ${y0[i]}`);
  }
  const { relativeTolerance: rtol, absoluteTolerance: atol } = options;
  if (!(rtol >= 1e-16 && rtol < 1)) {
    throw new InvalidInputError('relativeTolerance', `must lie in [1e-16, 1), got ${rtol}`);
  }
  if (!(atol > 0 && Number.isFinite(atol))) {
    throw new InvalidInputError('absoluteTolerance', `must be a finite number > 0, got ${atol}`);
  }
  if (options.maxStepS !== undefined && !(options.maxStepS > 0)) {
    throw new InvalidInputError('maxStepS', `must be > 0, got ${options.maxStepS}`);
  }
  if (options.initialStepS !== undefined && !(Math.abs(options.initialStepS) > 0 && Number.isFinite(options.initialStepS))) {
    throw new InvalidInputError('initialStepS', `must be finite and non-zero, got ${options.initialStepS}`);
  }
  const tail = options.linearTail;
  const m = options.errorComponents ?? y0.length;
  if (tail !== undefined && !(Number.isInteger(tail.offset) && tail.offset >= m && tail.offset <= y0.length)) {
    // The error norm of a trial step is taken before its tail exists.
    throw new InvalidInputError('linearTail.offset', `must lie in [errorComponents, dimension] = [${m}, ${y0.length}], got ${tail.offset}`);
  }
}
