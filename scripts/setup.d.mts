// Types of scripts/setup.mjs (plain JavaScript so it runs before anything is built), for the tests and harness.
export function onPath(name: string, pathVar?: string): boolean;
export function postgresBinDir(env?: NodeJS.ProcessEnv, root?: string): string | null;
export function chromiumPath(env?: NodeJS.ProcessEnv): string;
export function missingPackages(env?: NodeJS.ProcessEnv, pgRoot?: string): string[];
/** One package of an `apt-get -s install` plan: the version installed now (null when new) and the one it brings. */
export interface AptPlanEntry { name: string; from: string | null; to: string }
export function parseAptSimulation(text: string): AptPlanEntry[];
export function describePlan(plan: readonly AptPlanEntry[]): string[];
