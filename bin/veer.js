#!/usr/bin/env node
// Entry point of the `veer` command: runs the bundled compiled CLI (dist/cli-bundle/, built by `npm run build`,
// which `npm ci` runs as `prepare`: tsc, then scripts/bundle-cli.mjs). Plain node, no TypeScript loader at run
// time; from the sources: `npx tsx cli/run.ts`.
import { existsSync } from 'node:fs';

const run = new URL('../dist/cli-bundle/run.js', import.meta.url);
if (!existsSync(run)) {
  process.stderr.write('veer: the compiled CLI is missing (dist/cli-bundle/run.js); run `npm run build` (npm ci does it)\n');
  process.exit(1);
}
await import(run.href);
