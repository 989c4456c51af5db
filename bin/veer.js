#!/usr/bin/env node
// Entry point of the `veer` command: runs the compiled CLI (dist/, built by `npm run build`, which `npm ci` runs
// as `prepare`). Plain node, no TypeScript loader at run time.
import { existsSync } from 'node:fs';

const main = new URL('../dist/cli/main.js', import.meta.url);
if (!existsSync(main)) {
  process.stderr.write('veer: the compiled CLI is missing (dist/cli/main.js); run `npm run build` (npm ci does it)\n');
  process.exit(1);
}
const { main: run } = await import(main.href);
process.exitCode = await run(process.argv.slice(2));
