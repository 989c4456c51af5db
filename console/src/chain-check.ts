/**
 * An independent re-check, in the browser, of the archive entries the server returns: each entry's hash is
 * recomputed with WebCrypto SHA-256 (not the server's digest) following the archive's published rule
 * (archive/chain.ts: SHA-256 hex of the canonical JSON of {actor, at, jobId, kind, payloadHash, planId,
 * previousHash, sequence}, where payloadHash is SHA-256 hex of the payload's canonical JSON; the canonical
 * rule is the contract's one, contract/canonical-json.ts). Adjacent sequences are also checked to link.
 */
import { canonicalJson } from '../../contract/index.ts';
import type { HistoryEntry } from './plan-types.ts';

async function sha256Hex(text: string): Promise<string> {
  const digest = await crypto.subtle.digest('SHA-256', new TextEncoder().encode(text));
  return Array.from(new Uint8Array(digest), (b) => b.toString(16).padStart(2, '0')).join('');
}

export interface EntryCheck {
  sequence: number;
  /** Recomputed here equals the stored hash. */
  hashOk: boolean;
  /** previousHash equals the hash of entry sequence − 1, when that entry is in the list (null otherwise). */
  linkOk: boolean | null;
}

/** Null when WebCrypto is unavailable (plain HTTP to a non-local host is not a secure context). */
export async function checkEntries(entries: HistoryEntry[]): Promise<EntryCheck[] | null> {
  if (!globalThis.crypto?.subtle) return null;
  const bySequence = new Map(entries.map((e) => [e.sequence, e]));
  const out: EntryCheck[] = [];
  for (const e of entries) {
    const payloadHash = await sha256Hex(canonicalJson(e.payload));
    const hash = await sha256Hex(canonicalJson({
      sequence: e.sequence, at: e.at, actor: e.actor, kind: e.kind, planId: e.planId, jobId: e.jobId, payloadHash, previousHash: e.previousHash,
    }));
    const before = bySequence.get(e.sequence - 1);
    out.push({ sequence: e.sequence, hashOk: hash === e.hash, linkOk: before ? before.hash === e.previousHash : null });
  }
  return out;
}
