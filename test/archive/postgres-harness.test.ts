/**
 * The PostgreSQL test harness itself (test/harness/postgres.ts) on the path where it starts its own server
 * (initdb + pg_ctl): as an ordinary user it runs them directly; as root the cluster belongs to the `postgres`
 * system user (created when missing) and it must work from a folder that user cannot enter. Real processes and
 * real OS users. Every case runs under any user: run as root, the ordinary-user case runs as `nobody`; run as an
 * ordinary user, the root-only steps are checked to refuse with a clear error. DATABASE_URL is removed from the
 * harness's environment here (it would take the server it names instead). The child run as another user gets the
 * harness and pg bundled (esbuild) into its own world-readable folder: the checkout may sit where that user cannot
 * read (a clone under /root, mode 0700, is the common case on a fresh machine run as root).
 */
import { execFile } from 'node:child_process';
import { chmodSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { promisify } from 'node:util';
import { build } from 'esbuild';
import { describe, expect, it } from 'vitest';
import { ensureSystemUser } from '../harness/postgres.ts';

const run = promisify(execFile);
const asRoot = process.getuid?.() === 0;
const HARNESS = fileURLToPath(new URL('../harness/postgres.ts', import.meta.url));

/** The child's script: start the harness, ask the server one query, stop it, print what the harness reported. */
function childScript(harness: string, pgModule: string): string {
  return `const m = await import(${JSON.stringify(harness)}); const s = await m.startPostgres();
    const pg = (await import(${JSON.stringify(pgModule)})).default;
    const c = new pg.Client({ connectionString: await s.freshDatabase() });
    await c.connect(); const r = await c.query('SELECT 1 + 1 AS two'); await c.end(); await s.stop();
    console.log(JSON.stringify({ kind: s.kind, two: r.rows[0].two, uid: process.getuid() }));`;
}

/** The child's script with the harness and pg inlined, written to `dir` as one ES module: runs with plain node from
 * anywhere, so another user needs to read only `dir`. */
async function bundledChild(dir: string): Promise<string> {
  const entry = join(dir, 'child-entry.mjs');
  writeFileSync(entry, childScript(HARNESS, 'pg'));
  const out = join(dir, 'child.mjs');
  await build({
    entryPoints: [entry], outfile: out, bundle: true, platform: 'node', format: 'esm', target: 'node20', logLevel: 'silent',
    nodePaths: [fileURLToPath(new URL('../../node_modules', import.meta.url))],
    external: ['pg-native', 'testcontainers'], // optional in pg; testcontainers only when a Docker engine answers
    banner: { js: "import { createRequire as veerCreateRequire } from 'node:module'; const require = veerCreateRequire(import.meta.url);" },
  });
  chmodSync(out, 0o644);
  return out;
}

/** Starts the harness in a fresh node process in `cwd` (as another user through runuser, from a bundle in `cwd`),
 * asks the server one query, stops it; resolves to what the harness reported. */
async function harnessInChild(cwd: string, user?: string): Promise<{ kind: string; two: number; uid: number }> {
  const env: NodeJS.ProcessEnv = { ...process.env, TMPDIR: tmpdir() };
  delete env.DATABASE_URL;
  const node = user
    ? [process.execPath, await bundledChild(cwd)]
    : [process.execPath, '--import', import.meta.resolve('tsx'), '--input-type=module', '-e', childScript(HARNESS, import.meta.resolve('pg'))];
  const [cmd, ...args] = user ? ['runuser', '-u', user, '--', ...node] : node;
  const { stdout } = await run(cmd, args, { cwd, env, timeout: 90_000 });
  return JSON.parse(stdout.trim().split('\n').at(-1)!);
}

describe('PostgreSQL test harness', () => {
  describe('when it starts its own server as an ordinary user', () => {
    it('should run initdb and pg_ctl as that user and answer a query', async () => {
      const dir = mkdtempSync(join(tmpdir(), 'veer-pg-user-'));
      chmodSync(dir, 0o777); // `nobody` (when run as root) works in it too
      try {
        const user = asRoot ? 'nobody' : undefined;
        const expectedUid = asRoot ? Number((await run('id', ['-u', 'nobody'])).stdout.trim()) : process.getuid!();
        expect(await harnessInChild(dir, user)).toEqual({ kind: 'process', two: 2, uid: expectedUid });
      } finally {
        rmSync(dir, { recursive: true, force: true });
      }
    }, 100_000);
  });

  describe('when it is started from a folder closed to all but the caller', () => {
    it('should still start its server (as root: owned by the postgres user, who cannot enter it) and answer a query', async () => {
      const closed = mkdtempSync(join(tmpdir(), 'veer-closed-')); // mode 0700, owned by whoever runs the tests
      try {
        expect(await harnessInChild(closed)).toEqual({ kind: 'process', two: 2, uid: process.getuid!() });
      } finally {
        rmSync(closed, { recursive: true, force: true });
      }
    }, 100_000);
  });

  describe('when the system user is missing', () => {
    it(asRoot ? 'should create it with useradd --system' : 'should refuse without root, naming the user and useradd', async () => {
      const name = `veer-t${process.pid % 100000}`;
      await run('userdel', [name]).catch(() => undefined);
      try {
        if (!asRoot) {
          await expect(ensureSystemUser(name)).rejects.toThrow(new RegExp(`\`${name}\` system user .*useradd failed`));
          await expect(run('id', ['-u', name])).rejects.toThrow(); // nothing half-made
          return;
        }
        const made = await ensureSystemUser(name);
        expect(Number((await run('id', ['-u', name])).stdout.trim())).toBe(made.uid);
        expect(made.uid).toBeLessThan(1000); // a system account (Debian's SYS_UID_MAX is 999, common practice)
        expect(await ensureSystemUser(name)).toEqual(made); // second call: found, not created again
      } finally {
        if (asRoot) await run('userdel', [name]).catch(() => undefined);
      }
    });
  });
});
