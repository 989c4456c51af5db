/**
 * A real PostgreSQL for tests (never a mock). Order of preference:
 *  1. DATABASE_URL from the environment (each `freshDatabase()` creates a new database on that server);
 *  2. testcontainers (postgres:16-alpine) when a Docker engine answers;
 *  3. initdb + pg_ctl from the PostgreSQL binaries (PG_BIN, else /usr/lib/postgresql/<newest>/bin) in a temporary
 *     folder on a free port. initdb refuses to run as root, so under root the cluster belongs to the
 *     `postgres` system user (created by Debian's package, or here with `useradd --system` when the binaries came
 *     without it) and the commands run through `runuser -u postgres --`, in the temporary folder (so a checkout
 *     the `postgres` user cannot read is no obstacle).
 */
import { execFile } from 'node:child_process';
import { chownSync, existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import pg from 'pg';
import { postgresBinDir } from '../../scripts/setup.mjs';
import { freePort } from './free-port.ts';

const run = promisify(execFile);

export interface TestPostgres {
  /** URL of the server's maintenance database (`postgres`). */
  url: string;
  kind: 'env' | 'container' | 'process';
  /** Creates an empty schema (in a test database of this server) and resolves to a URL that uses it. */
  freshDatabase(): Promise<string>;
  stop(): Promise<void>;
}


function withDatabase(url: string, database: string): string {
  const u = new URL(url);
  u.pathname = `/${database}`;
  return u.toString();
}

/** Runs one statement on its own connection to `url`. */
async function runOnce(url: string, sql: string): Promise<void> {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    await client.query(sql);
  } finally {
    await client.end();
  }
}

let counter = 0;
/**
 * Each call gives a new, empty schema in one shared test database, named in the URL's `options`
 * (`-c search_path=<schema>`), so every unqualified table, function and trigger lands there. A schema costs a few
 * milliseconds where CREATE DATABASE costs ~0.4 s.
 */
function makeFresh(url: string): () => Promise<string> {
  let shared: Promise<string> | undefined;
  const sharedDatabase = async (): Promise<string> => {
    const name = `veer_tests_${process.pid}`;
    await runOnce(url, `CREATE DATABASE ${name}`);
    return withDatabase(url, name);
  };
  return async () => {
    shared ??= sharedDatabase();
    const base = await shared;
    const schema = `t${Date.now().toString(36)}_${(counter += 1)}`;
    await runOnce(base, `CREATE SCHEMA ${schema}`);
    const u = new URL(base);
    u.searchParams.set('options', `-c search_path=${schema}`);
    return u.toString();
  };
}

async function startContainer(): Promise<TestPostgres | null> {
  if (!process.env.DOCKER_HOST && !existsSync('/var/run/docker.sock')) return null;
  try {
    const { GenericContainer, Wait } = await import('testcontainers');
    const container = await new GenericContainer('postgres:16-alpine')
      .withEnvironment({ POSTGRES_PASSWORD: 'veer', POSTGRES_USER: 'veer', POSTGRES_DB: 'postgres' })
      .withExposedPorts(5432)
      .withWaitStrategy(Wait.forLogMessage(/database system is ready to accept connections/, 2))
      .start();
    const url = `postgres://veer:veer@${container.getHost()}:${container.getMappedPort(5432)}/postgres`;
    return { url, kind: 'container', freshDatabase: makeFresh(url), stop: async () => { await container.stop(); } };
  } catch {
    return null;
  }
}

/** The uid and gid of a system user, creating it (no home, no login) when missing. Needs root. */
export async function ensureSystemUser(name: string): Promise<{ uid: number; gid: number }> {
  const idOf = async (flag: '-u' | '-g'): Promise<number | null> => {
    const { stdout } = await run('id', [flag, name]).catch(() => ({ stdout: '' }));
    return stdout.trim() ? Number(stdout.trim()) : null;
  };
  if (await idOf('-u') === null) {
    try {
      await run('useradd', ['--system', '--user-group', '--no-create-home', '--home-dir', '/nonexistent', '--shell', '/usr/sbin/nologin', name]);
    } catch (error) {
      throw new Error(`running as root needs the \`${name}\` system user to own the test cluster, and useradd failed: ${(error as Error).message}`);
    }
  }
  const uid = await idOf('-u');
  const gid = await idOf('-g');
  if (uid === null || gid === null) throw new Error(`the \`${name}\` user still does not exist after useradd`);
  return { uid, gid };
}

export interface StartPostgresOptions {
  /** Keep fsync on (benchmarks); tests turn it off for speed. @defaultValue false */
  durable?: boolean;
}

async function startProcess(options: StartPostgresOptions): Promise<TestPostgres> {
  const bin = postgresBinDir();
  if (!bin) throw new Error('PostgreSQL binaries not found: install Debian\'s postgresql package, or set PG_BIN or DATABASE_URL');
  const asRoot = process.getuid?.() === 0;
  const dir = mkdtempSync(join(tmpdir(), 'veer-pg-'));
  const data = join(dir, 'data');
  if (asRoot) {
    const owner = await ensureSystemUser('postgres');
    chownSync(dir, owner.uid, owner.gid);
  }
  // cwd: the temp folder, which the cluster's owner can always enter (the caller's folder may be closed to it).
  const exec = (cmd: string, args: string[]): Promise<{ stdout: string; stderr: string }> =>
    asRoot ? run('runuser', ['-u', 'postgres', '--', join(bin, cmd), ...args], { cwd: dir }) : run(join(bin, cmd), args, { cwd: dir });
  const port = await freePort();
  await exec('initdb', ['-D', data, '-U', 'veer', '-A', 'trust', '--no-sync', '-E', 'UTF8', '--locale=C']);
  const serverOptions = `-p ${port} -k ${dir} -c listen_addresses=127.0.0.1 -c fsync=${options.durable ? 'on' : 'off'} -c max_connections=60`;
  await exec('pg_ctl', ['-D', data, '-o', serverOptions, '-l', join(dir, 'server.log'), '-w', '-t', '60', 'start']);
  const url = `postgres://veer@127.0.0.1:${port}/postgres`;
  return {
    url,
    kind: 'process',
    freshDatabase: makeFresh(url),
    stop: async () => {
      await exec('pg_ctl', ['-D', data, '-m', 'immediate', '-w', 'stop']).catch(() => undefined);
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** Starts (or connects to) a PostgreSQL server for a test file. */
export async function startPostgres(options: StartPostgresOptions = {}): Promise<TestPostgres> {
  const envUrl = process.env.DATABASE_URL;
  if (envUrl) return { url: envUrl, kind: 'env', freshDatabase: makeFresh(envUrl), stop: async () => undefined };
  return (await startContainer()) ?? startProcess(options);
}
