/**
 * The PostgreSQL test harness itself (test/harness/postgres.ts), where it starts its own server as root: it must
 * work from a folder the `postgres` user cannot enter, and create a missing system user. Real processes and real
 * OS users; skipped when a DATABASE_URL is given or when not running as root (nothing of this path runs then).
 */
import { execFile } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { promisify } from 'node:util';
import { describe, expect, it } from 'vitest';
import { ensureSystemUser } from '../harness/postgres.ts';

const run = promisify(execFile);
const asRoot = process.getuid?.() === 0 && !process.env.DATABASE_URL;
const HARNESS = fileURLToPath(new URL('../harness/postgres.ts', import.meta.url));

describe.skipIf(!asRoot)('PostgreSQL test harness as root', () => {
  describe('when started from a folder the postgres user cannot enter', () => {
    it('should still start a server and answer a query', async () => {
      const closed = mkdtempSync(join(tmpdir(), 'veer-closed-')); // mode 0700, owned by root
      try {
        const script = `const m = await import(${JSON.stringify(HARNESS)}); const s = await m.startPostgres();
          const pg = (await import('pg')).default; const c = new pg.Client({ connectionString: await s.freshDatabase() });
          await c.connect(); const r = await c.query('SELECT 1 + 1 AS two'); await c.end(); await s.stop(); console.log(JSON.stringify(r.rows[0]));`;
        const env: NodeJS.ProcessEnv = { ...process.env };
        delete env.DATABASE_URL;
        const { stdout } = await run(process.execPath, ['--import', import.meta.resolve('tsx'), '--input-type=module', '-e',
          script.replace("import('pg')", `import(${JSON.stringify(import.meta.resolve('pg'))})`)], { cwd: closed, env, timeout: 90_000 });
        expect(JSON.parse(stdout.trim())).toEqual({ two: 2 });
      } finally {
        rmSync(closed, { recursive: true, force: true });
      }
    }, 100_000);
  });

  describe('when the system user is missing', () => {
    it('should create it with useradd --system', async () => {
      const name = `veer-t${process.pid % 100000}`;
      await run('userdel', [name]).catch(() => undefined);
      try {
        const made = await ensureSystemUser(name);
        expect(Number((await run('id', ['-u', name])).stdout.trim())).toBe(made.uid);
        expect(made.uid).toBeLessThan(1000); // a system account (Debian's SYS_UID_MAX is 999, common practice)
        expect(await ensureSystemUser(name)).toEqual(made); // second call: found, not created again
      } finally {
        await run('userdel', [name]).catch(() => undefined);
      }
    });
  });
});
