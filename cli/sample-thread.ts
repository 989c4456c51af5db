/**
 * Runs inside one of `veer plan`'s Monte Carlo threads (started by sample-threads.ts): takes the problem once
 * ('prepare': parsed here with the main thread's leap-second table, its ephemeris files read again — the
 * samples refuse them if they no longer match the plan's record — then prepareDispersionSamples), then batches of the plan's samples ('run'), one at
 * a time, answering each with its samples or its failure as data.
 */
import { parentPort } from 'node:worker_threads';
import { failureOf } from '../contract/errors.ts';
import {
  EphemerisCache, leapSecondTableOfPlan, parseProblem, prepareDispersionSamples, runDispersionSamples,
  type CheckedProblem, type EphemerisFileTable, type ManeuverPlan,
} from '../planner/index.ts';
import { loadEphemerisFiles } from './ephemeris-option.ts';
import type { FromSampleThread, ToSampleThread } from './sample-threads.ts';

const port = parentPort;
if (!port) throw new Error('sample-thread.ts must run in a worker thread');
const send = (message: FromSampleThread): void => port.postMessage(message);

const ephemerisCache = new EphemerisCache();
let prepared: Promise<{ problem: CheckedProblem; files: EphemerisFileTable[] }> | null = null;
let plan: ManeuverPlan | null = null;

async function prepare(m: Extract<ToSampleThread, { type: 'prepare' }>): Promise<{ problem: CheckedProblem; files: EphemerisFileTable[] }> {
  const leapSeconds = leapSecondTableOfPlan(m.leapSeconds);
  const problem = parseProblem(m.problem, leapSeconds);
  const files = await loadEphemerisFiles(m.ephemerisFiles, leapSeconds);
  try {
    await prepareDispersionSamples(problem, { ephemerisCache, ephemerisFiles: files });
  } catch {
    // The warm-up only loads and compiles; a fault it meets shows again in the samples themselves.
  }
  return { problem, files };
}

async function runBatch(m: Extract<ToSampleThread, { type: 'run' }>): Promise<void> {
  if (m.plan) plan = m.plan;
  try {
    if (!prepared || !plan) throw new Error('a batch arrived before the problem or the plan');
    const { problem, files } = await prepared;
    const samples = await runDispersionSamples(problem, plan, {
      seed: problem.dispersion.seed, firstIndex: m.firstIndex, count: m.count, ephemerisCache, ephemerisFiles: files,
      onSample: (done) => send({ type: 'sample', done }),
    });
    send({ type: 'done', samples });
  } catch (error) {
    send({ type: 'failed', error: failureOf(error) });
  }
}

port.on('message', (m: ToSampleThread) => {
  if (m.type === 'prepare') {
    prepared = prepare(m);
    prepared.catch(() => undefined); // reported by the first batch
  } else {
    void runBatch(m);
  }
});
