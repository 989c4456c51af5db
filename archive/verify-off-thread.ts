/**
 * Verification of a whole archive in a worker thread of its own, on a read-only connection of its own, so
 * walking and hashing every entry (seconds for 100k entries) never holds the caller's event loop — the API's
 * HTTP loop above all — nor the store's write queue. The thread reads the chain in pages (verify.ts), so its
 * memory grows with the number of plans (one small record each), not with the entries' payloads; the heap cap
 * below turns a runaway into an error instead of a swollen API process.
 */
import { Worker } from 'node:worker_threads';
import type { VerifyOptions, VerifyReport } from '../contract/archive-types.ts';

/** Where the thread opens the store. */
export type VerifyThreadStore = { kind: 'sqlite'; file: string } | { kind: 'postgres'; connectionString: string };

/** What crosses into the thread: plain data only. */
export interface VerifyThreadInput { store: VerifyThreadStore; options: VerifyOptions }

/** The one message a thread sends back. */
export type VerifyThreadOutput = { ok: true; report: VerifyReport } | { ok: false; error: { name: string; message: string } };

/** Heap limit of a verification thread, MiB. */
export const VERIFY_THREAD_HEAP_MB = 512;

// Compiled (dist/, plain node) the thread runs the built module; from the TypeScript sources the .mjs entry
// registers tsx in the fresh thread first.
const ENTRY = new URL(import.meta.url.endsWith('.js') ? './verify-thread.js' : './verify-thread-entry.mjs', import.meta.url);

/** Same report as verifying on the caller's thread; errors keep their name (ArchiveNotFoundError ...). */
export function verifyOffThread(store: VerifyThreadStore, options: VerifyOptions = {}): Promise<VerifyReport> {
  return new Promise<VerifyReport>((resolve, reject) => {
    let done = false;
    const worker = new Worker(ENTRY, {
      workerData: { store, options } satisfies VerifyThreadInput,
      resourceLimits: { maxOldGenerationSizeMb: VERIFY_THREAD_HEAP_MB },
    });
    const finish = (settle: () => void): void => {
      if (done) return;
      done = true;
      void worker.terminate();
      settle();
    };
    worker.once('message', (m: VerifyThreadOutput) => finish(() => {
      if (m.ok) { resolve(m.report); return; }
      const error = new Error(m.error.message);
      error.name = m.error.name;
      reject(error);
    }));
    worker.once('error', (error) => finish(() => reject(error)));
    worker.once('exit', (code) => finish(() => reject(new Error(`archive verification thread exited with code ${code}`))));
  });
}
