/**
 * The registry of route modules, mounted in this order by createApp. To add routes, write a module
 * `(routes: ApiRoutes, deps: AppDeps) => void` and add ONE line below (routes.add(...) puts it in OpenAPI
 * too; a plain express Router can be mounted with `routes.router.use(...)`).
 */
import type { AppDeps } from '../deps.ts';
import { REVIEW_ROUTE_MODULES } from '../review/route-modules.ts';
import type { ApiRoutes } from '../route-table.ts';
import { budgetRoutes } from './budgets.ts';
import { ccsdsRoutes } from './ccsds.ts';
import { jobEventRoutes } from './job-events.ts';
import { jobRoutes } from './jobs.ts';
import { planRoutes } from './plans.ts';
import { serviceRoutes } from './service.ts';

export type RouteModule = (routes: ApiRoutes, deps: AppDeps) => void;

export const ROUTE_MODULES: RouteModule[] = [
  serviceRoutes,
  jobRoutes,
  budgetRoutes,
  jobEventRoutes,
  planRoutes,
  ccsdsRoutes,
  ...REVIEW_ROUTE_MODULES,
];
