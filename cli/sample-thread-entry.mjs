// Entry of a `veer plan` Monte Carlo thread when running from the TypeScript sources (tests, development):
// registers the tsx loader in this thread (as queue/worker/planner-thread-entry.mjs does), then loads the
// TypeScript side. Plain .mjs because a fresh thread cannot read .ts before the loader exists. The compiled
// build starts sample-thread.js.
import { register } from 'tsx/esm/api';

register();
await import('./sample-thread.ts');
