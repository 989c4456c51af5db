/**
 * Classical fixed-step 4th-order Runge–Kutta (Hairer, Nørsett & Wanner, Solving ODE I, §II.1, Table 1.2),
 * for tests and cross-checks; no error control.
 */
import { InvalidInputError } from '../../contract/errors.ts';
import type { IntegratorCounts, RhsFunction } from './integrator-types.ts';

export interface Rk4Result {
  /** State at tEnd (a fresh array). */
  y: Float64Array;
  counts: IntegratorCounts;
}

/** Integrates from (t0, y0) to tEnd in `stepCount` equal steps (either direction; t in s). */
export function integrateRk4(
  rhs: RhsFunction, t0: number, y0: ArrayLike<number>, tEnd: number, stepCount: number,
): Rk4Result {
  if (!Number.isInteger(stepCount) || stepCount < 1) {
    throw new InvalidInputError('stepCount', `must be an integer >= 1, got ${stepCount}`);
  }
  if (!Number.isFinite(t0) || !Number.isFinite(tEnd)) {
    throw new InvalidInputError('t0', `t0 and tEnd must be finite, got ${t0}, ${tEnd}`);
  }
  const n = y0.length;
  const y = Float64Array.from(y0);
  const k1 = new Float64Array(n);
  const k2 = new Float64Array(n);
  const k3 = new Float64Array(n);
  const k4 = new Float64Array(n);
  const yt = new Float64Array(n);
  const h = (tEnd - t0) / stepCount;
  for (let s = 0; s < stepCount; s++) {
    const t = t0 + s * h;
    rhs(t, y, k1);
    for (let i = 0; i < n; i++) yt[i] = y[i] + 0.5 * h * k1[i];
    rhs(t + 0.5 * h, yt, k2);
    for (let i = 0; i < n; i++) yt[i] = y[i] + 0.5 * h * k2[i];
    rhs(t + 0.5 * h, yt, k3);
    for (let i = 0; i < n; i++) yt[i] = y[i] + h * k3[i];
    rhs(t + h, yt, k4);
    for (let i = 0; i < n; i++) y[i] += (h / 6) * (k1[i] + 2 * k2[i] + 2 * k3[i] + k4[i]);
  }
  return { y, counts: { steps: stepCount, acceptedSteps: stepCount, rejectedSteps: 0, evaluations: 4 * stepCount } };
}
