/** The route modules of reviews, history, export, verification and tokens, for api/routes/index.ts. */
import type { AppDeps } from '../deps.ts';
import type { ApiRoutes } from '../route-table.ts';
import { exportRoutes } from '../routes/export.ts';
import { historyRoutes } from '../routes/history.ts';
import { reviewRoutes } from '../routes/reviews.ts';
import { tokenRoutes } from '../routes/tokens.ts';
import { verifyRoutes } from '../routes/verify.ts';

export const REVIEW_ROUTE_MODULES: ReadonlyArray<(routes: ApiRoutes, deps: AppDeps) => void> = [
  reviewRoutes, historyRoutes, exportRoutes, verifyRoutes, tokenRoutes,
];
