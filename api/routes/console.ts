import { existsSync } from 'node:fs';
import path from 'node:path';
import express, { Router } from 'express';

const FILE_EXTENSION = /\.[A-Za-z0-9]{1,10}$/;

/**
 * Serves the built Angular console with the SPA fallback: any GET outside the API that
 * accepts HTML and does not name a file gets index.html, so deep links survive a reload.
 */
export function consoleRouter(consoleDir: string): Router | undefined {
  const root = path.resolve(consoleDir);
  const index = path.join(root, 'index.html');
  if (!existsSync(index)) return undefined;
  const router = Router();
  router.use(express.static(root, { index: false, maxAge: '1h' }));
  router.get('/{*splat}', (req, res, next) => {
    // A path ending in a file extension asks for a file; express.static above had none by that
    // name, so it is a 404, not the page (console deep links never end in an extension).
    if (req.path.startsWith('/v1/') || FILE_EXTENSION.test(req.path) || !req.accepts('html')) return next();
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(index);
  });
  return router;
}
