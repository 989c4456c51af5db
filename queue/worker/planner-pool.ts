/**
 * A small pool of planner worker threads (one task per thread at a time). Cancellation is cooperative first
 * (the planner's AbortSignal inside the thread); a thread that ignores it for `cancelGraceMs` is terminated
 * and replaced, so a stuck computation cannot hold a worker slot.
 */
import { Worker } from 'node:worker_threads';
import type { FromThread, PlannerTask, PlannerTaskResult, TaskProgress, ToThread } from './planner-task.ts';
import { FailureError } from '../../contract/errors.ts';

export interface PlannerPoolOptions {
  /** Threads at most (one per concurrent job). */
  size: number;
  /** How long a cancelled task may take to stop before its thread is terminated, ms. @defaultValue 5000 */
  cancelGraceMs?: number;
}

interface Slot { worker: Worker; ready: Promise<void>; busy: boolean; onMessage: ((m: FromThread) => void) | null; onExit: ((code: number) => void) | null }

// Compiled (dist/, plain node) the thread runs the built module; from the TypeScript sources (tests, tsx) a fresh
// thread has no loader yet, so the .mjs entry registers tsx first.
const ENTRY = new URL(import.meta.url.endsWith('.js') ? './planner-thread.js' : './planner-thread-entry.mjs', import.meta.url);

export class PlannerPool {
  private readonly slots: Slot[] = [];
  private readonly waiters: ((slot: Slot) => void)[] = [];
  private nextTaskId = 1;
  private closed = false;
  private readonly cancelGraceMs: number;

  constructor(private readonly options: PlannerPoolOptions) {
    this.cancelGraceMs = options.cancelGraceMs ?? 5_000;
  }

  /** Threads started and alive. */
  get threadCount(): number { return this.slots.length; }

  /** Runs one task on a free thread; rejects with the planner's error (by `name`) or CancelledError. */
  async run<T extends PlannerTask>(task: T, opts: { signal?: AbortSignal; onProgress?: (p: TaskProgress) => void } = {}): Promise<PlannerTaskResult<T>> {
    if (this.closed) throw new Error('planner pool is closed');
    const slot = await this.acquire();
    try {
      await slot.ready;
      return await this.runOn(slot, task, opts) as PlannerTaskResult<T>;
    } finally {
      this.release(slot);
    }
  }

  /**
   * Starts every thread and waits until each has loaded the planner, so the first jobs do not pay for
   * thread start-up and a planner that cannot load fails the worker at start rather than its jobs.
   */
  async warm(): Promise<void> {
    while (this.slots.length < this.options.size) {
      const slot = this.spawn();
      slot.busy = false;
    }
    await Promise.all(this.slots.map((s) => s.ready));
  }

  /** Terminates every thread. */
  async close(): Promise<void> {
    this.closed = true;
    await Promise.all(this.slots.splice(0).map((s) => s.worker.terminate()));
  }

  private runOn(slot: Slot, task: PlannerTask, opts: { signal?: AbortSignal; onProgress?: (p: TaskProgress) => void }): Promise<unknown> {
    const taskId = this.nextTaskId++;
    const { signal } = opts;
    return new Promise((resolve, reject) => {
      let graceTimer: NodeJS.Timeout | undefined;
      const finish = (): void => {
        slot.onMessage = null;
        slot.onExit = null;
        if (graceTimer) clearTimeout(graceTimer);
        signal?.removeEventListener('abort', onAbort);
      };
      const onAbort = (): void => {
        const reason = typeof signal?.reason === 'string' ? signal.reason : 'cancelled';
        slot.worker.postMessage({ type: 'cancel', taskId, reason } satisfies ToThread);
        graceTimer = setTimeout(() => {
          finish();
          this.replace(slot);
          reject(new FailureError({ name: 'CancelledError', code: 'CANCELLED', message: `${reason} (planner thread stopped after ${this.cancelGraceMs} ms)` }));
        }, this.cancelGraceMs);
      };
      slot.onMessage = (m) => {
        if (m.type === 'progress' && m.taskId === taskId) opts.onProgress?.(m.progress);
        else if (m.type === 'done' && m.taskId === taskId) { finish(); resolve(m.result); }
        else if (m.type === 'failed' && m.taskId === taskId) { finish(); reject(new FailureError(m.error)); }
      };
      slot.onExit = (code) => {
        finish();
        reject(new FailureError({ name: 'PlannerThreadExited', code: 'PLANNER_THREAD_EXITED', message: `planner thread exited with code ${code}` }));
      };
      if (signal?.aborted) { onAbort(); } else { signal?.addEventListener('abort', onAbort, { once: true }); }
      slot.worker.postMessage({ type: 'run', taskId, task } satisfies ToThread);
    });
  }

  private spawn(): Slot {
    const worker = new Worker(ENTRY);
    let markReady: () => void = () => {};
    let markFailed: (e: Error) => void = () => {};
    const slot: Slot = {
      worker, busy: true, onMessage: null, onExit: null,
      ready: new Promise<void>((res, rej) => { markReady = res; markFailed = rej; }),
    };
    slot.ready.catch(() => {});
    worker.on('message', (m: FromThread) => { if (m.type === 'ready') markReady(); else slot.onMessage?.(m); });
    worker.on('error', (e) => markFailed(e));
    worker.on('exit', (code) => {
      markFailed(new Error(`planner thread exited with code ${code} before it was ready`));
      const i = this.slots.indexOf(slot);
      if (i >= 0) this.slots.splice(i, 1);
      slot.onExit?.(code);
    });
    this.slots.push(slot);
    return slot;
  }

  private replace(slot: Slot): void {
    slot.onExit = null;
    const i = this.slots.indexOf(slot);
    if (i >= 0) this.slots.splice(i, 1);
    void slot.worker.terminate();
  }

  private acquire(): Promise<Slot> {
    const idle = this.slots.find((s) => !s.busy);
    if (idle) { idle.busy = true; return Promise.resolve(idle); }
    if (this.slots.length < this.options.size) return Promise.resolve(this.spawn());
    return new Promise((resolve) => this.waiters.push(resolve));
  }

  private release(slot: Slot): void {
    if (!this.slots.includes(slot)) {
      // The slot's thread was replaced: hand a fresh thread to the next waiter, if any.
      const waiter = this.waiters.shift();
      if (waiter && !this.closed) waiter(this.spawn());
      return;
    }
    const waiter = this.waiters.shift();
    if (waiter) waiter(slot); else slot.busy = false;
  }
}
