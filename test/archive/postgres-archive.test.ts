/** The archive conformance suite on the PostgreSQL store (a real server from test/harness/postgres.ts). */
import { afterAll, beforeAll } from 'vitest';
import { startPostgres, type TestPostgres } from '../harness/postgres.ts';
import { describeArchiveBehaviour } from './conformance-behaviour.ts';
import { describeArchiveIntegrity } from './conformance-integrity.ts';
import { postgresFactory } from './store-handles.ts';

let server: TestPostgres;
beforeAll(async () => { server = await startPostgres(); });
afterAll(async () => { await server?.stop(); });

describeArchiveBehaviour(postgresFactory(() => server));
describeArchiveIntegrity(postgresFactory(() => server));
