/** Public face of console/ for Node: the express router that serves the built console. */
export { CONSOLE_DIST_DIR, consoleRouter, type ConsoleRouterOptions } from './server/console-router.ts';
