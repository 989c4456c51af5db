/**
 * docker-compose.yml and the Dockerfile, checked without a container engine (none runs here): the file is parsed
 * (YAML 1.2 with merge keys, as Compose reads it) and every service's command, environment, volumes and
 * healthcheck is checked against what the project defines — the API's and worker's configuration schemas, the
 * compiled entry points, the API's routes — so a renamed variable, a moved entry or a stray setting fails here.
 * Compose file semantics (interpolation `${VAR:-default}`, `depends_on.condition`, named volumes): the Compose
 * Specification (compose-spec.io). Image facts written from memory: the official redis image keeps its data in
 * /data, the postgres image in /var/lib/postgresql/data and creates POSTGRES_USER / POSTGRES_DB.
 */
import { spawn } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parse } from 'yaml';
import { apiEnvSchema, loadApiConfig } from '../../api/index.ts';
import { loadWorkerConfig, workerEnvSchema } from '../../queue/index.ts';
import { ROOT } from '../harness/built.ts';
import { startService, type TestService } from '../harness/service.ts';

type Env = Record<string, string>;
interface Service {
  image?: string; build?: string; command?: string[]; environment?: Env; volumes?: string[]; ports?: string[];
  healthcheck?: { test: string[] }; depends_on?: Record<string, { condition: string }>;
}
const compose = parse(readFileSync(join(ROOT, 'docker-compose.yml'), 'utf8'), { merge: true }) as {
  services: Record<string, Service>; volumes: Record<string, unknown>;
};
const services = compose.services;

/** Compose interpolation with nothing set in the shell: `${VAR:-default}` and `${VAR-default}` give the default. */
function interpolate(value: string): string {
  return value.replace(/\$\{([A-Z0-9_]+)(:?-([^}]*))?\}/g, (_m, name: string, hasDefault?: string, fallback?: string) => {
    if (hasDefault === undefined) throw new Error(`\${${name}} has no default: Compose would substitute an empty string`);
    return fallback ?? '';
  });
}
const envOf = (s: Service): Env => Object.fromEntries(Object.entries(s.environment ?? {}).map(([k, v]) => [k, interpolate(String(v))]));

/** The configuration each veer entry point reads, by its compiled path. */
const ENTRY_POINTS: Record<string, { source: string; keys: string[]; load: (env: Env) => unknown }> = {
  'dist/api/main.js': { source: 'api/main.ts', keys: Object.keys(apiEnvSchema.shape), load: loadApiConfig },
  'dist/queue/worker-main.js': { source: 'queue/worker-main.ts', keys: Object.keys(workerEnvSchema.shape), load: loadWorkerConfig },
};
const veerServices = Object.entries(services).filter(([, s]) => s.build !== undefined);

describe('docker-compose.yml', () => {
  describe('when the veer services (api, workers) are read', () => {
    it('should run a compiled entry point with plain node, from the image the Dockerfile builds', () => {
      const dockerfile = readFileSync(join(ROOT, 'Dockerfile'), 'utf8');
      expect(veerServices.map(([name]) => name).sort()).toEqual(['api', 'worker']);
      for (const [name, s] of veerServices) {
        const [node, entry, ...rest] = s.command ?? [];
        expect({ name, node, rest }).toEqual({ name, node: 'node', rest: [] });
        expect(Object.keys(ENTRY_POINTS), `${name}: ${entry}`).toContain(entry);
        expect(existsSync(join(ROOT, ENTRY_POINTS[entry].source)), `${name}: source of ${entry}`).toBe(true);
      }
      expect(dockerfile).toMatch(/^RUN npm ci\b/m);
      expect(dockerfile).toMatch(/^COPY --from=build \/app\/dist \.\/dist$/m);
      expect(dockerfile).toMatch(/^COPY --from=build \/app\/console\/dist \.\/console\/dist$/m);
      expect(JSON.parse(/^CMD (.*)$/m.exec(dockerfile)?.[1] ?? 'null')).toEqual(services.api.command);
    });

    it('should set only variables its configuration schema knows, each valid', () => {
      for (const [name, s] of veerServices) {
        const entry = ENTRY_POINTS[s.command![1]];
        const env = envOf(s);
        expect(Object.keys(env).filter((k) => !entry.keys.includes(k)), `${name}: variables its schema does not know`).toEqual([]);
        expect(() => entry.load(env), name).not.toThrow();
      }
    });

    it('should point REDIS_URL and DATABASE_URL at the redis and postgres services, with their user and database', () => {
      const pgEnv = envOf(services.postgres);
      for (const [name, s] of veerServices) {
        const env = envOf(s);
        const redis = new URL(env.REDIS_URL);
        expect({ name, host: redis.hostname, port: redis.port }).toEqual({ name, host: 'redis', port: '6379' });
        expect(services.redis.command).not.toContain('--port'); // so the server listens on the default 6379
        const db = new URL(env.DATABASE_URL);
        expect({ name, host: db.hostname, user: db.username, password: db.password, database: db.pathname.slice(1) })
          .toEqual({ name, host: 'postgres', user: pgEnv.POSTGRES_USER, password: pgEnv.POSTGRES_PASSWORD, database: pgEnv.POSTGRES_DB });
      }
    });

    it('should give the workers and the API the same queue prefix, plan store and job retention', () => {
      const [api, worker] = [envOf(services.api), envOf(services.worker)];
      for (const key of ['REDIS_URL', 'DATABASE_URL', 'QUEUE_PREFIX', 'PLAN_SINK', 'JOB_RETENTION_S']) {
        expect(worker[key], key).toBe(api[key]);
      }
    });
  });

  describe('when Redis is read', () => {
    it('should keep every acknowledged write (append-only file, fsync always) and never evict queue keys', () => {
      const cmd = services.redis.command!.join(' ');
      expect(cmd).toMatch(/--appendonly yes/);
      expect(cmd).toMatch(/--appendfsync always/);
      // BullMQ's production guide: maxmemory-policy must be noeviction, or Redis may drop job keys.
      expect(cmd).toMatch(/--maxmemory-policy noeviction/);
    });
  });

  describe('when volumes are read', () => {
    it('should mount each declared named volume where its image keeps data, and declare every one used', () => {
      const mounts = Object.entries(services).flatMap(([name, s]) => (s.volumes ?? []).map((v) => [name, ...v.split(':')]));
      expect(mounts).toEqual(expect.arrayContaining([['redis', 'redis-data', '/data'], ['postgres', 'postgres-data', '/var/lib/postgresql/data']]));
      const named = mounts.map(([, source]) => source).filter((src) => !src.startsWith('.') && !src.startsWith('/'));
      expect([...new Set(named)].sort()).toEqual(Object.keys(compose.volumes).sort());
    });
  });

  describe('when healthchecks and start order are read', () => {
    it('should have a healthcheck on every service another waits for as healthy', () => {
      for (const [name, s] of Object.entries(services)) {
        for (const [dep, { condition }] of Object.entries(s.depends_on ?? {})) {
          expect(services[dep], `${name} depends on ${dep}`).toBeDefined();
          if (condition === 'service_healthy') expect(services[dep].healthcheck?.test, `${dep} (awaited by ${name})`).toBeDefined();
        }
      }
    });

    it('should ask PostgreSQL with the user and database the server creates', () => {
      const env = envOf(services.postgres);
      expect(services.postgres.healthcheck!.test.join(' ')).toContain(`pg_isready -U ${env.POSTGRES_USER} -d ${env.POSTGRES_DB}`);
    });

    describe('when the API healthcheck runs against a real API', () => {
      let svc: TestService;
      beforeAll(async () => { svc = await startService(); }, 120_000);
      afterAll(async () => { await svc?.close(); });

      it('should probe the published port and exit 0 when the API answers, 1 when nothing listens', async () => {
        const [kind, cmd, flag, script] = services.api.healthcheck!.test;
        expect([kind, cmd, flag]).toEqual(['CMD', 'node', '-e']);
        const port = envOf(services.api).PORT;
        expect(services.api.ports).toContain(`${port}:${port}`);
        expect(script).toContain(`127.0.0.1:${port}/`);
        // Asynchronous: the API under test answers from this process's event loop.
        const probe = (origin: string): Promise<number | null> => new Promise((resolve) => {
          const child = spawn(process.execPath, ['-e', script.replace(`http://127.0.0.1:${port}`, origin)], { timeout: 10_000 });
          child.once('exit', (code) => resolve(code));
        });
        expect(await probe(svc.url)).toBe(0);
        expect(await probe('http://127.0.0.1:9')).toBe(1); // the discard port: nothing listens there
      });
    });
  });
});
