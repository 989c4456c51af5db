/** Builds the console with Vite (the same command as `npm run console:build`) before the browser tests. */
import { spawnSync } from 'node:child_process';
import { resolve } from 'node:path';

const ROOT = resolve(import.meta.dirname, '../..');

/** Builds into console/dist, or into `outDir` (absolute) so a check can read its own build. */
export function buildConsole(outDir?: string): void {
  const vite = resolve(ROOT, 'node_modules/vite/bin/vite.js');
  const args = [vite, 'build', '--config', 'console/vite.config.ts', ...(outDir ? ['--outDir', outDir, '--emptyOutDir'] : [])];
  const run = spawnSync(process.execPath, args, { cwd: ROOT, encoding: 'utf8' });
  if (run.status !== 0) throw new Error(`console build failed (exit ${run.status}):\n${run.stdout}\n${run.stderr}`);
}
