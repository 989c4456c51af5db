/**
 * The hash chain: how an entry's hash is computed, and a streaming verifier that walks entries in
 * sequence order and stops at the first one that does not match.
 */
import { hash } from 'node:crypto';
import { canonicalJson } from '../contract/canonical-json.ts';
import { ENTRY_KINDS, GENESIS_HASH, type ArchiveEntry, type VerifyFailure } from '../contract/archive-types.ts';

/** SHA-256 of the UTF-8 bytes of `text`, as 64 lowercase hex digits (one-shot crypto.hash: about half the CPU of
 * createHash().update().digest() on the short texts hashed per request). */
export function sha256Hex(text: string): string {
  return hash('sha256', text, 'hex');
}

/** SHA-256 hex of the canonical JSON of `value` (contract/canonical-json.ts). */
export function canonicalHash(value: unknown): string {
  return sha256Hex(canonicalJson(value));
}

/** An entry before its hash is known. */
export type UnhashedEntry = Omit<ArchiveEntry, 'hash'>;

/**
 * The hash of an entry's payload: SHA-256 hex of its canonical JSON. The entry hash covers this digest rather
 * than the payload itself, so a chain segment can be checked from entry headers alone (an export bundle
 * carries other plans' entries as headers, without their content).
 */
export function payloadHash(payload: Record<string, unknown>): string {
  return sha256Hex(canonicalJson(payload));
}

/** An entry without its payload: enough to recompute its hash and check its link. */
export interface EntryHeader {
  sequence: number; at: string; actor: string; kind: string; planId: string | null; jobId: string | null;
  payloadHash: string; previousHash: string; hash: string;
}

/**
 * SHA-256 hex over the canonical JSON (keys sorted, no whitespace; see canonical-json.ts) of
 * `{actor, at, jobId, kind, payloadHash, planId, previousHash, sequence}`.
 */
export function headerHash(header: Omit<EntryHeader, 'hash'>): string {
  const { sequence, at, actor, kind, planId, jobId, previousHash } = header;
  return sha256Hex(canonicalJson({ sequence, at, actor, kind, planId, jobId, payloadHash: header.payloadHash, previousHash }));
}

/** The entry's hash (see headerHash). */
export function entryHash(entry: UnhashedEntry): string {
  return headerHash({ ...entry, payloadHash: payloadHash(entry.payload) });
}

/** The header of an entry (its payload replaced by the payload's hash). */
export function entryHeader(entry: ArchiveEntry): EntryHeader {
  const { sequence, at, actor, kind, planId, jobId, previousHash, hash } = entry;
  return { sequence, at, actor, kind, planId, jobId, payloadHash: payloadHash(entry.payload), previousHash, hash };
}

/** Completes an entry with its hash. */
export function sealEntry(entry: UnhashedEntry): ArchiveEntry {
  return { ...entry, hash: entryHash(entry) };
}

const HEX64 = /^[0-9a-f]{64}$/;

/**
 * Checks entries handed to it in sequence order (page by page, so a long chain never sits in memory).
 * After the first failure it ignores the rest.
 */
export class ChainVerifier {
  private expectedSequence = 1;
  private previousHash = GENESIS_HASH;
  private checked = 0;
  private failure: VerifyFailure | null = null;

  /** Feeds the next entries; returns false once a failure has been found. */
  feed(entries: readonly ArchiveEntry[]): boolean {
    for (const entry of entries) {
      if (this.failure) return false;
      this.failure = this.check(entry);
      if (this.failure) return false;
      this.checked += 1;
      this.expectedSequence = entry.sequence + 1;
      this.previousHash = entry.hash;
    }
    return this.failure === null;
  }

  /** Compares the end of the chain with the head the store records (catches a removed tail). */
  finish(head: { sequence: number; hash: string }): void {
    if (this.failure) return;
    const last = this.expectedSequence - 1;
    if (head.sequence > last) {
      this.failure = { sequence: last + 1, reason: 'missing-entry',
        message: `the store's head is entry ${head.sequence} but the chain ends at ${last}: entries ${last + 1}..${head.sequence} are missing` };
    } else if (head.sequence !== last || head.hash !== this.previousHash) {
      this.failure = { sequence: last, reason: 'head-mismatch', expected: head.hash, found: this.previousHash,
        message: `the store's head (entry ${head.sequence}) does not match the last entry of the chain (${last})` };
    }
  }

  get result(): { entriesChecked: number; lastGoodSequence: number; lastGoodHash: string; firstFailure: VerifyFailure | null } {
    return { entriesChecked: this.checked, lastGoodSequence: this.expectedSequence - 1, lastGoodHash: this.previousHash,
      firstFailure: this.failure };
  }

  private check(entry: ArchiveEntry): VerifyFailure | null {
    if (entry.sequence > this.expectedSequence) {
      return { sequence: this.expectedSequence, reason: 'missing-entry',
        message: `entry ${this.expectedSequence} is missing (the next stored entry is ${entry.sequence})` };
    }
    if (entry.sequence !== this.expectedSequence) {
      return { sequence: entry.sequence, reason: 'malformed', message: `entry ${entry.sequence} is out of order (expected ${this.expectedSequence})` };
    }
    if (!ENTRY_KINDS.includes(entry.kind) || !HEX64.test(entry.hash) || Number.isNaN(Date.parse(entry.at))) {
      return { sequence: entry.sequence, reason: 'malformed', message: `entry ${entry.sequence} has an unknown kind, a malformed hash or time` };
    }
    if (entry.previousHash !== this.previousHash) {
      // Entry n−1 hashed correctly on its own, so the likely edit is n−1 changed and re-hashed to hide it.
      const suspect = entry.sequence - 1;
      return { sequence: entry.sequence, reason: 'previous-hash-mismatch', expected: this.previousHash, found: entry.previousHash,
        likelyEditedSequence: suspect,
        message: `entry ${entry.sequence} does not point at the hash of entry ${suspect}: entry ${suspect} was most likely edited and `
          + `its hash recomputed (or entry ${entry.sequence}'s link was changed); the mismatch was seen at entry ${entry.sequence}` };
    }
    let recomputed: string;
    try {
      recomputed = entryHash(entry);
    } catch (error) {
      return { sequence: entry.sequence, reason: 'malformed', message: `entry ${entry.sequence} cannot be serialised: ${(error as Error).message}` };
    }
    if (recomputed !== entry.hash) {
      return { sequence: entry.sequence, reason: 'hash-mismatch', expected: recomputed, found: entry.hash,
        message: `entry ${entry.sequence}: its content does not hash to its stored hash (changed after it was written)` };
    }
    return null;
  }
}
