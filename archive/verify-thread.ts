/**
 * Runs inside an archive verification thread (started by verify-off-thread.ts): one verification of a store
 * opened read-only on a connection of its own, its input in `workerData`, one message back.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { verifyPostgresReadOnly, verifySqliteFileReadOnly } from './verify-store.ts';
import type { VerifyThreadInput, VerifyThreadOutput } from './verify-off-thread.ts';

const port = parentPort;
if (!port) throw new Error('verify-thread.ts must run in a worker thread');
const { store, options } = workerData as VerifyThreadInput;
const run = store.kind === 'sqlite' ? verifySqliteFileReadOnly(store.file, options) : verifyPostgresReadOnly(store.connectionString, options);
run.then(
  (report) => port.postMessage({ ok: true, report } satisfies VerifyThreadOutput),
  (error: unknown) => {
    const e = error instanceof Error ? error : new Error(String(error));
    port.postMessage({ ok: false, error: { name: e.name, message: e.message } } satisfies VerifyThreadOutput);
  },
);
