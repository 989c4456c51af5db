/**
 * The per-address limit on refused bearer tokens: only answers 401 count; past `max` of them in a window, every
 * request from that address that carries a token is refused (the caller's `refuse`) until the window ends.
 *
 * Why not express-rate-limit with skipSuccessfulRequests: it counts every request when it arrives and takes
 * the successful ones back when they finish, so `max` requests in flight at once from one address (50 clients
 * behind one proxy), or as many aborted before their answer, already tripped the limit with valid tokens.
 */
import type { Request, RequestHandler, Response } from 'express';
import { ipKeyGenerator } from 'express-rate-limit';

export interface RefusedTokenLimitOptions {
  /** Refused tokens per window per client address before the address is refused. */
  max: number;
  windowMs: number;
  /** Answers a request from an address past the limit; `retryAfterS` is when its window ends, s (≥ 1). */
  refuse: (req: Request, res: Response, retryAfterS: number) => void;
}

/** Addresses kept before expired windows are swept (bounded memory under many guessing addresses). */
const SWEEP_AT = 10_000;

export function refusedTokenLimit(opts: RefusedTokenLimitOptions): RequestHandler {
  const windows = new Map<string, { refused: number; endsAt: number }>();
  const sweep = (now: number): void => {
    for (const [key, w] of windows) if (w.endsAt <= now) windows.delete(key);
  };
  return (req, res, next) => {
    if (!req.get('authorization')) { next(); return; }
    const key = ipKeyGenerator(req.ip ?? '0.0.0.0');
    const now = Date.now();
    const open = windows.get(key);
    if (open && open.endsAt > now && open.refused >= opts.max) {
      opts.refuse(req, res, Math.max(1, Math.ceil((open.endsAt - now) / 1000)));
      return;
    }
    res.once('finish', () => {
      if (res.statusCode !== 401) return;
      const at = Date.now();
      const w = windows.get(key);
      if (w && w.endsAt > at) { w.refused++; return; }
      if (windows.size >= SWEEP_AT) sweep(at);
      windows.set(key, { refused: 1, endsAt: at + opts.windowMs });
    });
    next();
  };
}
