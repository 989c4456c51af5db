#!/usr/bin/env node
// Entry point of the `veer` command: runs the compiled CLI (dist/, built by `npm run build`, which `npm ci` runs
// as `prepare`). Plain node, no TypeScript loader at run time; from the sources: `npx tsx cli/run.ts`.
import { existsSync } from 'node:fs';

const run = new URL('../dist/cli/run.js', import.meta.url);
if (!existsSync(run)) {
  process.stderr.write('veer: the compiled CLI is missing (dist/cli/run.js); run `npm run build` (npm ci does it)\n');
  process.exit(1);
}
await import(run.href);
