/** Events located on the dense output with Brent's bracketing root finder. */
export { brentRoot, type RootResult } from './brent-root.ts';
export { buildEvents, crossed, type ActiveEvent, type EventSetup } from './event-functions.ts';
export { EventWatcher, EVENT_TIME_TOLERANCE_S, type CartesianSource, type DenseStepper, type EventStop } from './event-watcher.ts';
