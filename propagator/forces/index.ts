/** Forces with analytic partials: central point mass, third bodies in Battin's f(q) form, J2, SRP. */
export { ForceModel } from './force-model.ts';
export { addPointMass, addPointMassGradient } from './point-mass.ts';
export { addThirdBody, battinF } from './third-body.ts';
export { addJ2 } from './zonal-j2.ts';
export { addSolarPressure, solarPressureStrength, SOLAR_PRESSURE_1AU_N_M2 } from './solar-pressure.ts';
