import { Router, type Request } from 'express';
import { z } from 'zod';
import {
  createInvitationRequestSchema,
  invitationResponseSchema,
  memberPageSchema,
  memberSchema,
  updateMemberRequestSchema,
} from '../../shared/schemas/accounts.js';
import { organizationOf } from '../auth/principal.js';
import { idempotent } from '../middleware/idempotency.js';
import { validateBody, validateQuery } from '../middleware/validate.js';
import { problemResponse } from '../openapi/document.js';
import { auditContext } from '../services/audit.js';
import { pageQuerySchema, type PageQuery } from '../services/pagination.js';
import type { RouteModule } from './route-module.js';

export const memberRoutes: RouteModule = {
  basePath: '/v1/members',

  router(deps, services) {
    const router = Router();
    const { members, audit } = services;
    const idParam = (req: Request) => String(req.params.id);

    router.get('/', validateQuery(pageQuerySchema), async (_req, res) => {
      res.json(await members.list(organizationOf(res), res.locals.query as PageQuery));
    });

    router.post('/invitations', validateBody(createInvitationRequestSchema), idempotent({ db: deps.database.db, clock: deps.clock, pepper: deps.secrets.pepper }), async (req, res) => {
      const { email, role } = res.locals.body as z.output<typeof createInvitationRequestSchema>;
      const organizationId = organizationOf(res);
      const invitation = await members.invite({ organizationId, email, role });
      await audit.record(auditContext(req, res), {
        action: 'member.invited',
        organizationId,
        targetType: 'invitation',
        targetId: invitation.id,
        data: { email: invitation.email, role, expiresAt: invitation.expiresAt },
      });
      res.status(201).json({ invitation, requestId: String(req.id) });
    });

    router.patch('/:id', validateBody(updateMemberRequestSchema), async (req, res) => {
      const { role } = res.locals.body as z.output<typeof updateMemberRequestSchema>;
      const organizationId = organizationOf(res);
      const { member, from } = await members.changeRole(organizationId, idParam(req), role);
      if (from !== role) {
        await audit.record(auditContext(req, res), {
          action: 'member.role_changed',
          organizationId,
          targetType: 'member',
          targetId: member.id,
          data: { userId: member.userId, email: member.email, from, to: role },
        });
      }
      res.json(member);
    });

    router.delete('/:id', async (req, res) => {
      const organizationId = organizationOf(res);
      const member = await members.remove(organizationId, idParam(req));
      await audit.record(auditContext(req, res), {
        action: 'member.removed',
        organizationId,
        targetType: 'member',
        targetId: member.id,
        data: { userId: member.userId, email: member.email, role: member.role },
      });
      res.status(204).end();
    });

    return router;
  },

  docs(registry) {
    const security = [{ bearer: [] }];
    const idParams = z.object({ id: z.uuid().meta({ description: 'The membership id (`id` in the member list).' }) });
    const orgNote = ' Acts in the organisation the access token names (see POST /v1/auth/switch-organization). API keys cannot manage members.';
    const denied = {
      401: problemResponse('No or invalid credentials.'),
      403: problemResponse('Needs the admin role; API keys are refused.'),
    };

    registry.registerPath({
      method: 'get',
      path: '/v1/members',
      tags: ['Members'],
      operationId: 'listMembers',
      summary: 'List members',
      description: 'The organisation’s members with their roles, ordered by e-mail, with cursor pagination. Any role may read it.' + orgNote,
      security,
      request: { query: pageQuerySchema },
      responses: {
        200: { description: 'A page of members.', content: { 'application/json': { schema: memberPageSchema } } },
        400: problemResponse('Invalid limit or cursor.'),
        401: denied[401],
        403: problemResponse('Not a member of the organisation, or called with an API key.'),
      },
    });
    registry.registerPath({
      method: 'post',
      path: '/v1/members/invitations',
      tags: ['Members'],
      operationId: 'inviteMember',
      summary: 'Invite a member',
      description:
        'E-mails a link to `/accept-invitation?token=…` that works once, within 7 days; accepting it joins the organisation in the given role. ' +
        'The token is only in the e-mail. Send `Idempotency-Key` to retry safely.' +
        orgNote,
      security,
      request: {
        headers: z.object({ 'Idempotency-Key': z.string().max(255).optional() }),
        body: { required: true, content: { 'application/json': { schema: createInvitationRequestSchema } } },
      },
      responses: {
        201: { description: 'The invitation (sent).', content: { 'application/json': { schema: invitationResponseSchema } } },
        400: problemResponse('Invalid body.'),
        ...denied,
        409: problemResponse('Already a member (`already_member`).'),
        422: problemResponse('Idempotency-Key reused with another body.'),
      },
    });
    registry.registerPath({
      method: 'patch',
      path: '/v1/members/{id}',
      tags: ['Members'],
      operationId: 'changeMemberRole',
      summary: 'Change a member’s role',
      description: 'Sets the member’s role. The last admin cannot be demoted.' + orgNote,
      security,
      request: { params: idParams, body: { required: true, content: { 'application/json': { schema: updateMemberRequestSchema } } } },
      responses: {
        200: { description: 'The member with the new role.', content: { 'application/json': { schema: memberSchema } } },
        400: problemResponse('Invalid body.'),
        ...denied,
        404: problemResponse('No such member in this organisation.'),
        409: problemResponse('The last admin cannot be demoted (`last_admin`).'),
      },
    });
    registry.registerPath({
      method: 'delete',
      path: '/v1/members/{id}',
      tags: ['Members'],
      operationId: 'removeMember',
      summary: 'Remove a member',
      description: 'Removes the member from the organisation at once (their account stays). The last admin cannot be removed.' + orgNote,
      security,
      request: { params: idParams },
      responses: {
        204: { description: 'Removed.' },
        ...denied,
        404: problemResponse('No such member in this organisation.'),
        409: problemResponse('The last admin cannot be removed (`last_admin`).'),
      },
    });
  },
};
