/** Central-body switching at spheres of influence. */
export { laplaceSoiRadiusKm, soiRadiusKm, MEAN_SEMI_MAJOR_AXIS_KM, PRIMARY_OF } from './sphere-of-influence.ts';
export { needsSegmentedRun, segmentedSteps, type SegmentSteps } from './segmented-run.ts';
export { MovingCentreDynamics, MOVING_CENTRE_DEFAULTS } from './moving-centre-dynamics.ts';
