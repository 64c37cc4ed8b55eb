import cluster from 'node:cluster';
import { createHash, timingSafeEqual } from 'node:crypto';
import { Router, type RequestHandler } from 'express';
import type { AuthenticateDeps } from '../auth/authenticate.js';
import { authenticate } from '../auth/authenticate.js';
import { principalOf } from '../auth/principal.js';
import { clusterMetricsText, OPENMETRICS_CONTENT_TYPE } from '../metrics/cluster-metrics.js';
import type { Metrics } from '../metrics/metrics.js';
import { problemResponse, type DocsRegistrar } from '../openapi/document.js';
import { z } from 'zod';
import { problems } from '../problem.js';

export const METRICS_PATH = '/metrics';

const digest = (text: string) => createHash('sha256').update(text).digest();

/**
 * GET /metrics: OpenMetrics text for a scraper holding METRICS_TOKEN (`Authorization: Bearer`), or
 * for the platform operator's console session; anyone else gets the usual 401/403. It sits outside
 * /v1 (scrapers expect the bare path) and so outside the policy table; this is its whole policy.
 */
export function metricsRouter(metrics: Metrics, scrapeToken: string | undefined, auth: AuthenticateDeps): Router {
  const expected = scrapeToken ? digest(scrapeToken) : undefined;
  const scraper: RequestHandler = (req, res, next) => {
    const bearer = /^Bearer (\S+)$/i.exec(req.headers.authorization ?? '')?.[1];
    // Compared as digests, in constant time: the token's length and content never leak by timing.
    res.locals.scraper = Boolean(expected && bearer && timingSafeEqual(digest(bearer), expected));
    next();
  };
  const identify = authenticate(auth);
  const operatorUnlessScraper: RequestHandler = async (req, res, next) => {
    if (res.locals.scraper) return next();
    await new Promise<void>((resolve, reject) => {
      Promise.resolve(identify(req, res, (err?: unknown) => (err ? reject(err) : resolve()))).catch(reject);
    });
    const p = principalOf(res);
    if (p.type === 'anonymous') throw problems.unauthenticated('Send the metrics scrape token or an operator’s access token.');
    if (p.type !== 'user' || !p.operator) throw problems.forbidden('Only the metrics scraper and the platform operator may read metrics.');
    next();
  };
  const router = Router();
  router.get(METRICS_PATH, scraper, operatorUnlessScraper, async (_req, res) => {
    const body = cluster.isWorker ? await clusterMetricsText() : (await metrics.text()).body;
    res.setHeader('Cache-Control', 'no-store');
    res.type(OPENMETRICS_CONTENT_TYPE).send(body);
  });
  return router;
}

export const metricsDocs: DocsRegistrar = (registry) => {
  registry.registerPath({
    method: 'get',
    path: METRICS_PATH,
    tags: ['Operations'],
    operationId: 'getMetrics',
    security: [{ bearer: [] }],
    summary: 'Metrics for a scraper',
    description:
      'OpenMetrics text (prom-client): requests by route pattern and status, latency histograms by route and status class, ' +
      'time in the sizing engine, calls refused by a limit, quota units used, and process metrics (CPU, memory, event-loop lag, GC). ' +
      'Under WEB_CONCURRENCY the figures are summed over every worker. Send the `METRICS_TOKEN` the server was started with as ' +
      '`Authorization: Bearer …`, or an operator’s access token; nobody else may read it.',
    responses: {
      200: {
        description: 'The metrics, ending with `# EOF`.',
        content: { 'application/openmetrics-text; version=1.0.0; charset=utf-8': { schema: z.string().meta({ example: '# TYPE treadwise_http_requests counter\n# EOF\n' }) } },
      },
      400: problemResponse('A malformed request, e.g. two Authorization headers (`duplicate_authorization`).'),
      401: problemResponse('No scrape token or access token, or one that is not valid.'),
      403: problemResponse('A credential that is neither the scrape token nor an operator’s.'),
    },
  });
};
