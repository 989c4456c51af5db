/**
 * Runs inside a worker thread: executes planner tasks so the worker process's event loop stays free for
 * lock renewal, progress and cancellation. One task at a time per thread.
 */
import { parentPort } from 'node:worker_threads';
import { EphemerisCache } from '../../planner/index.ts';
import { failureOf } from '../../contract/errors.ts';
import type { FromThread, ToThread } from './planner-task.ts';
import { runPlannerTask } from './planner-task-run.ts';

// This thread's ephemeris cache, shared by every task it runs: a queue of jobs over the same span and
// bodies fits each block once (bounded: EphemerisCache evicts the least recently used blocks).
const ephemerisCache = new EphemerisCache();

const port = parentPort;
if (!port) throw new Error('planner-thread.ts must run in a worker thread');
const controllers = new Map<number, AbortController>();
const send = (message: FromThread): void => port.postMessage(message);

port.on('message', (message: ToThread) => {
  if (message.type === 'cancel') {
    controllers.get(message.taskId)?.abort(message.reason);
    return;
  }
  const controller = new AbortController();
  controllers.set(message.taskId, controller);
  const { taskId } = message;
  runPlannerTask(message.task, controller.signal, (progress) => send({ type: 'progress', taskId, progress }), ephemerisCache).then(
    (result) => send({ type: 'done', taskId: message.taskId, result }),
    (error: unknown) => send({ type: 'failed', taskId: message.taskId, error: failureOf(error) }),
  ).finally(() => controllers.delete(message.taskId));
});
send({ type: 'ready' });
