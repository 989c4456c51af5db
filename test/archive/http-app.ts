/**
 * An HTTP server for review/auth tests: express with H5's JSON body parsing, `authenticate`, the route table
 * (ApiRoutes) holding the review, history, export, verify and token modules plus the plan routes, and the
 * JSON error handler — over a real archive and token store (SQLite file or PostgreSQL database). The job
 * queue is not involved: the tests record submissions and proposals in the archive as the worker does.
 */
import express from 'express';
import type { Server } from 'node:http';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import pino from 'pino';
import { openArchive, type PlanArchive } from '../../archive/index.ts';
import { authenticate, openTokenStore, type Role, type TokenStore } from '../../api/auth/index.ts';
import type { AppDeps } from '../../api/deps.ts';
import { errorHandler, notFound } from '../../api/errors.ts';
import { REVIEW_ROUTE_MODULES } from '../../api/routes/index.ts';
import { ApiRoutes, type RouteSpec } from '../../api/route-table.ts';
import { ArchivePlanReader } from '../../api/plan-reader.ts';
import { planRoutes } from '../../api/routes/plans.ts';
import type { TestPostgres } from '../harness/postgres.ts';

export interface StoreLocation { name: string; dataDir?: string; databaseUrl?: string; dispose(): Promise<void> }

export const sqliteLocation = (): StoreLocation => {
  const dir = mkdtempSync(join(tmpdir(), 'veer-api-'));
  return { name: 'SQLite', dataDir: dir, dispose: async () => rmSync(dir, { recursive: true, force: true }) };
};
export const postgresLocation = async (server: TestPostgres): Promise<StoreLocation> =>
  ({ name: 'PostgreSQL', databaseUrl: await server.freshDatabase(), dispose: async () => undefined });

export interface TestApi {
  url: string;
  archive: PlanArchive;
  tokens: TokenStore;
  specs: RouteSpec[];
  /** Log records the app wrote (pino JSON lines, parsed), oldest first. */
  logs: Array<Record<string, unknown>>;
  /** Creates a token and returns its secret. */
  token(name: string, roles: Role[]): Promise<string>;
  /** fetch with JSON body and bearer token; resolves to status and parsed body. */
  call(method: string, path: string, token?: string, body?: unknown): Promise<{ status: number; body: any; headers: Headers }>;
  close(): Promise<void>;
}

export async function startTestApi(location: StoreLocation): Promise<TestApi> {
  const options = { dataDir: location.dataDir, databaseUrl: location.databaseUrl ?? '' };
  const archive = await openArchive(options);
  const tokens = await openTokenStore(options);
  const logs: Array<Record<string, unknown>> = [];
  const logger = pino({ level: 'info' }, { write: (line: string) => { logs.push(JSON.parse(line) as Record<string, unknown>); } });
  // Only what these route modules use; the queue-facing parts of AppDeps are not needed by them.
  const deps = { archive, tokens, logger, plans: new ArchivePlanReader(archive) } as unknown as AppDeps;
  const app = express();
  app.use(express.json({ limit: 256 * 1024 }));
  app.use(authenticate(tokens));
  const routes = new ApiRoutes();
  for (const mount of [...REVIEW_ROUTE_MODULES, planRoutes]) mount(routes, deps);
  app.use(routes.router);
  app.use(notFound);
  app.use(errorHandler(logger));
  const server: Server = await new Promise((resolve) => { const s = app.listen(0, '127.0.0.1', () => resolve(s)); });
  const address = server.address();
  const url = `http://127.0.0.1:${typeof address === 'object' && address ? address.port : 0}`;
  return {
    url, archive, tokens, specs: routes.specs, logs,
    token: async (name, roles) => (await tokens.add(name, roles)).token,
    call: async (method, path, token, body) => {
      const headers: Record<string, string> = {};
      if (token) headers.authorization = `Bearer ${token}`;
      if (body !== undefined) headers['content-type'] = 'application/json';
      const res = await fetch(url + path, { method, headers, body: body === undefined ? undefined : JSON.stringify(body) });
      const text = await res.text();
      let parsed: unknown = text;
      try { parsed = JSON.parse(text); } catch { /* not JSON */ }
      return { status: res.status, body: parsed, headers: res.headers };
    },
    close: async () => {
      server.closeAllConnections();
      await new Promise((resolve) => server.close(resolve));
      await archive.close();
      await tokens.close();
    },
  };
}
