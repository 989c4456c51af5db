/**
 * Identities and roles: token stores on both databases (hashes only, revocation), the bearer middleware, and
 * a role matrix — every route of the review/history/export/verify/token/plan modules × every role × no token
 * × a bad token, each answer checked. SHA-256 values are recomputed with node:crypto (FIPS 180-4).
 */
import Database from 'better-sqlite3';
import { createHash } from 'node:crypto';
import { join } from 'node:path';
import pg from 'pg';
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { openTokenStore, ROLES, type Role, type TokenStore } from '../../api/auth/index.ts';
import { makePlan, PROBLEM } from '../archive/fixtures.ts';
import { postgresLocation, sqliteLocation, startTestApi, type StoreLocation, type TestApi } from '../archive/http-app.ts';
import { startPostgres, type TestPostgres } from '../harness/postgres.ts';

let server: TestPostgres;
beforeAll(async () => { server = await startPostgres(); });
afterAll(async () => { await server?.stop(); });

async function storedRows(location: StoreLocation): Promise<Array<Record<string, unknown>>> {
  if (location.databaseUrl) {
    const client = new pg.Client({ connectionString: location.databaseUrl });
    await client.connect();
    try { return (await client.query('SELECT * FROM api_tokens')).rows; } finally { await client.end(); }
  }
  const db = new Database(join(location.dataDir!, 'tokens.sqlite'), { readonly: true });
  try { return db.prepare('SELECT * FROM api_tokens').all() as Array<Record<string, unknown>>; } finally { db.close(); }
}

describe.each([
  ['SQLite', async () => sqliteLocation()],
  ['PostgreSQL', () => postgresLocation(server)],
] as Array<[string, () => Promise<StoreLocation>]>)('token store on %s', (_name, makeLocation) => {
  let location: StoreLocation;
  let store: TokenStore;
  beforeEach(async () => {
    location = await makeLocation();
    store = await openTokenStore({ dataDir: location.dataDir, databaseUrl: location.databaseUrl ?? '' });
  });
  afterEach(async () => {
    await store.close();
    await location.dispose();
  });

  describe('when a token is added', () => {
    it('should keep only its SHA-256 hash, never the token', async () => {
      const { token, record } = await store.add('ann', ['submitter', 'reviewer', 'submitter']);
      expect(token).toMatch(/^veer_[A-Za-z0-9_-]{43}$/);
      expect(record.roles).toEqual(['submitter', 'reviewer']);
      const rows = await storedRows(location);
      expect(rows).toHaveLength(1);
      expect(rows[0].token_hash).toBe(createHash('sha256').update(token).digest('hex'));
      expect(JSON.stringify(rows)).not.toContain(token.slice(5));
      expect(await store.identify(token)).toEqual({ name: 'ann', roles: ['submitter', 'reviewer'], tokenId: record.id });
    });

    it('should refuse a bad name or role, naming the field', async () => {
      await expect(store.add('has space', ['reviewer'])).rejects.toThrow(/^name:/);
      await expect(store.add('ann', ['pilot' as Role])).rejects.toThrow(/^roles\.0:/);
      await expect(store.add('ann', [])).rejects.toThrow(/^roles:/);
    });
  });

  describe('when a token is revoked', () => {
    it('should stop identifying it and keep its record', async () => {
      const { token, record } = await store.add('bob', ['reviewer']);
      const revoked = await store.revoke(record.id);
      expect(revoked?.revokedAt).not.toBeNull();
      expect(await store.identify(token)).toBeUndefined();
      expect((await store.list()).map((t) => t.id)).toEqual([record.id]);
      expect(await store.revoke('tok_000000000000')).toBeUndefined();
    });

    it('should keep who created and who revoked it', async () => {
      const { record } = await store.add('cy', ['auditor'], 'root-admin');
      expect(record).toMatchObject({ createdBy: 'root-admin', revokedBy: null });
      expect(await store.revoke(record.id, 'second-admin')).toMatchObject({ createdBy: 'root-admin', revokedBy: 'second-admin' });
      const [row] = await storedRows(location);
      expect(row).toMatchObject({ created_by: 'root-admin', revoked_by: 'second-admin' });
    });
  });
});

describe('token audit trail', () => {
  describe('when a store made before the trail was recorded is opened', () => {
    it('should add the columns and show old tokens with no recorded creator', async () => {
      const location = sqliteLocation();
      try {
        const file = join(location.dataDir!, 'tokens.sqlite');
        const db = new Database(file);
        db.exec(`CREATE TABLE auth_schema_migrations (version INTEGER PRIMARY KEY, name TEXT NOT NULL, applied_at TEXT NOT NULL);
          INSERT INTO auth_schema_migrations VALUES (1, 'api tokens (hashes only)', '2030-01-01T00:00:00.000Z');
          CREATE TABLE api_tokens (id TEXT PRIMARY KEY, name TEXT NOT NULL, roles TEXT NOT NULL, token_hash TEXT NOT NULL UNIQUE,
            created_at TEXT NOT NULL, revoked_at TEXT);
          INSERT INTO api_tokens VALUES ('tok_0123456789ab', 'old', '["auditor"]', '${'c'.repeat(64)}', '2030-01-01T00:00:00.000Z', NULL);`);
        db.close();
        const store = await openTokenStore({ dataDir: location.dataDir, databaseUrl: '' });
        try {
          expect(await store.list()).toEqual([expect.objectContaining({ id: 'tok_0123456789ab', createdBy: null, revokedBy: null })]);
        } finally {
          await store.close();
        }
      } finally {
        await location.dispose();
      }
    });
  });

  describe('when an admin creates and revokes a token over HTTP', () => {
    it('should record the admin in both and log both', async () => {
      const location = sqliteLocation();
      const api = await startTestApi(location);
      try {
        const admin = await api.token('Root.Admin', ['admin']);
        const created = await api.call('POST', '/v1/tokens', admin, { name: 'Dee', roles: ['reviewer'] });
        expect(created.status).toBe(201);
        expect(created.body.record).toMatchObject({ name: 'dee', createdBy: 'root.admin', revokedBy: null });
        const revoked = await api.call('DELETE', `/v1/tokens/${created.body.record.id}`, admin);
        expect(revoked.body.record).toMatchObject({ createdBy: 'root.admin', revokedBy: 'root.admin' });
        const audit = api.logs.filter((l) => typeof l.audit === 'string');
        expect(audit).toEqual([
          expect.objectContaining({ audit: 'token-created', tokenId: created.body.record.id, name: 'dee', roles: ['reviewer'], by: 'root.admin' }),
          expect.objectContaining({ audit: 'token-revoked', tokenId: created.body.record.id, name: 'dee', by: 'root.admin' }),
        ]);
        expect(JSON.stringify(api.logs)).not.toContain(created.body.token);
      } finally {
        await api.close();
        await location.dispose();
      }
    });
  });
});

describe('role matrix over HTTP', () => {
  let location: StoreLocation;
  let api: TestApi;
  const tokens = {} as Record<Role, string>;
  let job = 0;

  beforeAll(async () => {
    location = sqliteLocation();
    api = await startTestApi(location);
    for (const role of ROLES) tokens[role] = await api.token(`only-${role}`, [role]);
  });
  afterAll(async () => {
    await api.close();
    await location.dispose();
  });

  async function freshPlan(): Promise<string> {
    const jobId = `job-${(job += 1)}`;
    await api.archive.recordJobSubmitted({ jobId, actor: 'someone-else', problem: PROBLEM });
    return (await api.archive.recordPlanProposed({ jobId, actor: 'w', submittedBy: 'someone-else', plan: makePlan({ targetSetKey: jobId }) })).planId;
  }

  /** A request each route admits, and the success status it should give. */
  const requests: Record<string, () => Promise<{ path: string; body?: unknown; ok: number }>> = {
    'post /v1/plans/:planId/reviews': async () => ({ path: `/v1/plans/${await freshPlan()}/reviews`, body: { decision: 'reject', comment: 'matrix' }, ok: 201 }),
    'get /v1/plans/:planId/history': async () => ({ path: `/v1/plans/${await freshPlan()}/history`, ok: 200 }),
    'get /v1/archive/entries': async () => ({ path: '/v1/archive/entries?from=1&limit=5', ok: 200 }),
    'get /v1/plans/:planId/export': async () => ({ path: `/v1/plans/${await freshPlan()}/export`, ok: 200 }),
    'get /v1/archive/verify': async () => ({ path: '/v1/archive/verify', ok: 200 }),
    'get /v1/tokens': async () => ({ path: '/v1/tokens', ok: 200 }),
    'post /v1/tokens': async () => ({ path: '/v1/tokens', body: { name: `new-${(job += 1)}`, roles: ['submitter'] }, ok: 201 }),
    'delete /v1/tokens/:tokenId': async () => ({ path: `/v1/tokens/${(await api.tokens.add(`gone-${(job += 1)}`, ['auditor'])).record.id}`, ok: 200 }),
    'get /v1/plans': async () => ({ path: '/v1/plans?state=proposed', ok: 200 }),
    'get /v1/plans/:planId': async () => ({ path: `/v1/plans/${await freshPlan()}`, ok: 200 }),
  };

  it('should cover every route that declares roles', () => {
    const declared = api.specs.filter((s) => s.roles).map((s) => `${s.method} ${s.path}`);
    expect(declared.sort()).toEqual(Object.keys(requests).sort());
    // No anonymous writes: every non-GET route declares roles.
    expect(api.specs.filter((s) => s.method !== 'get' && !s.roles)).toEqual([]);
  });

  describe.each(Object.keys(requests))('when calling %s', (key) => {
    it('should answer 401 without a token or with a bad one, 403 to roles it does not admit, success to those it does', async () => {
      const spec = api.specs.find((s) => `${s.method} ${s.path}` === key)!;
      const method = spec.method.toUpperCase();
      const anonymous = await requests[key]();
      expect((await api.call(method, anonymous.path, undefined, anonymous.body)).status).toBe(401);
      expect((await api.call(method, anonymous.path, 'veer_not-a-real-token', anonymous.body)).status).toBe(401);
      for (const role of ROLES) {
        const request = await requests[key]();
        const answer = await api.call(method, request.path, tokens[role], request.body);
        const expected = spec.roles!.includes(role) ? request.ok : 403;
        expect(answer.status, `${key} as ${role}: ${JSON.stringify(answer.body).slice(0, 200)}`).toBe(expected);
      }
    });
  });
});
