import { existsSync } from 'node:fs';
import { join, resolve } from 'node:path';
import express, { type RequestHandler, Router } from 'express';

/** Paths the browser app never owns: API and sign-in routes 404 on their own instead of getting index.html. */
const serverOwned = /^\/(api|auth)(\/|$)/;

/**
 * Serves the built browser app from `distDir` with history-API fallback: any GET for a non-API,
 * non-sign-in path that is not a file gets index.html, so deep links like /batches/42 load the
 * app. Hashed assets are cached for a year; index.html never is (a new build shows at once).
 * Returns null when there is no build (development with the Vite dev server, or API-only tests).
 */
export function createWebAppRouter(distDir: string): Router | null {
  const root = resolve(distDir);
  const index = join(root, 'index.html');
  if (!existsSync(index)) return null;
  const router = Router();
  router.use(
    '/assets',
    express.static(join(root, 'assets'), { immutable: true, maxAge: '365d', index: false, fallthrough: false }),
  );
  router.use(express.static(root, { index: false, maxAge: 0, dotfiles: 'ignore' }));
  const fallback: RequestHandler = (req, res, next) => {
    if ((req.method !== 'GET' && req.method !== 'HEAD') || serverOwned.test(req.path)) {
      next();
      return;
    }
    res.set('cache-control', 'no-cache');
    res.sendFile(index);
  };
  router.use(fallback);
  return router;
}
