/** Finite burns: thrust arcs with mass, their direction axes, checks and the chained run. */
export { finiteBurnSteps, type ArcSteps } from './finite-burn-run.ts';
export { createThrustArcDynamics, thrustAddedAcceleration, arcMassKg, type ThrustArc } from './thrust-arc-dynamics.ts';
export { ThrustDirection } from './thrust-direction.ts';
export { checkFiniteBurns, DIRECTION_UNIT_TOLERANCE } from './finite-burn-checks.ts';
