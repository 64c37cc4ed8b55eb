import { Router } from 'express';
import { healthSchema, readinessSchema, type Health, type Readiness } from '../../shared/schemas/health.js';
import { ENGINE_VERSION } from '../../shared/sizing/version.js';
import { problemResponse } from '../openapi/document.js';
import { problems } from '../problem.js';
import { API_VERSION } from '../version.js';
import type { RouteModule } from './route-module.js';

export const healthRoutes: RouteModule = {
  basePath: '/v1/health',

  router({ database, clock }) {
    const router = Router();
    router.get('/', (_req, res) => {
      const body: Health = { status: 'ok', service: 'treadwise-api', version: API_VERSION, engineVersion: ENGINE_VERSION, time: clock().toISOString() };
      res.json(body);
    });
    router.get('/ready', async (req, res) => {
      try {
        await database.ping();
      } catch (err) {
        req.log.warn({ err }, 'database not reachable');
        throw problems.notReady('The database is not reachable.');
      }
      const body: Readiness = { status: 'ready', checks: { database: 'ok' } };
      res.json(body);
    });
    return router;
  },

  docs(registry) {
    registry.registerPath({
      method: 'get',
      path: '/v1/health',
      tags: ['Health'],
      operationId: 'getLiveness',
      security: [], // public: no credentials are read
      summary: 'Liveness',
      description: 'Answers while the process is up. Needs no credentials; use it for load-balancer liveness probes.',
      responses: {
        200: { description: 'The API is up.', content: { 'application/json': { schema: healthSchema } } },
        400: problemResponse('A malformed request, e.g. two Authorization headers (`duplicate_authorization`).'),
      },
    });
    registry.registerPath({
      method: 'get',
      path: '/v1/health/ready',
      tags: ['Health'],
      operationId: 'getReadiness',
      security: [], // public: no credentials are read
      summary: 'Readiness',
      description: 'Answers 200 when the database is reachable, 503 otherwise. Use it for readiness probes.',
      responses: {
        200: { description: 'Ready to serve.', content: { 'application/json': { schema: readinessSchema } } },
        400: problemResponse('A malformed request, e.g. two Authorization headers (`duplicate_authorization`).'),
        503: problemResponse('The database is not reachable.'),
      },
    });
  },
};
