/**
 * A plan's in-process Monte Carlo samples shared between this thread and helpers that run sample ranges
 * elsewhere (SampleRangeRunner: the CLI's threads). Sample i depends on (seed, i) only, so how the ranges are
 * dealt out changes nothing: small batches go to whichever lane is free next (a helper still starting, or slowed
 * by other work on its core, simply takes fewer), and the batches merge in index order through
 * mergeSampleBatches, which refuses a gap or a duplicate. A helper's failure stops the other lanes and fails the
 * whole run with that failure: never a partial result.
 */
import { CancelledError } from '../../propagator/index.ts';
import type { DispersionSample, ManeuverPlan } from '../../contract/plan-types.ts';
import { mergeSampleBatches, sampleBatches } from '../dispersion/sample-statistics.ts';
import { runDispersionSamplesWithContext } from './monte-carlo.ts';
import type { PlanningContext } from './planning-context.ts';

/** Runs a range of a converged plan's Monte Carlo samples somewhere else (another thread), giving exactly the
 * samples runDispersionSamples gives for that range (same problem, seed and ephemeris). */
export interface SampleRangeRunner {
  /** Samples [range.firstIndex, range.firstIndex + range.count) of `plan`, in any order; `onSample` after each
   * one with the number done in this range; rejects (CancelledError) soon after `signal` fires. */
  run(plan: ManeuverPlan, range: { firstIndex: number; count: number },
    options: { signal?: AbortSignal; onSample?: (done: number) => void }): Promise<DispersionSample[]>;
}

/** Batches per lane: enough that the lanes end within about one batch of each other, few enough that the
 * hand-over per batch (one message to a thread and back) stays small against the samples. */
const BATCHES_PER_LANE = 10;

/**
 * Samples [0, count) of a converged plan with seed `seed`: this thread runs batches with `ctx`, each runner
 * others; `onSample` gets the total done so far. Resolves to the samples in index order.
 * @throws the first lane's failure (the others are stopped first); CancelledError when `signal` fires.
 */
export async function runSamplesShared(ctx: PlanningContext, plan: ManeuverPlan, runners: readonly SampleRangeRunner[],
  options: { seed: number; count: number; signal?: AbortSignal; onSample?: (done: number) => void }): Promise<DispersionSample[]> {
  const { seed, count, signal } = options;
  const lanes = 1 + runners.length;
  // Alone, this thread runs the whole range as one batch.
  const batches = sampleBatches(count, lanes === 1 ? Math.max(1, count) : Math.max(1, Math.ceil(count / (lanes * BATCHES_PER_LANE))));
  const stop = new AbortController();
  const onAbort = (): void => stop.abort(signal?.reason);
  if (signal?.aborted) onAbort(); else signal?.addEventListener('abort', onAbort, { once: true });
  let next = 0;
  let done = 0;
  let firstFailure: { error: unknown } | null = null;
  const lane = async (runBatch: (b: { firstIndex: number; count: number }, onSample: (d: number) => void) => Promise<DispersionSample[]>): Promise<DispersionSample[][]> => {
    const out: DispersionSample[][] = [];
    while (next < batches.length && !stop.signal.aborted) {
      const batch = batches[next++];
      let counted = 0;
      out.push(await runBatch(batch, (d) => { done += d - counted; counted = d; options.onSample?.(done); }));
    }
    return out;
  };
  const own = lane((b, onSample) => runDispersionSamplesWithContext(ctx, plan, { seed, ...b, signal: stop.signal, onSample }));
  const helped = runners.map((r) => lane((b, onSample) => r.run(plan, b, { signal: stop.signal, onSample })));
  const all = [own, ...helped].map((p) => p.catch((error: unknown) => {
    firstFailure ??= { error };
    stop.abort();
    return [];
  }));
  try {
    const results = await Promise.all(all);
    if (firstFailure !== null) throw (firstFailure as { error: unknown }).error;
    if (stop.signal.aborted) throw new CancelledError(`dispersion cancelled after ${done} of ${count} samples`);
    return mergeSampleBatches(results.flat(), { firstIndex: 0, count });
  } finally {
    signal?.removeEventListener('abort', onAbort);
  }
}
