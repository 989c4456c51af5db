/** Integrators: adaptive DOP853 with dense output, a driver over it, and fixed-step RK4 for tests. */
export * from './integrator-types.ts';
export { Dop853Stepper } from './dop853.ts';
export { integrateDop853, driveTo, type DriveOptions, type DriveResult } from './drive.ts';
export { integrateRk4, type Rk4Result } from './rk4.ts';
