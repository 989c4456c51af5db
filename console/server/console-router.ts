/**
 * Serves the built console (console/dist, from `npm run console:build`) under /console/, and
 * GET /console/session: the name and roles of the bearer token presented (the console's sign-in check).
 * Mounted by api/app.ts after authentication, so `req.identity` is already set when a valid token came.
 */
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import express, { Router, type Request, type Response } from 'express';

// console/dist from console/server/ (sources), or from dist/console/server/ (compiled).
/** Where the built console lives (`npm run build` or `npm run console:build` writes it; `npm ci` builds it). */
export const CONSOLE_DIST_DIR = fileURLToPath(new URL(import.meta.url.endsWith('.js') ? '../../../console/dist' : '../dist', import.meta.url));

export interface ConsoleRouterOptions {
  /** Folder of the built assets. @defaultValue CONSOLE_DIST_DIR (console/dist) */
  distDir?: string;
}

export function consoleRouter(options: ConsoleRouterOptions = {}): Router {
  const distDir = options.distDir ?? CONSOLE_DIST_DIR;
  const router = Router();
  router.get('/console/session', (req: Request, res: Response) => {
    res.set('Cache-Control', 'no-store');
    if (!req.identity) {
      res.set('WWW-Authenticate', 'Bearer').status(401).json({ error: { code: 'UNAUTHENTICATED', message: 'a valid bearer token is required' } });
      return;
    }
    res.json({ name: req.identity.name, roles: req.identity.roles });
  });
  router.use('/console', (req, res, next) => {
    if (existsSync(distDir)) { next(); return; }
    res.status(503).type('text/plain').send('The console is not built: run `npm run build` (or `npm run console:build`).\n');
  });
  // Hashed asset names never change content; index.html must be re-read so a new build is picked up.
  router.use('/console', express.static(distDir, {
    index: 'index.html',
    setHeaders(res, path) {
      res.set('Cache-Control', path.includes('/assets/') ? 'public, max-age=31536000, immutable' : 'no-cache');
    },
  }));
  return router;
}
