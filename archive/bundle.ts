/**
 * Plan bundles: a plan, every entry about it and its job, and the headers of the chain segment that joins
 * them (from the first of those entries to the last, or to the head), so anyone can check offline — with
 * SHA-256 and the canonical form below — that the entries are unchanged and sit in one unbroken chain.
 */
import { canonicalJson } from '../contract/canonical-json.ts';
import { entryHash, entryHeader, headerHash, payloadHash, type EntryHeader } from './chain.ts';
import { ArchiveNotFoundError } from './errors.ts';
import { applyToPlan, planFromProposal } from './projection.ts';
import { GENESIS_HASH, type ArchivablePlan, type ArchiveEntry, type PlanArchive, type PlanRecord } from '../contract/archive-types.ts';

export const BUNDLE_FORMAT = 'veer-plan-bundle';

/** How hashes in a bundle are made (also stated in every bundle, for readers without this code). */
export const HASHING_RULES = Object.freeze({
  algorithm: 'SHA-256, lowercase hex',
  canonicalisation: 'JSON with object keys sorted by UTF-16 code units at every depth, no whitespace, numbers and strings '
    + 'as ECMAScript JSON.stringify writes them, undefined members omitted (RFC 8785 compatible for this data), hashed as UTF-8',
  payloadHash: 'SHA-256 of the canonical payload',
  entryHash: 'SHA-256 of the canonical {actor, at, jobId, kind, payloadHash, planId, previousHash, sequence}',
  genesisHash: GENESIS_HASH,
});

export interface PlanBundle {
  format: typeof BUNDLE_FORMAT;
  formatVersion: 1;
  notice: string;
  exportedAt: string;
  exportedBy: string;
  hashing: typeof HASHING_RULES;
  planId: string;
  plan: ArchivablePlan;
  planRecord: PlanRecord;
  /** Every entry about the plan and its job, in sequence order, with payloads. */
  entries: ArchiveEntry[];
  /** Headers of consecutive entries covering `entries` (and up to `head` when asked). */
  chain: EntryHeader[];
  /** The archive's head when exported. */
  head: { sequence: number; hash: string };
}

export interface BundleOptions {
  notice: string;
  exportedBy: string;
  /** Carry headers up to the head (ties the plan to the archive's current head hash). @defaultValue false */
  toHead?: boolean;
  now?: () => Date;
}

/** Entries read per page while collecting chain headers (small: each page holds the loop while it is read). */
const HEADER_PAGE = 250;

/** Builds the bundle of one plan from the archive. */
export async function buildPlanBundle(archive: PlanArchive, planId: string, options: BundleOptions): Promise<PlanBundle> {
  const planRecord = await archive.getPlan(planId);
  const plan = await archive.getPlanDocument(planId);
  if (!planRecord || !plan) throw new ArchiveNotFoundError(`plan ${planId} is not in the archive`);
  const head = await archive.head();
  const entries = await archive.history(planId);
  const first = entries[0].sequence;
  const last = options.toHead ? head.sequence : entries[entries.length - 1].sequence;
  const chain: EntryHeader[] = [];
  for (let from = first; from <= last;) {
    const page = await archive.entries(from, Math.min(HEADER_PAGE, last - from + 1));
    if (page.length === 0) break;
    chain.push(...page.map(entryHeader));
    from = page[page.length - 1].sequence + 1;
    // A SQLite page is read synchronously: hand the event loop back between pages, so a bundle up to the head
    // of a large archive never holds the HTTP loop for more than one page. Only headers are kept (not payloads).
    await new Promise((resolve) => setImmediate(resolve));
  }
  return {
    format: BUNDLE_FORMAT, formatVersion: 1, notice: options.notice, exportedAt: (options.now?.() ?? new Date()).toISOString(),
    exportedBy: options.exportedBy, hashing: HASHING_RULES, planId, plan, planRecord, entries, chain, head,
  };
}

export interface BundleCheck {
  ok: boolean;
  entriesChecked: number;
  headersChecked: number;
  /** True when the chain segment ends at the recorded head. */
  reachesHead: boolean;
  firstFailure: { sequence: number | null; reason: string; message: string } | null;
  /** The head the bundle claims; an offline check cannot tell a bundle cut short, so compare it with a live verify. */
  head: { sequence: number; hash: string } | null;
}

/** What the user must still do: an offline check cannot see entries left out after the bundle's last header. */
export const BUNDLE_HEAD_ADVICE = 'an offline check cannot tell whether entries after the last chain header were left out: '
  + 'compare this head hash with the one a live `veer verify` (auditor) reports, or with a head hash you kept outside the database';

/** Plan-record fields the bundle's entries determine (re-derived and compared with planRecord). */
const DERIVED_FIELDS = ['planId', 'jobId', 'state', 'converged', 'crossCheckPassed', 'submittedBy', 'decidedBy', 'decidedAt', 'supersededBy',
  'spacecraftName', 'targetSetKey', 'problemHash', 'softwareVersion', 'proposedAt', 'proposedSequence', 'lastSequence'] as const;

/** Checks a bundle offline (no archive needed); names the first entry or header that does not match. */
export function checkPlanBundle(bundle: PlanBundle): BundleCheck {
  const head = bundle?.head && typeof bundle.head.sequence === 'number' && typeof bundle.head.hash === 'string'
    ? { sequence: bundle.head.sequence, hash: bundle.head.hash } : null;
  const fail = (sequence: number | null, reason: string, message: string, counts: [number, number]): BundleCheck =>
    ({ ok: false, entriesChecked: counts[0], headersChecked: counts[1], reachesHead: false, firstFailure: { sequence, reason, message }, head });
  if (bundle?.format !== BUNDLE_FORMAT || !Array.isArray(bundle.entries) || !Array.isArray(bundle.chain) || bundle.entries.length === 0) {
    return fail(null, 'malformed', `not a ${BUNDLE_FORMAT} with entries and chain`, [0, 0]);
  }
  const bySequence = new Map<number, EntryHeader>();
  for (let i = 0; i < bundle.chain.length; i += 1) {
    const h = bundle.chain[i];
    if (i > 0 && h.sequence !== bundle.chain[i - 1].sequence + 1) return fail(bundle.chain[i - 1].sequence + 1, 'missing-entry', `header ${bundle.chain[i - 1].sequence + 1} is missing`, [0, i]);
    if (i > 0 && h.previousHash !== bundle.chain[i - 1].hash) return fail(h.sequence, 'previous-hash-mismatch', `entry ${h.sequence} does not point at entry ${h.sequence - 1}`, [0, i]);
    if (h.sequence === 1 && h.previousHash !== GENESIS_HASH) return fail(1, 'previous-hash-mismatch', 'entry 1 does not start from the genesis hash', [0, i]);
    if (headerHash(h) !== h.hash) return fail(h.sequence, 'hash-mismatch', `header ${h.sequence} does not hash to its stored hash`, [0, i]);
    bySequence.set(h.sequence, h);
  }
  let checked = 0;
  for (const entry of bundle.entries) {
    const header = bySequence.get(entry.sequence);
    if (!header) return fail(entry.sequence, 'missing-entry', `entry ${entry.sequence} is not covered by the chain headers`, [checked, bundle.chain.length]);
    let recomputed: string;
    try { recomputed = entryHash(entry); } catch { recomputed = ''; }
    if (recomputed !== entry.hash || header.hash !== entry.hash || header.payloadHash !== payloadHash(entry.payload)) {
      return fail(entry.sequence, 'hash-mismatch', `entry ${entry.sequence}: its content does not match its hash`, [checked, bundle.chain.length]);
    }
    checked += 1;
  }
  const proposal = bundle.entries.find((e) => e.kind === 'plan-proposed' && e.planId === bundle.planId);
  if (!proposal || canonicalJson(proposal.payload.plan) !== canonicalJson(bundle.plan)) {
    return fail(proposal?.sequence ?? null, 'plan-mismatch', 'the bundled plan is not the plan in its plan-proposed entry', [checked, bundle.chain.length]);
  }
  const counts: [number, number] = [checked, bundle.chain.length];
  // Every header about this plan or its job must come with its entry: leaving out (say) a reject entry is tampering.
  const jobId = proposal.jobId;
  const included = new Set(bundle.entries.map((e) => e.sequence));
  for (const h of bundle.chain) {
    const belongs = h.planId === bundle.planId || (jobId !== null && h.jobId === jobId);
    if (belongs && !included.has(h.sequence)) {
      return fail(h.sequence, 'missing-entry', `entry ${h.sequence} (${h.kind}) is about this plan or its job but is not in the bundle`, counts);
    }
  }
  for (const e of bundle.entries) {
    if (e.planId !== bundle.planId && (jobId === null || e.jobId !== jobId)) {
      return fail(e.sequence, 'foreign-entry', `entry ${e.sequence} is about neither plan ${bundle.planId} nor its job`, counts);
    }
  }
  const mismatch = planRecordMismatch(bundle);
  if (mismatch) return fail(null, 'plan-record-mismatch', mismatch, counts);
  const lastHeader = bundle.chain[bundle.chain.length - 1];
  if (!head || head.sequence < lastHeader.sequence) {
    return fail(lastHeader.sequence, 'head-mismatch', 'the recorded head is missing or older than the last chain header', counts);
  }
  const reachesHead = lastHeader.sequence === head.sequence;
  if (reachesHead && lastHeader.hash !== head.hash) {
    return fail(lastHeader.sequence, 'head-mismatch', 'the chain ends at the head sequence but not at the head hash', counts);
  }
  return { ok: true, entriesChecked: checked, headersChecked: bundle.chain.length, reachesHead, firstFailure: null, head };
}

/** Re-derives the plan's record from the bundle's entries; describes the first field planRecord states differently. */
function planRecordMismatch(bundle: PlanBundle): string | null {
  let derived: PlanRecord | undefined;
  for (const entry of bundle.entries) {
    if (entry.planId !== bundle.planId) continue;
    if (entry.kind === 'plan-proposed') derived ??= planFromProposal(entry);
    else if (derived) derived = applyToPlan(derived, entry);
  }
  const stored = bundle.planRecord as PlanRecord | undefined;
  if (!derived || !stored || typeof stored !== 'object') return 'the bundle has no plan record to compare with its entries';
  for (const field of DERIVED_FIELDS) {
    if (derived[field] !== stored[field]) {
      return `planRecord.${field} is ${JSON.stringify(stored[field])} but the entries say ${JSON.stringify(derived[field])}`;
    }
  }
  if (canonicalJson(derived.caveatCodes) !== canonicalJson(stored.caveatCodes)) {
    return `planRecord.caveatCodes is ${JSON.stringify(stored.caveatCodes)} but the entries say ${JSON.stringify(derived.caveatCodes)}`;
  }
  return null;
}
