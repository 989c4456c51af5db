// Entry of a planner worker thread: registers the tsx loader (TypeScript sources run as-is) in this thread,
// then loads the TypeScript side. Plain .mjs because a fresh thread cannot read .ts before the loader exists.
import { register } from 'tsx/esm/api';

register();
await import('./planner-thread.ts');
