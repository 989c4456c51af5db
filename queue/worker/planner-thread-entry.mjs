// Entry of a planner worker thread when running from the TypeScript sources (tests, development): registers the
// tsx loader in this thread, then loads the TypeScript side. Plain .mjs because a fresh thread cannot read .ts
// before the loader exists. The compiled build (dist/) starts planner-thread.js directly (see planner-pool.ts).
import { register } from 'tsx/esm/api';

register();
await import('./planner-thread.ts');
