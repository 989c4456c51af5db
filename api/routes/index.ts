/**
 * The registry of route modules, mounted in this order by createApp. To add routes, write a module
 * `(routes: ApiRoutes, deps: AppDeps) => void` and add ONE line below (routes.add(...) puts it in OpenAPI
 * too; a plain express Router can be mounted with `routes.router.use(...)`).
 */
import type { AppDeps } from '../deps.ts';
import type { ApiRoutes } from '../route-table.ts';
import { budgetRoutes } from './budgets.ts';
import { ccsdsRoutes } from './ccsds.ts';
import { ephemerisRoutes } from './ephemerides.ts';
import { exportRoutes } from './export.ts';
import { historyRoutes } from './history.ts';
import { jobEventRoutes } from './job-events.ts';
import { jobRoutes } from './jobs.ts';
import { planRoutes } from './plans.ts';
import { reviewRoutes } from './reviews.ts';
import { serviceRoutes } from './service.ts';
import { tokenRoutes } from './tokens.ts';
import { verifyRoutes } from './verify.ts';

export type RouteModule = (routes: ApiRoutes, deps: AppDeps) => void;

/** The routes of reviews, history, export, verification and tokens (the archive's side of the API). */
export const REVIEW_ROUTE_MODULES: readonly RouteModule[] = [
  reviewRoutes, historyRoutes, exportRoutes, verifyRoutes, tokenRoutes,
];

export const ROUTE_MODULES: RouteModule[] = [
  serviceRoutes,
  jobRoutes,
  budgetRoutes,
  jobEventRoutes,
  planRoutes,
  ccsdsRoutes,
  ephemerisRoutes,
  ...REVIEW_ROUTE_MODULES,
];
