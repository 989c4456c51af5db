/**
 * One read in flight per key: callers that ask for a key while its read is still on its way share that read's
 * answer instead of sending their own. Nothing is kept once the answer arrives (the next caller reads afresh),
 * so an answer is never older than one round trip from when it was asked.
 *
 * Why: under a burst of submissions every one of them asked Redis for the same admission counts (the waiting
 * jobs of its priority, its submitter's unfinished jobs); with 50 clients most of those reads were in flight
 * together and answered the same. Sharing them sends one read per batch instead of one per submission.
 */
export class SharedReads<T> {
  private readonly inFlight = new Map<string, Promise<T>>();

  /** The answer of the read of `key` in flight, or of a new one started with `read`. A failed read fails
   * everyone who shared it, and is not kept. */
  get(key: string, read: () => Promise<T>): Promise<T> {
    const pending = this.inFlight.get(key);
    if (pending) return pending;
    const started = read().finally(() => this.inFlight.delete(key));
    this.inFlight.set(key, started);
    return started;
  }

  /** Reads in flight now (for tests). */
  get size(): number { return this.inFlight.size; }
}
