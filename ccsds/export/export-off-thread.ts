/**
 * A plan's CCSDS export in a worker thread, so a long propagation (with the STM) and the rendering of up to
 * MAX_OEM_LINES lines never hold the caller's event loop — the API's HTTP loop above all. The threads start
 * with the tsx loader registered the same way as the planner's (queue/planner-pool.ts); that pool is bound to
 * planner tasks, so this is its own small runner: at most `maxThreads` exports at once (the others wait).
 * Threads are long-lived: each keeps one EphemerisCache for all the exports it runs (export-thread.ts), so a
 * second export over the same epochs and bodies fits no block again. A thread whose caller aborts, or that
 * passes the time limit, is terminated (the next export starts a fresh one); an idle thread does not keep the
 * process alive and ends after `idleMs`.
 */
import { Worker } from 'node:worker_threads';
import type { ManeuverPlan } from '../../contract/plan-types.ts';
import type { PlanningProblem } from '../../contract/problem-schema.ts';
import { CancelledError, InvalidInputError, OutOfSpanError } from '../../propagator/index.ts';
import type { CcsdsExportOptions } from './export-plan.ts';
import { FailureError, type FailureData } from '../../contract/errors.ts';

/** What crosses into the thread: plain data only (no signal, callback or ephemeris object). */
export interface ExportThreadInput {
  problem: PlanningProblem;
  plan: ManeuverPlan;
  options: ThreadExportOptions;
  /** OEM files the thread reads for a plan made on files: path and the SHA-256 the file must still have. */
  ephemerisFiles: { path: string; sha256: string }[];
}

export type ThreadExportOptions = Omit<CcsdsExportOptions, 'signal' | 'onProgress' | 'ephemeris' | 'ephemerisFiles' | 'ephemerisCache'>;

/** The thread's ephemeris cache counters after an export (EphemerisCacheStats, totals over the thread's life). */
export interface ExportCacheCounters { blocksFitted: number; blocksReused: number }

/** The one message a thread sends back per export. */
export type ExportThreadOutput =
  | { ok: true; text: string; cache: ExportCacheCounters }
  | { ok: false; error: FailureData };

/** An export's text with what it cost the thread's cache: blocks fitted and reused by this export, and
 * whether the thread had run an export before. */
export interface ExportRun { text: string; blocksFitted: number; blocksReused: number; threadReused: boolean }

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
  /** An idle thread ends after this long, ms (its cache with it). @defaultValue 300000 */
  idleMs?: number;
}

/** A long-lived export thread and its cache counters as last reported. */
interface ExportThread { worker: Worker; exports: number; cache: ExportCacheCounters; idleTimer?: NodeJS.Timeout }

// Compiled (dist/, plain node) the thread runs the built module; from the TypeScript sources (tests, tsx) the .mjs
// entry registers tsx in the fresh thread first.
const ENTRY = new URL(import.meta.url.endsWith('.js') ? './export-thread.js' : './export-thread-entry.mjs', import.meta.url);

/** Rebuilds the error kinds the callers tell apart by class (the failure came as data); others keep their
 * name, code and field (FailureError). */
function revive(e: FailureData): Error {
  if (e.name === 'InvalidInputError' && e.field !== undefined) return new InvalidInputError(e.field, e.message, e.code);
  if (e.name === 'OutOfSpanError' && e.field !== undefined) return new OutOfSpanError(e.field, e.message);
  if (e.name === 'CancelledError') return new CancelledError(e.message);
  return new FailureError(e);
}

export class CcsdsExportThreads {
  private running = 0;
  private readonly waiting: (() => void)[] = [];
  private readonly idle: ExportThread[] = [];
  readonly maxThreads: number;
  readonly timeLimitMs: number;
  readonly idleMs: number;

  constructor(options: CcsdsExportThreadsOptions = {}) {
    this.maxThreads = options.maxThreads ?? 2;
    this.timeLimitMs = options.timeLimitMs ?? 120_000;
    this.idleMs = options.idleMs ?? 300_000;
    if (!(Number.isInteger(this.maxThreads) && this.maxThreads >= 1)) {
      throw new InvalidInputError('maxThreads', `${this.maxThreads} must be an integer ≥ 1`);
    }
    if (!(this.timeLimitMs > 0)) throw new InvalidInputError('timeLimitMs', `${this.timeLimitMs} must be > 0`);
    if (!(this.idleMs > 0)) throw new InvalidInputError('idleMs', `${this.idleMs} must be > 0`);
  }

  /** Exports running now. */
  get active(): number { return this.running; }

  /**
   * Same result as exportPlanAsCcsds(problem, plan, options), computed in a thread. Rejects with the
   * export's own errors (InvalidInputError naming the field...), CancelledError when `signal` fires, or
   * ExportTimeLimitError; in the last two cases the thread is terminated at once. `ephemerisFiles`: the OEM
   * files of a plan made on files (the thread reads them and refuses any whose SHA-256 is not the one given).
   */
  async run(problem: PlanningProblem, plan: ManeuverPlan, options: ThreadExportOptions, signal?: AbortSignal,
    ephemerisFiles: { path: string; sha256: string }[] = []): Promise<string> {
    return (await this.runWithStats(problem, plan, options, signal, ephemerisFiles)).text;
  }

  /** As `run`, with the cache blocks this export fitted and reused in its thread. */
  runWithStats(problem: PlanningProblem, plan: ManeuverPlan, options: ThreadExportOptions, signal?: AbortSignal,
    ephemerisFiles: { path: string; sha256: string }[] = []): Promise<ExportRun> {
    return new Promise<ExportRun>((resolve, reject) => {
      let thread: ExportThread | undefined;
      let holding = false;
      let done = false;
      let onMessage = (_m: ExportThreadOutput): void => {};
      let onError = (_e: Error): void => {};
      let onExit = (_code: number): void => {};
      const finish = (keepThread: boolean, settle: () => void): void => {
        if (done) return;
        done = true;
        clearTimeout(timer);
        signal?.removeEventListener('abort', onAbort);
        if (thread) {
          thread.worker.off('message', onMessage).off('error', onError).off('exit', onExit);
          if (keepThread) this.park(thread); else void thread.worker.terminate();
        }
        if (holding) this.release();
        settle();
      };
      const onAbort = (): void => finish(false, () => reject(new CancelledError('CCSDS export cancelled')));
      const timer = setTimeout(() => finish(false, () => reject(new ExportTimeLimitError(this.timeLimitMs))), this.timeLimitMs);
      if (signal?.aborted) { onAbort(); return; }
      signal?.addEventListener('abort', onAbort, { once: true });
      void this.acquire().then(() => {
        if (done) { this.release(); return; }
        holding = true;
        const t = this.take();
        thread = t;
        const before = t.cache;
        const threadReused = t.exports > 0;
        onMessage = (m: ExportThreadOutput): void => {
          t.exports += 1;
          if (!m.ok) { finish(true, () => reject(revive(m.error))); return; }
          t.cache = m.cache;
          finish(true, () => resolve({
            text: m.text, threadReused,
            blocksFitted: m.cache.blocksFitted - before.blocksFitted, blocksReused: m.cache.blocksReused - before.blocksReused,
          }));
        };
        onError = (error: Error): void => finish(false, () => reject(error));
        onExit = (code: number): void => finish(false, () => reject(new Error(`CCSDS export thread exited with code ${code}`)));
        t.worker.on('message', onMessage).on('error', onError).on('exit', onExit);
        t.worker.postMessage({ problem, plan, options, ephemerisFiles } satisfies ExportThreadInput);
      });
    });
  }

  /** Ends the idle threads now (running exports finish first; their threads end when they do). */
  async close(): Promise<void> {
    const threads = this.idle.splice(0);
    await Promise.all(threads.map((t) => { clearTimeout(t.idleTimer); return t.worker.terminate(); }));
  }

  /** An idle thread (most recently used first: its cache is the warmest), or a new one. */
  private take(): ExportThread {
    const t = this.idle.pop() ?? this.start();
    clearTimeout(t.idleTimer);
    t.worker.ref();
    return t;
  }

  /** A new thread; should it fail or end while idle, it leaves the idle list (a running export sees it itself). */
  private start(): ExportThread {
    const t: ExportThread = { worker: new Worker(ENTRY), exports: 0, cache: { blocksFitted: 0, blocksReused: 0 } };
    const forget = (): void => {
      clearTimeout(t.idleTimer);
      const at = this.idle.indexOf(t);
      if (at >= 0) this.idle.splice(at, 1);
    };
    t.worker.on('error', forget).on('exit', forget);
    return t;
  }

  /** Back to the idle list: it no longer keeps the process alive, and ends after idleMs unused. */
  private park(t: ExportThread): void {
    t.worker.unref();
    t.idleTimer = setTimeout(() => {
      const at = this.idle.indexOf(t);
      if (at >= 0) this.idle.splice(at, 1);
      void t.worker.terminate();
    }, this.idleMs);
    t.idleTimer.unref();
    this.idle.push(t);
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
