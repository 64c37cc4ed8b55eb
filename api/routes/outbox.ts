import { Router } from 'express';
import { outboxPageSchema } from '../../shared/schemas/accounts.js';
import type { Config } from '../config.js';
import { validateQuery } from '../middleware/validate.js';
import { problemResponse } from '../openapi/document.js';
import { pageQuerySchema, type PageQuery } from '../services/pagination.js';
import type { RouteModule } from './route-module.js';

/**
 * The reader of the local mail sink. It exists only while no SMTP server is configured: real
 * messages carry reset and invitation tokens, and must never be readable through the API.
 */
export function outboxEnabled(config: Pick<Config, 'smtpUrl'>): boolean {
  return !config.smtpUrl;
}

export const outboxRoutes: RouteModule & { enabled: typeof outboxEnabled } = {
  basePath: '/v1/dev/outbox',
  enabled: outboxEnabled,

  router(deps, services) {
    const router = Router();
    // Mount nothing with SMTP, even if the module list was not filtered by `enabled`.
    if (!outboxEnabled(deps.config)) return router;
    router.get('/', validateQuery(pageQuerySchema), async (_req, res) => {
      res.json(await services.mailer.outbox(res.locals.query as PageQuery));
    });
    return router;
  },

  docs(registry) {
    registry.registerPath({
      method: 'get',
      path: '/v1/dev/outbox',
      tags: ['Development'],
      operationId: 'readOutbox',
      summary: 'Read the local mail sink',
      description:
        'Operator only. Every message the server sent while no SMTP server is configured (invitations, password resets, ' +
        'quota and key notices), newest first, with cursor pagination. The route does not exist when SMTP_URL is set.',
      security: [{ bearer: [] }],
      request: { query: pageQuerySchema },
      responses: {
        200: { description: 'A page of messages.', content: { 'application/json': { schema: outboxPageSchema } } },
        400: problemResponse('Invalid limit or cursor.'),
        401: problemResponse('No or invalid credentials.'),
        403: problemResponse('Not the operator.'),
      },
    });
  },
};
