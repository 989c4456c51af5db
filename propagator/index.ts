/** Public face of propagator/: other rooms import from here only. */
export * from './types.ts';
export * from '../contract/errors.ts';
export * from './constants.ts';
export * from './time/index.ts';
export * from './ephemeris/index.ts';
export * from './integrators/index.ts';
export * from './forces/index.ts';
export * from './math/index.ts';
export * from './frames/index.ts';
export * from './run/propagation-types.ts';
export { PROPAGATION_DEFAULTS } from './run/propagation-defaults.ts';
export { propagate, propagateAsync, propagationSteps, type StepWatcher, type WatchStop } from './run/propagate.ts';
export type { PropagationDynamics } from './run/propagation-dynamics.ts';
export { createCowellRhs, createCowellDynamics } from './cowell.ts';
export { bPlaneOfEncounter, bPlanePartials, computeBPlane, referencePole, B_PLANE_PARTIAL_ROWS, type BPlane, type BPlanePartials, type BPlaneReference } from './bplane/index.ts';
export {
  keplerPropagate, keplerSolve, keplerStm, stateToConic, conicToState, stumpff,
  type ConicElements, type KeplerSolution, type KeplerStmResult,
} from './kepler/index.ts';
export { laplaceSoiRadiusKm, soiRadiusKm, PRIMARY_OF, MEAN_SEMI_MAJOR_AXIS_KM } from './switching/index.ts';
export { brentRoot, EVENT_TIME_TOLERANCE_S, type RootResult } from './events/index.ts';
export { ENCKE_DEFAULTS } from './encke/index.ts';
export { ThrustDirection, arcMassKg, checkFiniteBurns, DIRECTION_UNIT_TOLERANCE } from './finite-burn/index.ts';
