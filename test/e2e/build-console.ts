/**
 * Builds the console with Vite (the same command as `npm run console:build`) before the browser tests. Test files
 * run in parallel and several build console/dist: each builds into a folder of its own and then swaps it in with
 * two renames, so a test reading console/dist never meets a half-written or emptied folder.
 */
import { spawnSync } from 'node:child_process';
import { renameSync, rmSync } from 'node:fs';
import { resolve } from 'node:path';

const ROOT = resolve(import.meta.dirname, '../..');

function viteBuild(outDir: string): void {
  const vite = resolve(ROOT, 'node_modules/vite/bin/vite.js');
  const run = spawnSync(process.execPath, [vite, 'build', '--config', 'console/vite.config.ts', '--outDir', outDir, '--emptyOutDir'],
    { cwd: ROOT, encoding: 'utf8' });
  if (run.status !== 0) {
    rmSync(outDir, { recursive: true, force: true });
    throw new Error(`console build failed (exit ${run.status}):\n${run.stdout}\n${run.stderr}`);
  }
}

/** Builds into console/dist, or into `outDir` (absolute) so a check can read its own build. */
export function buildConsole(outDir?: string): void {
  if (outDir) { viteBuild(outDir); return; }
  const dist = resolve(ROOT, 'console/dist');
  const fresh = `${dist}.build-${process.pid}`;
  const old = `${dist}.old-${process.pid}`;
  viteBuild(fresh);
  try { renameSync(dist, old); } catch { /* no earlier build */ }
  try {
    renameSync(fresh, dist);
  } catch {
    rmSync(fresh, { recursive: true, force: true }); // another file's build landed first: same sources, same console
  }
  rmSync(old, { recursive: true, force: true });
}
