/**
 * The compiled build for tests that run what production runs (plain node on dist/, the built console):
 * `npm run build`'s three steps, the TypeScript one incremental (a few seconds when dist/ is current).
 * Call from one test file at a time: two builds writing dist/ at once would race.
 */
import { spawnSync } from 'node:child_process';
import { readdirSync, readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { buildConsole } from '../e2e/build-console.ts';

export const ROOT = resolve(import.meta.dirname, '../..');

/** `npm run build`: compiles the TypeScript to dist/ (tsconfig.build.json), bundles the CLI (dist/cli-bundle/) and
 * builds the console; throws with the failing step's output. */
export function buildAll(): void {
  const tsc = resolve(ROOT, 'node_modules/typescript/bin/tsc');
  const run = spawnSync(process.execPath, [tsc, '-p', 'tsconfig.build.json'], { cwd: ROOT, encoding: 'utf8' });
  if (run.status !== 0) throw new Error(`tsc -p tsconfig.build.json failed (exit ${run.status}):\n${run.stdout}\n${run.stderr}`);
  const bundle = spawnSync(process.execPath, [resolve(ROOT, 'scripts/bundle-cli.mjs')], { cwd: ROOT, encoding: 'utf8' });
  if (bundle.status !== 0) throw new Error(`scripts/bundle-cli.mjs failed (exit ${bundle.status}):\n${bundle.stderr}`);
  buildConsole();
}

/** Process ids of every live descendant of `pid` (Linux /proc), children before grandchildren. */
export function descendants(pid: number): number[] {
  const parentOf = new Map<number, number>();
  for (const name of readdirSync('/proc')) {
    if (!/^\d+$/.test(name)) continue;
    try {
      // /proc/PID/stat: "pid (comm) state ppid ..."; comm may hold spaces, so read after the last ')'.
      const stat = readFileSync(`/proc/${name}/stat`, 'utf8');
      parentOf.set(Number(name), Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]));
    } catch { /* exited meanwhile */ }
  }
  const out: number[] = [];
  for (let frontier = [pid]; frontier.length;) {
    frontier = [...parentOf].filter(([, ppid]) => frontier.includes(ppid)).map(([p]) => p);
    out.push(...frontier);
  }
  return out;
}

/** True while a process with this id exists and is not a zombie. */
export function alive(pid: number): boolean {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    return stat.slice(stat.lastIndexOf(')') + 2)[0] !== 'Z';
  } catch {
    return false;
  }
}
