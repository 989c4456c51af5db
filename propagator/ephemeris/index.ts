/** Ephemeris sources behind one interface: built-in (astronomy-engine), Chebyshev cache, tabulated, layered. */
export type { Ephemeris, TdbSpan } from './ephemeris.ts';
export { createBuiltinEphemeris, BUILTIN_EPHEMERIS_SPAN } from './astronomy-engine-ephemeris.ts';
export { assertInSpan, assertBody, assertValidSpan } from './ephemeris-checks.ts';
