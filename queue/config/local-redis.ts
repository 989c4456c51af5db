/**
 * A private Redis for single-machine use (`npm run serve` without REDIS_URL): `redis-server` from PATH on a
 * free local port, data (append-only file) in a folder of DATA_DIR so queued jobs survive a restart.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdirSync } from 'node:fs';
import { createServer, Socket } from 'node:net';

export interface LocalRedis {
  url: string;
  /** Stops the server (SIGTERM: it writes its append-only file and exits) and resolves once it has exited. */
  stop(): Promise<void>;
  /** Last resort when there is no time to wait: SIGKILL, returns at once. */
  kill(): void;
}

/** What to tell a user whose machine has no redis-server. */
export const INSTALL_REDIS_HINT = 'redis-server was not found on PATH. Install it (Debian/Ubuntu: sudo apt-get install redis-server; '
  + 'macOS: brew install redis) or set REDIS_URL to a running Redis.';

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.on('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const a = srv.address();
      const port = typeof a === 'object' && a ? a.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

async function answers(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const s = new Socket();
    const done = (v: boolean): void => { s.destroy(); resolve(v); };
    s.setTimeout(300, () => done(false));
    s.once('error', () => done(false));
    s.connect(port, '127.0.0.1', () => s.write('PING\r\n'));
    s.once('data', (d) => done(d.toString().startsWith('+PONG')));
  });
}

/** Starts redis-server with the append-only file on, in `dir`; rejects with INSTALL_REDIS_HINT when absent. */
export async function startLocalRedis(dir: string): Promise<LocalRedis> {
  mkdirSync(dir, { recursive: true });
  const port = await freePort();
  const child: ChildProcess = spawn('redis-server', [
    '--port', String(port), '--bind', '127.0.0.1', '--dir', dir, '--appendonly', 'yes', '--save', '', '--loglevel', 'warning',
  ], { stdio: ['ignore', 'ignore', 'pipe'], detached: true });
  // detached: its own process group, so a Ctrl-C in the terminal reaches only us and we stop it last, after the
  // worker has drained (not while jobs still write to it).
  // Forwarded rather than inherited, so the server does not hold our stderr open after we exit.
  child.stderr?.on('data', (d: Buffer) => process.stderr.write(d));
  const failed = new Promise<never>((_, reject) => {
    child.once('error', (e: NodeJS.ErrnoException) => reject(new Error(e.code === 'ENOENT' ? INSTALL_REDIS_HINT : `redis-server: ${e.message}`)));
    child.once('exit', (code) => reject(new Error(`redis-server exited with code ${code}`)));
  });
  const ready = (async () => {
    for (let i = 0; i < 100; i++) {
      if (await answers(port)) return;
      await new Promise((r) => setTimeout(r, 50));
    }
    throw new Error('redis-server did not answer within 5 s');
  })();
  await Promise.race([ready, failed]);
  failed.catch(() => {});
  return {
    url: `redis://127.0.0.1:${port}`,
    async stop() {
      if (child.exitCode !== null || child.signalCode !== null) return;
      const exited = new Promise<void>((r) => child.once('exit', () => r()));
      child.kill('SIGTERM');
      await exited;
    },
    kill() {
      if (child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
    },
  };
}
