/**
 * `veer plan`'s Monte Carlo threads (`--threads N`, default 1): N − 1 worker threads that take batches of the plan's
 * samples beside the main thread (the planner deals them out: planner/plan/shared-samples.ts). Each thread
 * starts as soon as the problem is read, so loading its code, parsing the problem and fitting the ephemeris
 * happen on another core while the main thread corrects and cross-checks. The samples are the same as on
 * one thread (sample i depends on the seed and i only). A thread's failure comes back as data (FailureData)
 * and fails the plan with that failure; a thread that dies fails it too; cancelling (Ctrl-C) terminates the
 * threads at once.
 */
import { Worker } from 'node:worker_threads';
import { CancelledError, FailureError, type FailureData } from '../contract/errors.ts';
import type { DispersionSample, ManeuverPlan, PlanLeapSeconds, PlanningProblem, SampleRangeRunner } from '../planner/index.ts';
import { InvalidInputError } from '../propagator/index.ts';

/** Messages to a thread (structured clone, plain data only). */
export type ToSampleThread =
  /** The problem as read (parsed again in the thread with the same leap-second table) and the paths of the
   * ephemeris files as given (read again there; the samples refuse files whose SHA-256 differs from the plan's
   * record). */
  | { type: 'prepare'; problem: PlanningProblem; leapSeconds: PlanLeapSeconds; ephemerisFiles: string[] }
  /** A batch of samples; `plan` is sent with the first batch of a plan only. */
  | { type: 'run'; plan?: ManeuverPlan; firstIndex: number; count: number };

/** Messages from a thread: one `sample` per sample done in the batch, then `done` or `failed`. */
export type FromSampleThread =
  | { type: 'sample'; done: number }
  | { type: 'done'; samples: DispersionSample[] }
  | { type: 'failed'; error: FailureData };

// Compiled (dist/, plain node) the thread runs the built module beside this one; from the TypeScript sources
// (tests, tsx) the .mjs entry registers tsx in the fresh thread first.
const ENTRY = new URL(import.meta.url.endsWith('.js') ? './sample-thread.js' : './sample-thread-entry.mjs', import.meta.url);

/** Threads at most (`--threads`). */
export const MAX_THREADS = 16;

/**
 * The number of threads for a plan: `--threads` when given (an integer in [1, MAX_THREADS]), else 1. One is the
 * default because a helper thread pays for its own start (loading and compiling the code, parsing the problem,
 * warming the propagator) and competes with V8's own background work for the cores: on the 2-core machine this
 * was measured on, the demo ran slower on two threads than on one. More threads pay where cores are free.
 * @throws InvalidInputError naming --threads.
 */
export function planThreadCount(option: string | undefined): number {
  if (option === undefined) return 1;
  const n = Number(option);
  if (!Number.isInteger(n) || n < 1 || n > MAX_THREADS) {
    throw new InvalidInputError('--threads', `must be an integer from 1 to ${MAX_THREADS}, got '${option}'`);
  }
  return n;
}

/** The batch a thread is running: how to settle it. */
interface Pending {
  resolve: (samples: DispersionSample[]) => void;
  reject: (error: Error) => void;
  onSample?: (done: number) => void;
}

/** One Monte Carlo thread; see the file comment. */
export class SampleThread implements SampleRangeRunner {
  private readonly worker = new Worker(ENTRY);
  private pending: Pending | null = null;
  /** Why the thread can run no more batches (it died, or was closed). */
  private broken: Error | null = null;
  private sentPlan: ManeuverPlan | null = null;
  /** Resolves with the exit code once the thread has ended (closed, cancelled or died). */
  readonly exited: Promise<number>;

  constructor() {
    this.exited = new Promise((resolve) => this.worker.once('exit', resolve));
    this.worker.on('message', (m: FromSampleThread) => this.receive(m));
    this.worker.on('error', (error) => this.breakWith(new FailureError({
      name: 'SampleThreadError', code: 'SAMPLE_THREAD_FAILED', message: `a Monte Carlo thread failed: ${error.message}`,
    })));
    this.worker.on('exit', (code) => this.breakWith(new FailureError({
      name: 'SampleThreadError', code: 'SAMPLE_THREAD_FAILED', message: `a Monte Carlo thread stopped (exit code ${code})`,
    })));
  }

  /** Hands the thread the problem; it parses it and readies itself while the plan is made. */
  prepare(message: Omit<Extract<ToSampleThread, { type: 'prepare' }>, 'type'>): void {
    this.worker.postMessage({ type: 'prepare', ...message } satisfies ToSampleThread);
  }

  run(plan: ManeuverPlan, range: { firstIndex: number; count: number },
    options: { signal?: AbortSignal; onSample?: (done: number) => void } = {}): Promise<DispersionSample[]> {
    const { signal } = options;
    if (this.broken) return Promise.reject(this.broken);
    if (signal?.aborted) return Promise.reject(new CancelledError('Monte Carlo cancelled'));
    return new Promise<DispersionSample[]>((resolve, reject) => {
      const onAbort = (): void => {
        this.breakWith(new CancelledError('Monte Carlo cancelled'));
        void this.worker.terminate();
      };
      const done = (): void => signal?.removeEventListener('abort', onAbort);
      this.pending = {
        resolve: (samples) => { done(); resolve(samples); },
        reject: (error) => { done(); reject(error); },
        onSample: options.onSample,
      };
      signal?.addEventListener('abort', onAbort, { once: true });
      const first = plan !== this.sentPlan;
      this.sentPlan = plan;
      this.worker.postMessage({ type: 'run', ...(first ? { plan } : {}), ...range } satisfies ToSampleThread);
    });
  }

  /** Ends the thread (a batch still running rejects with CancelledError). */
  async close(): Promise<void> {
    this.breakWith(new CancelledError('Monte Carlo thread closed'));
    await this.worker.terminate();
  }

  private receive(m: FromSampleThread): void {
    const p = this.pending;
    if (!p) return;
    if (m.type === 'sample') { p.onSample?.(m.done); return; }
    this.pending = null;
    if (m.type === 'done') p.resolve(m.samples);
    else p.reject(new FailureError(m.error));
  }

  /** Marks the thread unusable (the first reason stays) and rejects the batch running, if any. */
  private breakWith(error: Error): void {
    this.broken ??= error;
    const p = this.pending;
    this.pending = null;
    p?.reject(this.broken);
  }
}
