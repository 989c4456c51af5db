// Types of scripts/setup.mjs (plain JavaScript so it runs before anything is built), for the tests and harness.
export function onPath(name: string, pathVar?: string): boolean;
export function postgresBinDir(env?: NodeJS.ProcessEnv, root?: string): string | null;
export function chromiumPath(env?: NodeJS.ProcessEnv): string;
export function missingPackages(env?: NodeJS.ProcessEnv, pgRoot?: string): string[];
