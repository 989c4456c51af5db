/**
 * The CLI process's ephemeris cache (propagator EphemerisCache): the process-level owner the propagate
 * and plan commands pass in, so several propagations or plans in one process fit each block once.
 */
import { EphemerisCache } from '../propagator/index.ts';

export const cliEphemerisCache = new EphemerisCache();
