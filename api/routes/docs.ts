import express, { Router } from 'express';
import helmet from 'helmet';
import swaggerUi from 'swagger-ui-express';
import type { Config } from '../config.js';
import { openApiDocument } from '../openapi/spec.js';

/** `/openapi.json` and the Swagger UI at `/docs`, served from node_modules (no CDN). */
export function docsRouter(config: Config): Router {
  const router = Router();
  router.get('/openapi.json', (_req, res) => {
    res.json(openApiDocument(config));
  });
  // Swagger UI injects inline styles and loads data: images; relax the CSP for /docs only.
  const docsCsp = helmet.contentSecurityPolicy({
    directives: {
      'default-src': ["'self'"],
      'script-src': ["'self'"],
      'style-src': ["'self'", "'unsafe-inline'"],
      'img-src': ["'self'", 'data:'],
      'connect-src': ["'self'"],
    },
  });
  const ui = express.Router();
  ui.use(docsCsp, swaggerUi.serveFiles(undefined, { swaggerUrl: '/openapi.json' }));
  ui.get(
    '/',
    swaggerUi.setup(undefined, {
      customSiteTitle: 'Treadwise API',
      customCss: '.swagger-ui .topbar { display: none }',
      swaggerOptions: { url: '/openapi.json', persistAuthorization: true, displayRequestDuration: true },
    }),
  );
  router.use('/docs', ui);
  return router;
}
