/**
 * Runs inside a CCSDS export thread (started by export-off-thread.ts): one export per thread, its input in
 * `workerData`, one message back — the text, or the error reduced to what survives the thread boundary.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { EphemerisCache } from '../../propagator/index.ts';
import { exportPlanAsCcsds } from './export-plan.ts';
import type { ExportThreadInput, ExportThreadOutput } from './export-off-thread.ts';

const port = parentPort;
if (!port) throw new Error('export-thread.ts must run in a worker thread');
const { problem, plan, options } = workerData as ExportThreadInput;
const send = (message: ExportThreadOutput): void => port.postMessage(message);

// The thread's ephemeris cache (one export per thread): the export's body positions come from the same
// block fits the planner uses, fitted as the propagation reaches them.
exportPlanAsCcsds(problem, plan, { ...options, ephemerisCache: new EphemerisCache() }).then(
  (text) => send({ ok: true, text }),
  (error: unknown) => {
    const e = (error instanceof Error ? error : new Error(String(error))) as Error & { field?: unknown; code?: unknown };
    send({
      ok: false,
      error: {
        name: e.name, message: e.message,
        ...(typeof e.field === 'string' ? { field: e.field } : {}),
        ...(typeof e.code === 'string' ? { code: e.code } : {}),
      },
    });
  },
);
