/** Ephemeris sources behind one interface: built-in (astronomy-engine), Chebyshev cache, tabulated, layered. */
export type { BodyPositionsPlan, Ephemeris, TdbSpan } from './ephemeris.ts';
export { planBodyPositions } from './body-positions-plan.ts';
export { createBuiltinEphemeris, BUILTIN_EPHEMERIS_SPAN } from './astronomy-engine-ephemeris.ts';
export { buildChebyshevEphemeris, CHEBYSHEV_DEFAULTS } from './chebyshev-ephemeris.ts';
export type { ChebyshevEphemerisOptions, ChebyshevEphemerisCache, ChebyshevFitReport } from './chebyshev-ephemeris.ts';
export { createTabulatedEphemeris } from './tabulated-ephemeris.ts';
export type {
  TabulatedEphemeris, TabulatedEphemerisOptions, TabulatedStateRecord, TabulatedInterpolation,
} from './tabulated-ephemeris.ts';
export { layerEphemerides } from './layered-ephemeris.ts';
export { assertInSpan, assertBody, assertValidSpan } from './ephemeris-checks.ts';
export { EphemerisCache, EPHEMERIS_CACHE_DEFAULTS } from './ephemeris-cache.ts';
export type { EphemerisCacheOptions, EphemerisCacheStats } from './ephemeris-cache.ts';
export { ephemerisWithFiles, refuseUncoveredSpan, type EphemerisFileTable } from './ephemeris-files.ts';
