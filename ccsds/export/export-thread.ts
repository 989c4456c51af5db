/**
 * Runs inside a CCSDS export thread (started by export-off-thread.ts): a long-lived thread that takes one
 * export per message ({problem, plan, options}) and answers each with one message — the text and its cache
 * counters, or the error reduced to what survives the thread boundary. The runner sends the next export only
 * after the answer to the previous one.
 */
import { parentPort } from 'node:worker_threads';
import { EphemerisCache, leapSecondTableOfPlan } from '../../propagator/index.ts';
import { loadEphemerisFiles } from '../messages/oem-ephemeris-files.ts';
import { exportPlanAsCcsds } from './export-plan.ts';
import { failureOf } from '../../contract/errors.ts';
import type { ExportThreadInput, ExportThreadOutput } from './export-off-thread.ts';

const port = parentPort;
if (!port) throw new Error('export-thread.ts must run in a worker thread');
const send = (message: ExportThreadOutput): void => port.postMessage(message);

// The thread's ephemeris cache, kept for every export the thread runs: body positions come from the same
// block fits the planner uses, fitted as a propagation first reaches them and reused by later exports.
const ephemerisCache = new EphemerisCache();

port.on('message', ({ problem, plan, options, ephemerisFiles }: ExportThreadInput) => {
  // A plan made on files reads them here (each refused if its SHA-256 changed since the caller checked it).
  loadEphemerisFiles(ephemerisFiles.map((f) => f.path), leapSecondTableOfPlan(plan.leapSeconds), 'ephemeris', ephemerisFiles.map((f) => f.sha256))
    .then((files) => exportPlanAsCcsds(problem, plan, { ...options, ephemerisCache, ephemerisFiles: files })).then(
      (text) => {
        const { blocksFitted, blocksReused } = ephemerisCache.stats();
        send({ ok: true, text, cache: { blocksFitted, blocksReused } });
      },
      (error: unknown) => send({ ok: false, error: failureOf(error) }),
    );
});
