// Entry of a CCSDS export thread: registers the tsx loader in this thread (TypeScript sources run as-is,
// as for the planner's threads in queue/planner-thread-entry.mjs), then loads the TypeScript side.
// Plain .mjs because a fresh thread cannot read .ts before the loader exists.
import { register } from 'tsx/esm/api';

register();
await import('./export-thread.ts');
