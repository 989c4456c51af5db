/**
 * `npm run serve`: one command runs the API, a worker and a private redis-server (from PATH, on a free port)
 * when REDIS_URL is unset — and says how to install redis-server when it is missing.
 */
import { spawn } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { freePort } from '../harness/redis.ts';

const ROOT = resolve(import.meta.dirname, '../..');

function runServe(env: Record<string, string>) {
  const child = spawn(process.execPath, ['--import', 'tsx', join(ROOT, 'api/serve-main.ts')], {
    cwd: ROOT, env: { ...process.env, REDIS_URL: '', LOG_LEVEL: 'silent', ...env }, stdio: ['ignore', 'ignore', 'pipe'],
  });
  let stderr = '';
  child.stderr?.on('data', (d: Buffer) => { stderr += d.toString(); });
  const exited = new Promise<number | null>((r) => child.once('exit', (code) => r(code)));
  return { child, exited, stderr: () => stderr };
}

describe('npm run serve', () => {
  describe('when REDIS_URL is unset and redis-server is on PATH', () => {
    it('should start Redis, a worker and the API, and report ready', async () => {
      const dir = mkdtempSync(join(tmpdir(), 'veer-serve-'));
      const port = await freePort();
      const run = runServe({ DATA_DIR: dir, PORT: String(port), HOST: '127.0.0.1' });
      try {
        let ready: { status: number; body: any } | null = null;
        for (let i = 0; i < 600 && !ready; i++) {
          try {
            const res = await fetch(`http://127.0.0.1:${port}/ready`);
            if (res.status === 200) ready = { status: res.status, body: await res.json() };
          } catch { /* not listening yet */ }
          if (!ready) await new Promise((r) => setTimeout(r, 100));
        }
        expect(ready?.body).toEqual(expect.objectContaining({ ready: true, workers: { ok: true, count: 1 } }));
        expect(run.stderr()).toMatch(/Redis redis:\/\/127\.0\.0\.1:\d+/);
      } finally {
        run.child.kill('SIGTERM');
        await run.exited;
        rmSync(dir, { recursive: true, force: true });
      }
    }, 120_000);
  });

  describe('when redis-server is not on PATH', () => {
    it('should exit non-zero and say how to install it', async () => {
      const dir = mkdtempSync(join(tmpdir(), 'veer-serve-'));
      const run = runServe({ DATA_DIR: dir, PATH: '/nonexistent-veer-bin' });
      const code = await run.exited;
      rmSync(dir, { recursive: true, force: true });
      expect(code).toBe(1);
      expect(run.stderr()).toMatch(/redis-server was not found on PATH.*apt-get install redis-server/);
    }, 120_000);
  });
});
