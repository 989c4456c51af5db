/**
 * Chooses Encke's dynamics for a run, or falls back to Cowell when the initial reference conic is
 * degenerate: near-parabolic (|1 − e| < ENCKE_DEFAULTS.parabolicGuard = 1e-6) or with zero angular
 * momentum (|r × v| < 1e-10 |r||v|). The fallback is reported in the result's `warnings`, never silent.
 * (Our choice: a clear, working result with a warning rather than an error; a later rectification onto a
 * near-parabolic conic is harmless because the universal-variable solver is exact there.)
 */
import type { ForceModel } from '../forces/index.ts';
import type { PropagationDynamics } from '../run/propagation-dynamics.ts';
import { degenerateReason, EnckeDynamics, type AddedAcceleration } from './encke-dynamics.ts';

/** What Encke needs from the checked request: start epoch (TDB s from J2000), step-control tolerances
 * (relative, dimensionless; absolute, km or km/s) and whether the STM rides along. */
export interface EnckeRunSettings {
  startTdbS: number;
  relativeTolerance: number;
  absoluteTolerance: number;
  withStm: boolean;
}

/** Encke dynamics from a Cartesian state (km, km/s, J2000 equatorial, from the model's centre), with an
 * optional `added` acceleration (a thrust arc; without the STM only). */
export function createEnckeOrFallback(settings: EnckeRunSettings, forces: ForceModel, cart: ArrayLike<number>,
  cowell: (forces: ForceModel, cart: ArrayLike<number>, withStm: boolean) => PropagationDynamics,
  added: AddedAcceleration | null = null): PropagationDynamics {
  const reason = degenerateReason(cart, forces.centralGmKm3S2);
  if (reason !== null) {
    const fallback = cowell(forces, cart, settings.withStm);
    return { ...fallback, method: 'cowell', warnings: [`method 'encke' fell back to 'cowell': ${reason} about ${forces.centralBody}`] };
  }
  return new EnckeDynamics(forces, settings.startTdbS, cart, settings.withStm, settings, added);
}
