/**
 * Linear (first-order) mapping of execution and initial-state covariances to target quantities:
 * C_target = Σ_k J_k·P_k·J_kᵀ + J_x·P_x·J_xᵀ, with J_k = ∂targets/∂Δv_k (from the STM chained through the
 * target geometry) and J_x = ∂targets/∂(initial state). The contributions are independent, so they add.
 */
import { InvalidInputError } from '../../propagator/index.ts';
import { add, multiply, requireCovariance, symmetrise, transpose, zeros, type Matrix } from '../../propagator/index.ts';

/**
 * J·P·Jᵀ, symmetrised. Units: (target units)² when J is in target units per control unit and P in
 * control units².
 * @param jacobian m×n; @param covariance n×n symmetric positive semi-definite.
 */
export function mapCovariance(jacobian: Matrix, covariance: Matrix, field = 'covariance'): Matrix {
  const n = covariance.length;
  requireCovariance(field, covariance, n);
  if (jacobian.length === 0 || jacobian.some((row) => row.length !== n || !row.every(Number.isFinite))) {
    throw new InvalidInputError(`${field}.jacobian`, `must be finite rows of length ${n}`);
  }
  return symmetrise(multiply(multiply(jacobian, covariance), transpose(jacobian)));
}

export interface BurnCovarianceInput {
  /** ∂targets/∂Δv of this burn, m×3, target units per km/s (Δv in the covariance's frame). */
  sensitivity: Matrix;
  /** Execution covariance of this burn, 3×3 km²/s² (e.g. gatesCovarianceKm2S2). */
  covarianceKm2S2: Matrix;
}

export interface InitialStateCovarianceInput {
  /** ∂targets/∂(r, v) at the initial epoch, m×6, target units per km and per km/s. */
  sensitivity: Matrix;
  /** 6×6 covariance of (r, v): km², km²/s, km²/s². */
  covariance: Matrix;
}

/** Target covariances (m×m, target units²), each contribution separately and combined. */
export interface LinearTargetCovariance {
  /** One per burn, in input order. */
  perBurn: Matrix[];
  /** Sum over burns (execution errors are independent between burns). */
  execution: Matrix;
  /** From the initial-state covariance, or null when none was given. */
  initialState: Matrix | null;
  /** execution + initialState. */
  total: Matrix;
}

/**
 * Maps every burn's execution covariance and the optional initial-state covariance to the targets.
 * @throws InvalidInputError when shapes disagree or a covariance is not symmetric / has negative variance.
 */
export function linearTargetCovariance(
  burns: readonly BurnCovarianceInput[], initialState?: InitialStateCovarianceInput | null,
): LinearTargetCovariance {
  const m = burns[0]?.sensitivity.length ?? initialState?.sensitivity.length ?? 0;
  if (m === 0) throw new InvalidInputError('burns', 'need at least one burn or an initial-state covariance with a sensitivity');
  const perBurn = burns.map((b, k) => {
    if (b.sensitivity.length !== m) throw new InvalidInputError(`burns[${k}].sensitivity`, `must have ${m} rows`);
    return mapCovariance(b.sensitivity, b.covarianceKm2S2, `burns[${k}].covarianceKm2S2`);
  });
  const execution = perBurn.reduce((acc, c) => add(acc, c), zeros(m, m));
  let initial: Matrix | null = null;
  if (initialState) {
    if (initialState.sensitivity.length !== m) throw new InvalidInputError('initialState.sensitivity', `must have ${m} rows`);
    initial = mapCovariance(initialState.sensitivity, initialState.covariance, 'initialState.covariance');
  }
  return { perBurn, execution, initialState: initial, total: initial ? add(execution, initial) : execution };
}

/** 1σ of each target quantity: square roots of the diagonal (target units). */
export function standardDeviations(covariance: Matrix): number[] {
  return covariance.map((row, i) => Math.sqrt(Math.max(0, row[i])));
}
