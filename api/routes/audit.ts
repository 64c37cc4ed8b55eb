import { Router } from 'express';
import { z } from 'zod';
import { organizationOf } from '../auth/principal.js';
import { validateQuery } from '../middleware/validate.js';
import { problemResponse } from '../openapi/document.js';
import { pageOf } from '../../shared/schemas/page.js';
import { pageQuerySchema } from '../services/pagination.js';
import type { RouteModule } from './route-module.js';

const auditQuerySchema = pageQuerySchema.extend({
  action: z
    .string()
    .regex(/^[a-z_]+\.[a-z_]+$/, 'an action like api_key.created')
    .optional()
    .meta({ description: 'Only events of this `<resource>.<verb>` action.', example: 'api_key.created' }),
});

const auditEventSchema = z
  .object({
    id: z.string(),
    action: z.string().meta({ example: 'api_key.created' }),
    actor: z.object({ type: z.enum(['user', 'api_key', 'system', 'anonymous']), id: z.string().nullable() }),
    target: z.object({ type: z.string().nullable(), id: z.string().nullable() }),
    requestId: z.string().nullable(),
    ip: z.string().nullable(),
    data: z.record(z.string(), z.unknown()).nullable(),
    createdAt: z.string(),
  })
  .meta({ id: 'AuditEvent', description: 'One entry of the audit trail. Secrets are never recorded.' });

const auditPageSchema = pageOf(auditEventSchema, 'AuditEventPage');

export const auditRoutes: RouteModule = {
  basePath: '/v1/audit-events',

  router(_deps, services) {
    const router = Router();
    router.get('/', validateQuery(auditQuerySchema), async (_req, res) => {
      res.json(await services.audit.list(organizationOf(res), res.locals.query as z.output<typeof auditQuerySchema>));
    });
    return router;
  },

  docs(registry) {
    registry.registerPath({
      method: 'get',
      path: '/v1/audit-events',
      tags: ['Audit'],
      operationId: 'listAuditEvents',
      summary: 'List audit events',
      description: 'The organisation’s audit trail, newest first, with cursor pagination (admins).',
      security: [{ bearer: [] }],
      request: { query: auditQuerySchema },
      responses: {
        200: { description: 'A page of events.', content: { 'application/json': { schema: auditPageSchema } } },
        400: problemResponse('A malformed or unknown query parameter (`validation_failed`) or cursor (`invalid_cursor`).'),
        401: problemResponse('No or invalid credentials.'),
        403: problemResponse('Needs the admin role.'),
      },
    });
  },
};
