/** Two-body analytic tools: universal-variable Kepler solver, conic elements, analytic STM. */
export { stumpff, type StumpffValues } from './stumpff.ts';
export { keplerPropagate, keplerSolve, type KeplerSolution } from './universal-kepler.ts';
export { conicToState, stateToConic, CIRCULAR_LIMIT, EQUATORIAL_LIMIT, type ConicElements } from './conic-elements.ts';
export { keplerStm, type KeplerStmResult } from './two-body-stm.ts';
export { Jet, type Jet3 } from './jet.ts';
