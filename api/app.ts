/**
 * createApp(deps): the express 5 application. Order: request id + log + metrics → helmet → JSON body (size
 * limit → 413) → per-address limit of refused tokens → bearer authentication → per-token rate limit on /v1 →
 * routes (ROUTE_MODULES) → 404 → errors.
 */
import { randomUUID } from 'node:crypto';
import express, { type Express, type RequestHandler } from 'express';
import { rateLimit, ipKeyGenerator } from 'express-rate-limit';
import helmet from 'helmet';
import { authenticate, refusedTokenLimit } from './auth/index.ts';
import type { AppDeps } from './deps.ts';
import { errorHandler, notFound, sendError } from './errors.ts';
import { ApiRoutes } from './route-table.ts';
import { ROUTE_MODULES } from './routes/index.ts';
import { consoleRouter } from '../console/index.ts';

function requestLog(deps: AppDeps): RequestHandler {
  return (req, res, next) => {
    const started = process.hrtime.bigint();
    const incoming = req.get('x-request-id');
    const requestId = incoming && /^[A-Za-z0-9._-]{1,64}$/.test(incoming) ? incoming : randomUUID();
    res.locals.requestId = requestId;
    res.set('X-Request-Id', requestId);
    res.on('finish', () => {
      const seconds = Number(process.hrtime.bigint() - started) / 1e9;
      const route = req.route?.path ? `${req.baseUrl}${String(req.route.path)}` : 'unmatched';
      deps.metrics.httpDuration.observe({ method: req.method, route, status: String(res.statusCode) }, seconds);
      deps.logger.info({
        requestId, method: req.method, route, status: res.statusCode, ms: Math.round(seconds * 1e4) / 10,
        identity: req.identity?.name,
      }, 'request');
    });
    next();
  };
}

/** Builds the application; the caller owns `deps` (and closes them). */
export function createApp(deps: AppDeps): Express {
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', deps.limits.trustProxy);
  app.use(requestLog(deps));
  app.use(helmet());
  app.use(express.json({ limit: deps.limits.bodyLimitBytes }));
  const { authFailureLimitMax: max, rateLimitWindowMs: windowMs } = deps.limits;
  app.use(refusedTokenLimit({
    max, windowMs,
    refuse: (_req, res, retryAfterS) => {
      res.set('Retry-After', String(retryAfterS));
      sendError(res, 429, 'TOO_MANY_REFUSED_TOKENS', `more than ${max} requests with a refused token from this address in ${windowMs / 1000} s; retry later`);
    },
  }));
  app.use(authenticate(deps.tokens));
  app.use('/v1', rateLimit({
    windowMs: deps.limits.rateLimitWindowMs,
    limit: deps.limits.rateLimitMax,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => (req.identity ? `token:${req.identity.tokenId}` : `ip:${ipKeyGenerator(req.ip ?? '0.0.0.0')}`),
    handler: (_req, res) => sendError(res, 429, 'RATE_LIMITED',
      `more than ${deps.limits.rateLimitMax} requests in ${deps.limits.rateLimitWindowMs / 1000} s for this token; retry later`),
  }));
  const routes = new ApiRoutes();
  for (const mount of ROUTE_MODULES) mount(routes, deps);
  app.use(routes.router);
  app.use(consoleRouter()); // the browser console (console/dist) and GET /console/session
  app.use(notFound);
  app.use(errorHandler(deps.logger));
  return app;
}
