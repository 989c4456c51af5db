/**
 * Variational equations for Cowell's method: the 6x6 state transition matrix Φ = ∂x(t)/∂x(t0) rides
 * along the state as y[6..41] (row-major). With ∂a/∂v = 0 for every force in forces/, Φ' = A Φ with
 * A = [[0, I], [G, 0]] and G = ∂a/∂r (Montenbruck & Gill, Satellite Orbits, §7.1). Impulsive burns at
 * fixed epochs keep Φ continuous; the run keeps one Φ per burn-to-burn segment so the sensitivity of the
 * final state to each burn's Δv is the product of the later segments (no matrix inversion).
 */
import { identity6, multiply6, velocityColumns } from './math/matrix6.ts';

/** Index of Φ's first element in the integration vector. */
export const STM_OFFSET = 6;
/** Length of the integration vector with the STM. */
export const STATE_WITH_STM_LENGTH = 42;

/** Writes Φ' = A Φ into dydt[6..41] from Φ in y[6..41] and the 3x3 row-major gradient G (1/s^2) held in
 * gradient[at..at+8]. */
export function variationalRatesInto(y: Float64Array, gradient: Float64Array, dydt: Float64Array, at = 0): void {
  const o = STM_OFFSET;
  // Rows 0..2 of Φ' are rows 3..5 of Φ.
  for (let j = 0; j < 18; j++) dydt[o + j] = y[o + 18 + j];
  // Rows 3..5 of Φ' are G times rows 0..2 of Φ.
  for (let i = 0; i < 3; i++) {
    const g0 = gradient[at + 3 * i];
    const g1 = gradient[at + 3 * i + 1];
    const g2 = gradient[at + 3 * i + 2];
    for (let j = 0; j < 6; j++) {
      dydt[o + 18 + 6 * i + j] = g0 * y[o + j] + g1 * y[o + 6 + j] + g2 * y[o + 12 + j];
    }
  }
}

/** Sets Φ = I in y[6..41]. */
export function resetStm(y: Float64Array): void {
  for (let k = 0; k < 36; k++) y[STM_OFFSET + k] = 0;
  for (let i = 0; i < 6; i++) y[STM_OFFSET + 7 * i] = 1;
}

/** Φ segments between impulsive burns, combined at the end of a run. */
export class StmSegments {
  private readonly segments: Float64Array[] = [];
  /** Burn count before each stored segment end; burn k sits between segments k and k+1. */
  private readonly burnSigns: number[] = [];

  /** Closes the current segment at a burn (Φ taken from y[6..41]); `sign` is +1 forward, -1 backward. */
  closeAtBurn(y: Float64Array, sign: number): void {
    this.segments.push(Float64Array.from(y.subarray(STM_OFFSET, STM_OFFSET + 36)));
    this.burnSigns.push(sign);
  }

  /**
   * Total Φ(t_end, t0) given the last open segment in `y`, and d(final state)/d(Δv_k) (6x3 row-major)
   * for each burn closed so far, followed by zero matrices for `burnsNotReached` burns.
   */
  finish(y: Float64Array, burnsNotReached: number): { stm: number[]; burnSensitivities: number[][] } {
    let later = Float64Array.from(y.subarray(STM_OFFSET, STM_OFFSET + 36));
    const sensitivities: number[][] = [];
    const scratch = new Float64Array(36);
    for (let k = this.segments.length - 1; k >= 0; k--) {
      // `later` is Φ(t_end, t_k): the sensitivity to burn k is its velocity columns (signed).
      sensitivities.unshift(velocityColumns(later, this.burnSigns[k]));
      multiply6(later, this.segments[k], scratch);
      later = Float64Array.from(scratch);
    }
    for (let k = 0; k < burnsNotReached; k++) sensitivities.push(new Array<number>(18).fill(0));
    // Array.from on a typed array goes through its iterator (~2 µs for 36 numbers).
    const stm = new Array<number>(36);
    for (let k = 0; k < 36; k++) stm[k] = later[k];
    return { stm, burnSensitivities: sensitivities };
  }
}

export { identity6 };
