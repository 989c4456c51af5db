// Entry of an archive verification thread when running from the TypeScript sources (tests, development):
// registers the tsx loader in this thread (as queue/planner-thread-entry.mjs does), then loads the TypeScript
// side. The compiled build starts verify-thread.js directly.
import { register } from 'tsx/esm/api';

register();
await import('./verify-thread.ts');
