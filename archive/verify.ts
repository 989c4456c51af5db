/** Verification of a whole archive from a consistent snapshot: the chain, the head, and the projection. */
import { ChainVerifier } from './chain.ts';
import { ProjectionDeriver } from './projection.ts';
import type { ArchiveEntry, ExpectedHeadCheck, PlanRecord, VerifyOptions, VerifyReport } from '../contract/archive-types.ts';

/** A consistent (snapshot) view of a store, for verification. */
export interface VerifySource {
  head(): Promise<{ sequence: number; hash: string }>;
  /** Entries with sequence >= from, in order, at most `limit`. */
  page(from: number, limit: number): Promise<ArchiveEntry[]>;
  plans(): Promise<PlanRecord[]>;
}

const PAGE = 2000;

/**
 * Walks the chain page by page; names the first entry that does not match; compares the projection; with
 * `expectHead`, checks that the entry recorded then is still in the chain, unchanged.
 */
export async function verifySource(source: VerifySource, options: VerifyOptions = {}): Promise<VerifyReport> {
  const started = performance.now();
  const head = await source.head();
  const chain = new ChainVerifier();
  const expect = options.expectHead;
  let found: string | null = null;
  const deriver = new ProjectionDeriver();
  let from = 1;
  for (;;) {
    const page = await source.page(from, PAGE);
    if (page.length === 0) break;
    const fine = chain.feed(page);
    deriver.feed(page);
    if (expect) found ??= page.find((e) => e.sequence === expect.sequence)?.hash ?? null;
    if (!fine) break;
    from = page[page.length - 1].sequence + 1;
    if (page.length < PAGE) break;
  }
  chain.finish(head);
  const result = chain.result;
  const projectionMismatches = result.firstFailure ? [] : deriver.compare(await source.plans());
  const expectedHead: ExpectedHeadCheck | undefined = expect
    ? { ...expect, found, matches: found === expect.hash && result.lastGoodSequence >= expect.sequence } : undefined;
  return {
    ok: result.firstFailure === null && projectionMismatches.length === 0 && (expectedHead?.matches ?? true),
    ...(expectedHead ? { expectedHead } : {}),
    entriesChecked: result.entriesChecked,
    lastGoodSequence: result.lastGoodSequence,
    lastGoodHash: result.lastGoodHash,
    head,
    firstFailure: result.firstFailure,
    projectionMismatches,
    durationMs: performance.now() - started,
  };
}

/** Parses a stored payload; text that is not JSON becomes a marker object so the hash check fails visibly. */
export function parsePayload(text: string): Record<string, unknown> {
  try {
    const value = JSON.parse(text) as unknown;
    return value !== null && typeof value === 'object' && !Array.isArray(value) ? value as Record<string, unknown> : { unparseablePayload: text };
  } catch {
    return { unparseablePayload: text };
  }
}
