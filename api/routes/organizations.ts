import { Router, type Request, type Response } from 'express';
import { z } from 'zod';
import {
  createOrganizationRequestSchema,
  organizationPageSchema,
  createdOrganizationSchema,
  organizationSchema,
  updateOrganizationRequestSchema,
  type CreateOrganizationRequest,
  type UpdateOrganizationRequest,
} from '../../shared/schemas/accounts.js';
import { principalOf } from '../auth/principal.js';
import { idempotent } from '../middleware/idempotency.js';
import { validateBody, validateQuery } from '../middleware/validate.js';
import { problemResponse } from '../openapi/document.js';
import { problems } from '../problem.js';
import { auditContext } from '../services/audit.js';
import type { OrganizationScope } from '../services/organizations.js';
import { pageQuerySchema, type PageQuery } from '../services/pagination.js';
import type { RouteModule } from './route-module.js';

/** The operator sees every organisation, a user their own, an API key the one it belongs to. */
function scopeOf(res: Response): OrganizationScope {
  const p = principalOf(res);
  if (p.type === 'user') return p.operator ? { all: true } : { userId: p.userId };
  if (p.type === 'api_key') return { organizationId: p.organizationId };
  throw problems.unauthenticated(); // authorize() lets no anonymous caller this far
}

export const organizationRoutes: RouteModule = {
  basePath: '/v1/organizations',

  router(deps, services) {
    const router = Router();
    const { organizations, audit } = services;
    const idParam = (req: Request) => String(req.params.id);

    router.get('/', validateQuery(pageQuerySchema), async (_req, res) => {
      res.json(await organizations.list(scopeOf(res), res.locals.query as PageQuery));
    });

    router.post('/', validateBody(createOrganizationRequestSchema), idempotent({ db: deps.database.db, clock: deps.clock, pepper: deps.secrets.pepper }), async (req, res) => {
      const organization = await organizations.create(res.locals.body as CreateOrganizationRequest);
      await audit.record(auditContext(req, res), {
        action: 'organization.created',
        organizationId: organization.id,
        targetType: 'organization',
        targetId: organization.id,
        data: { slug: organization.slug, name: organization.name, planId: organization.planId },
      });
      res.status(201).json({ ...organization, requestId: String(req.id) });
    });

    router.get('/:id', async (req, res) => {
      const scope = scopeOf(res);
      const organization = await organizations.get(idParam(req));
      const visible =
        organization &&
        ('all' in scope || ('organizationId' in scope ? scope.organizationId === organization.id : await organizations.isMember(organization.id, scope.userId)));
      // Not visible is not found: ids of other organisations do not leak.
      if (!visible) throw problems.notFound('No such organisation.');
      res.json(organization);
    });

    router.patch('/:id', validateBody(updateOrganizationRequestSchema), async (req, res) => {
      const { organization, changes } = await organizations.update(idParam(req), res.locals.body as UpdateOrganizationRequest);
      await services.keyEvents.planChanged(organization.id); // a new plan's limits apply from the next call, on every instance
      if (Object.keys(changes).length > 0) {
        await audit.record(auditContext(req, res), {
          action: 'organization.updated',
          organizationId: organization.id,
          targetType: 'organization',
          targetId: organization.id,
          data: changes,
        });
      }
      res.json(organization);
    });

    return router;
  },

  docs(registry) {
    const security = [{ bearer: [] }];
    const idParams = z.object({ id: z.uuid() });
    const unauthenticated = problemResponse('No or invalid credentials.');

    registry.registerPath({
      method: 'get',
      path: '/v1/organizations',
      tags: ['Organizations'],
      operationId: 'listOrganizations',
      summary: 'List organisations',
      description:
        'Ordered by slug, with cursor pagination. The operator sees every organisation, a user the ones they belong to, ' +
        'an API key (scope `usage:read`) its own.',
      security,
      request: { query: pageQuerySchema },
      responses: {
        200: { description: 'A page of organisations.', content: { 'application/json': { schema: organizationPageSchema } } },
        400: problemResponse('Invalid limit or cursor.'),
        401: unauthenticated,
        403: problemResponse('An API key without `usage:read`.'),
      },
    });
    registry.registerPath({
      method: 'post',
      path: '/v1/organizations',
      tags: ['Organizations'],
      operationId: 'createOrganization',
      summary: 'Create an organisation',
      description: 'Operator only. Creates a partner organisation on a plan (default `free`). Send `Idempotency-Key` to retry safely.',
      security,
      request: {
        headers: z.object({ 'Idempotency-Key': z.string().max(255).optional() }),
        body: { required: true, content: { 'application/json': { schema: createOrganizationRequestSchema } } },
      },
      responses: {
        201: { description: 'The new organisation.', content: { 'application/json': { schema: createdOrganizationSchema } } },
        400: problemResponse('Invalid body, or an unknown plan (`unknown_plan`).'),
        401: unauthenticated,
        403: problemResponse('Not the operator.'),
        409: problemResponse('The slug is taken (`slug_taken`).'),
        422: problemResponse('Idempotency-Key reused with another body.'),
      },
    });
    registry.registerPath({
      method: 'get',
      path: '/v1/organizations/{id}',
      tags: ['Organizations'],
      operationId: 'getOrganization',
      summary: 'Get an organisation',
      description: 'For the operator, a member of the organisation, or one of its API keys (scope `usage:read`); anyone else gets 404.',
      security,
      request: { params: idParams },
      responses: {
        200: { description: 'The organisation.', content: { 'application/json': { schema: organizationSchema } } },
        401: unauthenticated,
        403: problemResponse('An API key without `usage:read`.'),
        404: problemResponse('No such organisation, or not yours.'),
      },
    });
    registry.registerPath({
      method: 'patch',
      path: '/v1/organizations/{id}',
      tags: ['Organizations'],
      operationId: 'updateOrganization',
      summary: 'Update an organisation',
      description: 'Operator only. Renames the organisation or moves it to another plan; the slug never changes.',
      security,
      request: { params: idParams, body: { required: true, content: { 'application/json': { schema: updateOrganizationRequestSchema } } } },
      responses: {
        200: { description: 'The updated organisation.', content: { 'application/json': { schema: organizationSchema } } },
        400: problemResponse('Invalid body, or an unknown plan (`unknown_plan`).'),
        401: unauthenticated,
        403: problemResponse('Not the operator.'),
        404: problemResponse('No such organisation.'),
      },
    });
  },
};
