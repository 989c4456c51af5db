/** B-plane geometry and partials of hyperbolic approaches. */
export { bPlanePartials, computeBPlane, B_PLANE_PARTIAL_ROWS, type BPlane, type BPlanePartials } from './b-plane.ts';
export {
  ECLIPTIC_POLE_J2000, POLE_RA_DEC_DEG, referencePole, type BPlaneReference,
} from './reference-plane.ts';
export { bPlaneOfEncounter } from './encounter.ts';
