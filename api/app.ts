import express, { type Express } from 'express';
import helmet from 'helmet';
import { pinoHttp } from 'pino-http';
import type { AppDeps } from './deps.js';
import { errorHandler, notFoundHandler } from './middleware/error-handler.js';
import { requestId } from './middleware/request-id.js';
import { consoleRouter } from './routes/console.js';
import { docsRouter } from './routes/docs.js';
import { routeModules } from './routes/index.js';

/** Builds the Express app without listening, so tests drive it with supertest. */
export function createApp(deps: AppDeps): Express {
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', false);
  app.set('query parser', 'simple');

  app.use(
    pinoHttp({
      logger: deps.logger,
      genReqId: requestId,
      // Method, path and status are enough to follow a request; headers may carry credentials.
      serializers: {
        req: (req) => ({ id: req.id, method: req.method, url: req.url, remoteAddress: req.remoteAddress }),
        res: (res) => ({ statusCode: res.statusCode }),
      },
      customLogLevel: (_req, res, err) => (err || res.statusCode >= 500 ? 'error' : res.statusCode >= 400 ? 'warn' : 'info'),
    }),
  );
  // The demo serves plain HTTP on localhost; don't ask browsers to upgrade to HTTPS.
  app.use(helmet({ contentSecurityPolicy: { directives: { upgradeInsecureRequests: null } } }));
  app.use(docsRouter()); // after helmet: /docs replaces the CSP with its own
  app.use(express.json({ limit: deps.config.jsonBodyLimit, strict: true }));

  for (const module of routeModules) app.use(module.basePath, module.router(deps));
  app.use('/v1', notFoundHandler);

  const spa = consoleRouter(deps.config.consoleDir);
  if (spa) app.use(spa);

  app.use(notFoundHandler);
  app.use(errorHandler);
  return app;
}
