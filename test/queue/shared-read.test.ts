/**
 * SharedReads: one read in flight per key, shared by the callers that ask meanwhile, kept no longer than that
 * (a single-flight cache with no lifetime: common practice for coalescing identical concurrent reads).
 */
import { describe, expect, it } from 'vitest';
import { SharedReads } from '../../queue/producer/shared-read.ts';

/** A read whose answer the test gives when it likes. */
function pendingRead<T>(): { read: () => Promise<T>; calls: () => number; answer: (v: T) => void; fail: (e: Error) => void } {
  let calls = 0;
  let settle: { answer: (v: T) => void; fail: (e: Error) => void } | undefined;
  return {
    read: () => { calls++; return new Promise<T>((answer, fail) => { settle = { answer, fail }; }); },
    calls: () => calls,
    answer: (v) => settle?.answer(v),
    fail: (e) => settle?.fail(e),
  };
}

describe('SharedReads', () => {
  describe('when callers ask for one key while its read is in flight', () => {
    it('should start one read and give every caller its answer', async () => {
      const reads = new SharedReads<number>();
      const r = pendingRead<number>();
      const asked = [reads.get('a', r.read), reads.get('a', r.read), reads.get('a', r.read)];
      r.answer(7);
      expect(await Promise.all(asked)).toEqual([7, 7, 7]);
      expect(r.calls()).toBe(1);
    });
  });

  describe('when a read has answered', () => {
    it('should keep nothing: the next caller starts a new read', async () => {
      const reads = new SharedReads<number>();
      const r = pendingRead<number>();
      const first = reads.get('a', r.read);
      r.answer(1);
      await first;
      expect(reads.size).toBe(0);
      const second = reads.get('a', r.read);
      r.answer(2);
      expect(await second).toBe(2);
      expect(r.calls()).toBe(2);
    });
  });

  describe('when keys differ', () => {
    it('should read each key on its own', async () => {
      const reads = new SharedReads<string>();
      const a = pendingRead<string>();
      const b = pendingRead<string>();
      const asked = [reads.get('a', a.read), reads.get('b', b.read)];
      a.answer('A');
      b.answer('B');
      expect(await Promise.all(asked)).toEqual(['A', 'B']);
    });
  });

  describe('when the shared read fails', () => {
    it('should fail every caller that shared it and not keep the failure', async () => {
      const reads = new SharedReads<number>();
      const r = pendingRead<number>();
      const asked = [reads.get('a', r.read), reads.get('a', r.read)];
      r.fail(new Error('redis went away'));
      for (const p of asked) await expect(p).rejects.toThrow('redis went away');
      expect(reads.size).toBe(0);
      const again = reads.get('a', r.read);
      r.answer(3);
      expect(await again).toBe(3);
    });
  });
});
