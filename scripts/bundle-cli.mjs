#!/usr/bin/env node
// The `veer` command as a few bundled files (dist/cli-bundle/), built by `npm run build` after tsc. Why: the
// compiled dist/ tree is ~200 small ES modules plus zod's ~200, and on Node 20 resolving and compiling each one
// costs more than the whole `veer --help`; one bundle per command (esbuild, code splitting, so `veer --help`
// still loads no numerics) starts `veer plan` in a fraction of that time.
//   - entry points: cli/run.ts (the process) and the worker-thread modules the CLI's code may start (archive
//     verification, CCSDS export, `veer plan`'s Monte Carlo samples; test/tooling/compiled-build checks none is missing); a thread module is found
//     beside the module that starts it
//     (new URL('./verify-thread.js', import.meta.url)), so every output lands flat in one folder, named as in dist/.
//   - bundled: the project's code, zod and astronomy-engine (pure ESM, no files read at run time); every other
//     dependency stays in node_modules (native addons, libraries that load files or threads by path).
//   - zod is imported as a namespace (`import * as z from 'zod'`): its `{ z }` export is a namespace object the
//     bundler must keep whole, with every message locale (~370 kB that `veer plan` compiled at each start). The
//     build refuses a bundle that carries a locale other than English, naming the importer to fix.
// Plain JavaScript like setup.mjs; esbuild is a dev dependency (the same binary tsx and vite use).
import { build } from 'esbuild';
import { readFileSync, rmSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

export const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..');
export const OUT_DIR = join(ROOT, 'dist', 'cli-bundle');
const BUNDLED_DEPENDENCIES = ['zod', 'astronomy-engine'];
const ENTRY_POINTS = ['cli/run.ts', 'archive/verify-thread.ts', 'ccsds/export/export-thread.ts', 'cli/sample-thread.ts'];

/** Writes dist/cli-bundle/ afresh; resolves to the output files' names (relative to ROOT). */
export async function bundleCli() {
  const pkg = JSON.parse(readFileSync(join(ROOT, 'package.json'), 'utf8'));
  const external = Object.keys(pkg.dependencies ?? {}).filter((d) => !BUNDLED_DEPENDENCIES.includes(d));
  rmSync(OUT_DIR, { recursive: true, force: true });
  const result = await build({
    absWorkingDir: ROOT,
    entryPoints: ENTRY_POINTS,
    outdir: OUT_DIR,
    entryNames: '[name]',
    chunkNames: 'chunk-[hash]',
    bundle: true,
    splitting: true,
    format: 'esm',
    platform: 'node',
    target: 'node20',
    external,
    sourcemap: true,
    metafile: true,
    logLevel: 'warning',
  });
  refuseZodLocales(result.metafile);
  return Object.keys(result.metafile.outputs).filter((f) => f.endsWith('.js'));
}

/** Throws when a zod locale other than the default (en) is in the bundle: some file imports zod's `{ z }` export. */
function refuseZodLocales(metafile) {
  const bundled = new Set(Object.values(metafile.outputs).flatMap((o) => Object.entries(o.inputs).filter(([, i]) => i.bytesInOutput > 0).map(([f]) => f)));
  const locales = [...bundled].filter((f) => /zod\/v4\/locales\/(?!en\.js$)[^/]+\.js$/.test(f));
  if (locales.length === 0) return;
  const importers = [...bundled].filter((f) => !f.includes('node_modules') && /^import \{ z \} from 'zod'/m.test(readFileSync(join(ROOT, f), 'utf8')));
  throw new Error(`bundle-cli: ${locales.length} zod locales were bundled (${locales[0]} ...): import zod as \`import * as z from 'zod'\`, `
    + `not \`import { z } from 'zod'\` (${importers.join(', ') || 'no importer found'})`);
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const files = await bundleCli();
  process.stderr.write(`bundle-cli: ${files.length} files in ${OUT_DIR.slice(ROOT.length + 1)}/\n`);
}
