/** Public face of api/: other rooms import from here only. */
export { createApp } from './app.ts';
export { startApiServer, type ApiServer } from './server.ts';
export { loadApiConfig, apiEnvSchema, type ApiConfig } from './config.ts';
export { DEFAULT_LIMITS, type AppDeps, type AppLimits } from './deps.ts';
export { ApiRoutes, type RouteSpec, type ResponseSpec } from './route-table.ts';
export { ROUTE_MODULES, type RouteModule } from './routes/index.ts';
export { buildOpenApi } from './openapi.ts';
export { ServiceMetrics } from './metrics.ts';
export { HttpError, errorHandler, notFound, sendError, type FieldIssue } from './errors.ts';
export { validate, validOf, zodIssues } from './validate.ts';
export { ArchivePlanReader, JobResultPlanReader, type PlanReader, type PlanSummary } from './plan-reader.ts';
export {
  REVIEW_NOTICE, jobStatusSchema, submitResponseSchema, planSummarySchema, planResponseSchema, jobRequestSchema,
} from '../contract/http-schemas.ts';
