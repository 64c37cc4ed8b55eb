import compression from 'compression';
import express, { type Express } from 'express';
import { authenticate } from './auth/authenticate.js';
import { authorize } from './auth/authorize.js';
import type { AppDeps } from './deps.js';
import { createServices, type Services } from './services/container.js';
import { cors } from './middleware/cors.js';
import { errorHandler, notFoundHandler } from './middleware/error-handler.js';
import { COMPRESS_ABOVE_BYTES } from './middleware/compress.js';
import { jsonBodyOnly } from './middleware/json-body.js';
import { trafficMiddleware } from './middleware/rate-limit.js';
import { accessLog } from './middleware/access-log.js';
import { securityHeaders } from './middleware/security-headers.js';
import { requestMetrics } from './middleware/request-metrics.js';
import { chain, isUnder } from './middleware/chain.js';
import { metricsRouter } from './routes/metrics.js';
import { consoleRouter } from './routes/console.js';
import { docsRouter } from './routes/docs.js';
import { routeModules } from './routes/index.js';
import { BATCH_JSON_BODY_LIMIT, ESTIMATE_BATCH_PATH } from './routes/estimates-batch.js';
import { enabledModules } from './routes/route-module.js';
import { BATCH_JOB_JSON_LIMIT, BATCHES_PATH } from './routes/batches.js';
import { BILLING_WEBHOOK_LIMIT, BILLING_WEBHOOK_PATH } from './routes/billing.js';

/** Builds the Express app without listening, so tests drive it with supertest. */
export function createApp(deps: AppDeps): Express & { locals: { services: Services } } {
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', deps.config.trustProxy);
  app.set('query parser', 'simple');
  // API answers are computed per request; hashing each body for an ETag buys nothing (static files keep theirs).
  app.set('etag', false);

  const services = createServices(deps);
  app.locals.services = services;
  // Everything every request goes through, as one router layer (see chain.ts).
  app.use(
    chain(
      requestMetrics(services.metrics), // first, so the time counted is the whole chain's
      accessLog(deps.logger),
      // The demo serves plain HTTP on localhost; don't ask browsers to upgrade to HTTPS.
      securityHeaders({ contentSecurityPolicy: { directives: { upgradeInsecureRequests: null } } }),
    ),
  );
  // After helmet: /docs replaces the CSP with its own. Its paths are outside /v1, so API calls skip its router.
  const docs = docsRouter(deps.config);
  app.use((req, res, next) => (isUnder(req.path, '/v1') ? next() : docs(req, res, next)));

  // The API's own chain before the routers, in two layers on /v1 (a module this configuration
  // disables answers 404 between them, after the body is read and before any credential check).
  const bodyJson = express.json({ limit: deps.config.jsonBodyLimit, strict: true });
  // A synchronous batch carries up to 500 stairs: its route alone takes a larger body.
  const batchJson = express.json({ limit: BATCH_JSON_BODY_LIMIT, strict: true });
  // A batch job posted as JSON may carry more stairs still (files are uploaded as multipart).
  const jobJson = express.json({ limit: BATCH_JOB_JSON_LIMIT, strict: true });
  // The provider's webhook is verified over the exact bytes it signed: kept raw.
  const webhookRaw = express.raw({ type: 'application/json', limit: BILLING_WEBHOOK_LIMIT });
  const path = (req: express.Request) => req.baseUrl + req.path;
  /** One body parser per request, chosen by route as the mount points chose it (the first to parse wins). */
  const readBody: express.RequestHandler = (req, res, next) => {
    const full = path(req);
    if (isUnder(full, ESTIMATE_BATCH_PATH)) return batchJson(req, res, next);
    if (isUnder(full, BATCHES_PATH) && req.method === 'POST' && (full.length === BATCHES_PATH.length || full.length === BATCHES_PATH.length + 1)) return jobJson(req, res, next);
    if (isUnder(full, BILLING_WEBHOOK_PATH)) return webhookRaw(req, res, (err?: unknown) => (err ? next(err) : bodyJson(req, res, next)));
    bodyJson(req, res, next);
  };
  app.use(
    '/v1',
    chain(
      // API answers over 1 kB go gzip/deflate/br to clients that accept it (an estimate shrinks ~10×);
      // problem+json too. The body a client decodes is unchanged, so idempotent replays stay identical.
      compression({ threshold: COMPRESS_ABOVE_BYTES }),
      jsonBodyOnly, // 415 for other types and encodings, before the parser runs
      readBody,
    ),
  );

  // A module this configuration disables does not exist: 404 before any credential check.
  const modules = enabledModules(routeModules, deps.config);
  for (const off of routeModules.filter((m) => !modules.includes(m))) app.use(off.basePath, notFoundHandler);
  app.use(
    '/v1',
    chain(
      (_req, res, next) => {
        // API answers are per caller and may carry credentials (tokens, new keys): never cache them.
        res.setHeader('Cache-Control', 'no-store');
        next();
      },
      cors(services.allowedOrigins, services.keyCache),
      authenticate({ db: deps.database.db, pepper: deps.secrets.pepper, clock: deps.clock, ...services }),
      authorize,
      ...trafficMiddleware(deps, services), // limits, quota and metering: after authorize (needs principal and route)
    ),
  );
  // Requests outside /v1 (the metrics scrape, the console) still read JSON; API calls were read above.
  app.use(bodyJson);
  for (const module of modules) app.use(module.basePath, module.router(deps, services));
  app.use('/v1', notFoundHandler);

  app.use(metricsRouter(services.metrics, deps.config.metricsToken, { db: deps.database.db, pepper: deps.secrets.pepper, clock: deps.clock, ...services }));

  const spa = consoleRouter(deps.config.consoleDir);
  if (spa) app.use(spa);

  app.use(notFoundHandler);
  app.use(errorHandler);
  return app as Express & { locals: { services: Services } };
}
