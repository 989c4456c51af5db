/**
 * Express middleware for bearer tokens: `authenticate` turns `Authorization: Bearer <token>` into
 * `req.identity`; `requireRoles(...)` admits only callers holding one of the listed roles. Requests without
 * a token pass `authenticate` anonymously, so only routes without `requireRoles` are open — and no route
 * that writes goes without it.
 */
import type { NextFunction, Request, RequestHandler, Response } from 'express';
import type { Identity, Role } from '../../contract/roles.ts';
import type { TokenStore } from './token-store.ts';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      /** Set by `authenticate` when a valid bearer token was presented. */
      identity?: Identity;
    }
  }
}

/** JSON error body used by the auth middleware: `{ error: { code, message } }`. */
function deny(res: Response, status: 401 | 403, code: string, message: string): void {
  if (status === 401) res.set('WWW-Authenticate', code === 'INVALID_TOKEN' ? 'Bearer error="invalid_token"' : 'Bearer');
  res.status(status).json({ error: { code, message } });
}

/** Reads the bearer token, if any, and sets `req.identity`; a malformed, unknown or revoked token is refused (401). */
export function authenticate(tokens: TokenStore): RequestHandler {
  return async (req: Request, res: Response, next: NextFunction) => {
    const header = req.get('authorization');
    if (header === undefined || header === '') { next(); return; }
    const match = /^Bearer\s+(\S+)\s*$/i.exec(header);
    if (!match) { deny(res, 401, 'INVALID_TOKEN', 'the Authorization header must be "Bearer <token>"'); return; }
    try {
      const identity = await tokens.identify(match[1]);
      if (!identity) { deny(res, 401, 'INVALID_TOKEN', 'unknown or revoked token'); return; }
      req.identity = identity;
      next();
    } catch (error) {
      next(error);
    }
  };
}

/** A handler that admits only identities holding at least one of `roles`; it carries the list for route tables. */
export type RoleGuard = RequestHandler & { readonly allowedRoles: readonly Role[] };

/** 401 without an identity, 403 without one of `roles`. */
export function requireRoles(...roles: Role[]): RoleGuard {
  if (roles.length === 0) throw new Error('requireRoles needs at least one role');
  const guard = ((req: Request, res: Response, next: NextFunction) => {
    const identity = req.identity;
    if (!identity) { deny(res, 401, 'UNAUTHENTICATED', 'a bearer token is required'); return; }
    if (!identity.roles.some((r) => roles.includes(r))) {
      deny(res, 403, 'FORBIDDEN', `this needs one of the roles: ${roles.join(', ')} (you have: ${identity.roles.join(', ') || 'none'})`);
      return;
    }
    next();
  }) as RoleGuard;
  Object.defineProperty(guard, 'allowedRoles', { value: Object.freeze([...roles]) });
  return guard;
}

/** The caller's identity; throws if a route forgot `requireRoles` (a bug, not a client error). */
export function identityOf(req: Request): Identity {
  if (!req.identity) throw new Error('identityOf: no identity on the request (route lacks requireRoles)');
  return req.identity;
}
