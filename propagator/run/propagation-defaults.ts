/** Defaults of a PropagationRequest, shared by code and docs. */
export const PROPAGATION_DEFAULTS = Object.freeze({
  method: 'cowell' as const,
  /** Relative error tolerance of the DOP853 step control, in [1e-14, 1e-3]. */
  relativeTolerance: 1e-12,
  /** Absolute error tolerance (km for positions, km/s for velocities), in (0, 1]. */
  absoluteTolerance: 1e-9,
  /** Step attempts before the run stops with outcome 'max-steps'. */
  maxSteps: 1_000_000,
  /** Largest number of output samples a request may ask for through outputStepS. */
  maxSamples: 1_000_000,
});
