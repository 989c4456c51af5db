/**
 * A real Redis for tests (never a mock). Order of preference:
 *  1. REDIS_URL from the environment (used as is; cannot be restarted by the harness; `own: true` passes it by);
 *  2. testcontainers (redis:7-alpine) when a Docker engine answers;
 *  3. a `redis-server` process from PATH on a free port in a temporary folder.
 * Append-only persistence is on in cases 2 and 3 (`appendfsync always`, as in docker-compose.yml) so a
 * restart, even after a crash, keeps every acknowledged write.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync, existsSync } from 'node:fs';
import { Socket } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { freePort } from './free-port.ts';

export interface TestRedis {
  /** redis://host:port */
  url: string;
  /** How this Redis was obtained. */
  kind: 'env' | 'container' | 'process';
  /** True when `restart()` is supported (not for REDIS_URL). */
  restartable: boolean;
  /** Stops and starts the same server with the same data folder (append-only file kept). */
  restart(): Promise<void>;
  /**
   * Kills the server with SIGKILL (no shutdown, no final fsync: a crash) and starts it again with the same
   * data folder. For a container: `docker restart -t 0` (killed without a grace period).
   */
  crash(): Promise<void>;
  stop(): Promise<void>;
}

export { freePort } from './free-port.ts';

/** Resolves once a TCP connection to host:port succeeds and Redis answers PING, or rejects after timeoutMs. */
export async function waitForRedis(host: string, port: number, timeoutMs = 10_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const ok = await new Promise<boolean>((resolve) => {
      const socket = new Socket();
      const done = (v: boolean): void => { socket.destroy(); resolve(v); };
      socket.setTimeout(500, () => done(false));
      socket.once('error', () => done(false));
      socket.connect(port, host, () => socket.write('PING\r\n'));
      socket.once('data', (d) => done(d.toString().startsWith('+PONG')));
    });
    if (ok) return;
    if (Date.now() > deadline) throw new Error(`Redis at ${host}:${port} did not answer within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

function dockerLikelyAvailable(): boolean {
  return Boolean(process.env.DOCKER_HOST) || existsSync('/var/run/docker.sock');
}

async function startContainer(): Promise<TestRedis | null> {
  try {
    const { GenericContainer } = await import('testcontainers');
    const container = await new GenericContainer('redis:7-alpine')
      .withCommand(['redis-server', '--appendonly', 'yes', '--appendfsync', 'always'])
      .withExposedPorts(6379)
      .start();
    const url = (): string => `redis://${container.getHost()}:${container.getMappedPort(6379)}`;
    const handle: TestRedis = {
      url: url(),
      kind: 'container',
      restartable: true,
      async restart() {
        await container.restart();
        handle.url = url();
        await waitForRedis(container.getHost(), container.getMappedPort(6379));
      },
      async crash() {
        await container.restart({ timeout: 0 });
        handle.url = url();
        await waitForRedis(container.getHost(), container.getMappedPort(6379));
      },
      async stop() { await container.stop(); },
    };
    return handle;
  } catch {
    return null;
  }
}

/** A `redis-server` process from PATH, on `port` (a free one when not given). */
export async function startRedisProcess(port?: number): Promise<TestRedis> {
  const dir = mkdtempSync(join(tmpdir(), 'veer-redis-'));
  port ??= await freePort();
  let child: ChildProcess | null = null;
  const launch = async (): Promise<void> => {
    child = spawn('redis-server', [
      '--port', String(port), '--bind', '127.0.0.1', '--dir', dir, '--save', '',
      '--appendonly', 'yes', '--appendfsync', 'always', '--daemonize', 'no', '--loglevel', 'warning',
    ], { stdio: ['ignore', 'ignore', 'pipe'] });
    const spawnError = new Promise<never>((_, reject) => {
      child?.once('error', (e) => reject(new Error(
        `cannot start redis-server (${e.message}); install it (Debian: apt-get install redis-server) or set REDIS_URL`)));
    });
    await Promise.race([waitForRedis('127.0.0.1', port), spawnError]);
  };
  const halt = async (signal: NodeJS.Signals = 'SIGTERM'): Promise<void> => {
    const c = child as ChildProcess | null;
    if (!c || c.exitCode !== null || c.signalCode !== null) return;
    const exited = new Promise<void>((r) => c.once('exit', () => r()));
    c.kill(signal);
    await exited;
    child = null;
  };
  await launch();
  return {
    url: `redis://127.0.0.1:${port}`,
    kind: 'process',
    restartable: true,
    restart: async () => { await halt(); await launch(); },
    crash: async () => { await halt('SIGKILL'); await launch(); },
    stop: async () => { await halt(); rmSync(dir, { recursive: true, force: true }); },
  };
}

export interface StartRedisOptions {
  /** A Redis of the harness's own even when REDIS_URL is set (a container, else a redis-server process), for
   * tests that restart or crash it. @defaultValue false */
  own?: boolean;
}

/** Starts (or finds) a real Redis for a test file. Call `stop()` in afterAll. */
export async function startRedis(options: StartRedisOptions = {}): Promise<TestRedis> {
  const fromEnv = options.own ? undefined : process.env.REDIS_URL;
  if (fromEnv) {
    return { url: fromEnv, kind: 'env', restartable: false, restart: async () => {
      throw new Error('REDIS_URL given: the harness cannot restart that Redis');
    }, crash: async () => {
      throw new Error('REDIS_URL given: the harness cannot crash that Redis');
    }, stop: async () => {} };
  }
  if (dockerLikelyAvailable()) {
    const container = await startContainer();
    if (container) return container;
  }
  return startRedisProcess();
}
