/**
 * A plan's CCSDS export in a worker thread of its own, so a long propagation (with the STM) and the
 * rendering of up to MAX_OEM_LINES lines never hold the caller's event loop — the API's HTTP loop above all.
 * The threads start with the tsx loader registered the same way as the planner's (queue/planner-pool.ts);
 * that pool is bound to planner tasks, so this is its own small runner: one thread per export, at most
 * `maxThreads` at once (the others wait), each terminated when its caller aborts or the time limit passes.
 */
import { Worker } from 'node:worker_threads';
import type { ManeuverPlan, PlanningProblem } from '../../planner/index.ts';
import { CancelledError, InvalidInputError, OutOfSpanError } from '../../propagator/index.ts';
import type { CcsdsExportOptions } from './export-plan.ts';

/** What crosses into the thread: plain data only (no signal, callback or ephemeris object). */
export interface ExportThreadInput {
  problem: PlanningProblem;
  plan: ManeuverPlan;
  options: ThreadExportOptions;
}

export type ThreadExportOptions = Omit<CcsdsExportOptions, 'signal' | 'onProgress' | 'ephemeris'>;

/** The one message a thread sends back. */
export type ExportThreadOutput =
  | { ok: true; text: string }
  | { ok: false; error: { name: string; message: string; field?: string; code?: string } };

/** The export did not finish within the time limit (its thread was stopped). */
export class ExportTimeLimitError extends Error {
  override readonly name = 'ExportTimeLimitError';
  readonly code = 'EXPORT_TIME_LIMIT';
  constructor(readonly timeLimitMs: number) {
    super(`the export did not finish within ${timeLimitMs / 1000} s and was stopped; choose a larger step`);
  }
}

export interface CcsdsExportThreadsOptions {
  /** Exports running at once; more wait for a free place. @defaultValue 2 */
  maxThreads?: number;
  /** Longest an export may take, waiting included, ms. @defaultValue 120000 */
  timeLimitMs?: number;
}

// Compiled (dist/, plain node) the thread runs the built module; from the TypeScript sources (tests, tsx) the .mjs
// entry registers tsx in the fresh thread first.
const ENTRY = new URL(import.meta.url.endsWith('.js') ? './export-thread.js' : './export-thread-entry.mjs', import.meta.url);

/** Rebuilds the error kinds the callers tell apart (by class and `name`); others keep name and message. */
function revive(e: Extract<ExportThreadOutput, { ok: false }>['error']): Error {
  const strip = (field: string): string => e.message.startsWith(`${field}: `) ? e.message.slice(field.length + 2) : e.message;
  if (e.name === 'InvalidInputError' && e.field !== undefined) return new InvalidInputError(e.field, strip(e.field), e.code);
  if (e.name === 'OutOfSpanError' && e.field !== undefined) return new OutOfSpanError(e.field, strip(e.field));
  if (e.name === 'CancelledError') return new CancelledError(e.message);
  const error = new Error(e.message);
  error.name = e.name;
  return error;
}

export class CcsdsExportThreads {
  private running = 0;
  private readonly waiting: (() => void)[] = [];
  readonly maxThreads: number;
  readonly timeLimitMs: number;

  constructor(options: CcsdsExportThreadsOptions = {}) {
    this.maxThreads = options.maxThreads ?? 2;
    this.timeLimitMs = options.timeLimitMs ?? 120_000;
    if (!(Number.isInteger(this.maxThreads) && this.maxThreads >= 1)) {
      throw new InvalidInputError('maxThreads', `${this.maxThreads} must be an integer ≥ 1`);
    }
    if (!(this.timeLimitMs > 0)) throw new InvalidInputError('timeLimitMs', `${this.timeLimitMs} must be > 0`);
  }

  /** Exports running now (threads alive). */
  get active(): number { return this.running; }

  /**
   * Same result as exportPlanAsCcsds(problem, plan, options), computed in a thread. Rejects with the
   * export's own errors (InvalidInputError naming the field...), CancelledError when `signal` fires, or
   * ExportTimeLimitError; in the last two cases the thread is terminated at once.
   */
  run(problem: PlanningProblem, plan: ManeuverPlan, options: ThreadExportOptions, signal?: AbortSignal): Promise<string> {
    return new Promise<string>((resolve, reject) => {
      let worker: Worker | undefined;
      let holding = false;
      let done = false;
      const finish = (settle: () => void): void => {
        if (done) return;
        done = true;
        clearTimeout(timer);
        signal?.removeEventListener('abort', onAbort);
        if (worker) void worker.terminate();
        if (holding) this.release();
        settle();
      };
      const onAbort = (): void => finish(() => reject(new CancelledError('CCSDS export cancelled')));
      const timer = setTimeout(() => finish(() => reject(new ExportTimeLimitError(this.timeLimitMs))), this.timeLimitMs);
      if (signal?.aborted) { onAbort(); return; }
      signal?.addEventListener('abort', onAbort, { once: true });
      void this.acquire().then(() => {
        if (done) { this.release(); return; }
        holding = true;
        const input: ExportThreadInput = { problem, plan, options };
        worker = new Worker(ENTRY, { workerData: input });
        worker.once('message', (m: ExportThreadOutput) => finish(() => (m.ok ? resolve(m.text) : reject(revive(m.error)))));
        worker.once('error', (error) => finish(() => reject(error)));
        worker.once('exit', (code) => finish(() => reject(new Error(`CCSDS export thread exited with code ${code}`))));
      });
    });
  }

  private acquire(): Promise<void> {
    if (this.running < this.maxThreads) { this.running++; return Promise.resolve(); }
    return new Promise((resolve) => this.waiting.push(() => { this.running++; resolve(); }));
  }

  private release(): void {
    this.running--;
    this.waiting.shift()?.();
  }
}
