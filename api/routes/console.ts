import { existsSync } from 'node:fs';
import path from 'node:path';
import express, { Router } from 'express';

/**
 * Serves the built Angular console with the SPA fallback: any GET outside the API that
 * accepts HTML gets index.html, so deep links survive a reload.
 */
export function consoleRouter(consoleDir: string): Router | undefined {
  const root = path.resolve(consoleDir);
  const index = path.join(root, 'index.html');
  if (!existsSync(index)) return undefined;
  const router = Router();
  router.use(express.static(root, { index: false, maxAge: '1h' }));
  router.get('/{*splat}', (req, res, next) => {
    if (req.path.startsWith('/v1/') || !req.accepts('html')) return next();
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(index);
  });
  return router;
}
