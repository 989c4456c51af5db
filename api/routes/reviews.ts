/** Reviews: approve or reject a proposed plan (reviewer role), under the review rules of api/review. */
import type { Request, Response } from 'express';
import type * as z from 'zod';
import { identityOf } from '../auth/index.ts';
import type { AppDeps } from '../deps.ts';
import { archiveOf, sendArchiveError } from '../review/archive-http.ts';
import { reviewGuard } from '../review/review-rules.ts';
import { reviewBodySchema, reviewResponseSchema, type ReviewBody } from '../../contract/review-schemas.ts';
import type { ApiRoutes } from '../route-table.ts';
import { planParamsSchema, REVIEW_NOTICE } from '../../contract/http-schemas.ts';
import { validOf } from '../validate.ts';

export function reviewRoutes(routes: ApiRoutes, deps: AppDeps): void {
  routes.add({
    method: 'post', path: '/v1/plans/:planId/reviews', tags: ['reviews'], roles: ['reviewer'],
    summary: 'Approve or reject a proposed plan',
    description: 'A decision is final. A rejection needs a comment. Whoever submitted the job cannot approve its plan '
      + '(two-person rule). A plan that did not converge or failed its cross-check can never be approved. Approval must '
      + 'acknowledge every caveat code of the plan (missing or unknown codes are listed in the refusal). Of two concurrent '
      + 'reviews exactly one wins; the other gets 409.',
    params: planParamsSchema,
    body: reviewBodySchema,
    responses: {
      201: { description: 'Review recorded', schema: reviewResponseSchema },
      400: { description: 'Invalid body (e.g. rejection without comment)' },
      403: { description: 'Two-person rule: the submitter cannot approve' },
      404: { description: 'No such plan' },
      409: { description: 'The plan is already approved, rejected or superseded (or another review just won)' },
      422: { description: 'Plan not approvable, or caveats not acknowledged (lists missing and unknown codes)' },
    },
  }, async (req: Request, res: Response) => {
    const archive = archiveOf(deps);
    const { params, body } = validOf<z.infer<typeof planParamsSchema>, unknown, ReviewBody>(res);
    try {
      const { plan, entry } = await archive.recordReview({
        planId: params.planId, reviewer: identityOf(req).name, decision: body.decision, comment: body.comment,
        acknowledgedCaveatCodes: [...new Set(body.acknowledgedCaveatCodes)],
      }, reviewGuard);
      res.status(201).json({ plan, entry, notice: REVIEW_NOTICE });
    } catch (error) {
      if (!sendArchiveError(res, error)) throw error;
    }
  });
}
