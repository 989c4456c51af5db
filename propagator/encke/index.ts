/** Encke's method: deviation from an osculating reference conic (Battin §8.4). */
export { degenerateReason, EnckeDynamics, ENCKE_DEFAULTS } from './encke-dynamics.ts';
export { createEnckeOrFallback, type EnckeRunSettings } from './create-encke.ts';
