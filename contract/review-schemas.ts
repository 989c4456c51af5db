/** zod schemas of the review, history, export, verify and token routes (requests validate; responses document). */
import * as z from 'zod';
import { ENTRY_KINDS, PLAN_STATES } from './archive-types.ts';
import { freeTextSchema } from './free-text.ts';
import { ROLES } from './roles.ts';

const caveatCodeSchema = z.string().regex(/^[A-Z0-9_]{1,64}$/, { error: 'caveat codes are 1–64 of A-Z 0-9 _' });

export const reviewBodySchema = z.object({
  decision: z.enum(['approve', 'reject']),
  /** Required (non-empty) for a rejection. */
  comment: freeTextSchema({ trim: true, max: 4000, multiline: true, visible: true }).default(''),
  /** Every caveat code of the plan, to approve. */
  acknowledgedCaveatCodes: z.array(caveatCodeSchema).max(200).default([]),
}).strict().superRefine((value, ctx) => {
  if (value.decision === 'reject' && value.comment === '') {
    ctx.addIssue({ code: 'custom', path: ['comment'], message: 'a rejection needs a comment saying why' });
  }
});
export type ReviewBody = z.infer<typeof reviewBodySchema>;

export const planStateSchema = z.enum(PLAN_STATES);

export const planRecordSchema = z.object({
  planId: z.string(), jobId: z.string(), spacecraftName: z.string(), targetSetKey: z.string(), state: planStateSchema,
  converged: z.boolean(), crossCheckPassed: z.boolean(), caveatCodes: z.array(z.string()), submittedBy: z.string(),
  problemHash: z.string(), softwareVersion: z.string(), proposedAt: z.string(), proposedSequence: z.number().int(),
  decidedAt: z.string().nullable(), decidedBy: z.string().nullable(), supersededBy: z.string().nullable(), lastSequence: z.number().int(),
});

export const entrySchema = z.object({
  sequence: z.number().int(), at: z.string(), actor: z.string(), kind: z.enum(ENTRY_KINDS), planId: z.string().nullable(),
  jobId: z.string().nullable(), payload: z.record(z.string(), z.unknown()), previousHash: z.string(), hash: z.string(),
});

export const reviewResponseSchema = z.object({ plan: planRecordSchema, entry: entrySchema, notice: z.string() });

export const historyResponseSchema = z.object({
  plan: planRecordSchema,
  entries: z.array(entrySchema.extend({ hashMatches: z.boolean() })),
  notice: z.string(),
});

/** One archive entry as GET /v1/plans/:id/history returns it (with whether its stored hash recomputes). */
export type HistoryEntryView = z.infer<typeof historyResponseSchema>['entries'][number];

export const exportQuerySchema = z.object({
  toHead: z.enum(['true', 'false']).transform((v) => v === 'true').default(false),
}).strict();

export const entriesQuerySchema = z.object({
  from: z.coerce.number().int().min(1).default(1),
  limit: z.coerce.number().int().min(1).max(1000).default(1000),
}).strict();

/** `SEQ:HASH`, a head recorded earlier (as `veer verify` prints it: sequence, then the 64-hex SHA-256). */
export const expectedHeadSchema = z.string()
  .regex(/^[1-9][0-9]{0,14}:[0-9a-f]{64}$/, { error: 'must be SEQ:HASH, e.g. 42:<64 lowercase hex digits>' })
  .transform((text) => {
    const [sequence, hash] = text.split(':');
    return { sequence: Number(sequence), hash: hash ?? '' };
  });

export const verifyQuerySchema = z.object({ expectHead: expectedHeadSchema.optional() }).strict();

export const verifyResponseSchema = z.object({
  ok: z.boolean(), entriesChecked: z.number().int(), lastGoodSequence: z.number().int(), lastGoodHash: z.string(),
  head: z.object({ sequence: z.number().int(), hash: z.string() }),
  firstFailure: z.object({ sequence: z.number().int(), reason: z.string(), likelyEditedSequence: z.number().int().optional(), message: z.string(), expected: z.string().optional(), found: z.string().optional() }).nullable(),
  projectionMismatches: z.array(z.object({ planId: z.string(), field: z.string(), derived: z.unknown(), stored: z.unknown() })),
  expectedHead: z.object({ sequence: z.number().int(), hash: z.string(), found: z.string().nullable(), matches: z.boolean() }).optional(),
  durationMs: z.number(),
  verifiedBy: z.string(),
  verifiedAt: z.string(),
});

export const tokenRecordSchema = z.object({
  id: z.string(), name: z.string(), roles: z.array(z.enum(ROLES)), createdAt: z.string(), revokedAt: z.string().nullable(),
  createdBy: z.string().nullable(), revokedBy: z.string().nullable(),
});
export const tokenParamsSchema = z.object({ tokenId: z.string().regex(/^tok_[0-9a-f]{12}$/, { error: 'must look like tok_0123456789ab' }) }).strict();
