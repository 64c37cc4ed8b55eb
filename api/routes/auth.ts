import { Router } from 'express';
import { z } from 'zod';
import {
  acceptInvitationRequestSchema,
  meSchema,
  passwordResetConfirmSchema,
  passwordResetRequestSchema,
  refreshRequestSchema,
  sessionSchema,
  signInRequestSchema,
  signOutRequestSchema,
  switchedOrganizationSchema,
  switchOrganizationRequestSchema,
  type AcceptInvitationRequest,
  type Me,
  type SignInRequest,
} from '../../shared/schemas/accounts.js';
import { principalOf, type Principal } from '../auth/principal.js';
import { clientAddress } from '../middleware/client-address.js';
import { validateBody } from '../middleware/validate.js';
import { problemResponse } from '../openapi/document.js';
import { HttpProblem, problems } from '../problem.js';
import { auditContext } from '../services/audit.js';
import { invalidToken } from '../services/members.js';
import type { RouteModule } from './route-module.js';

const invalidCredentials = () => problems.unauthenticated('The e-mail address or the password is wrong.', 'invalid_credentials');
const invalidRefreshToken = () => problems.unauthenticated('The refresh token is unknown, used, revoked or expired. Sign in again.', 'invalid_token');

export const authRoutes: RouteModule = {
  basePath: '/v1/auth',

  router(_deps, services) {
    const router = Router();
    const { sessions, users, audit, passwordResets, members } = services;

    router.post('/sign-in', validateBody(signInRequestSchema), async (req, res) => {
      const { email, password } = res.locals.body as SignInRequest;
      const result = await sessions.signIn(email, password, clientAddress(req));
      const ctx = auditContext(req, res);
      const target = result.userId ? { targetType: 'user', targetId: result.userId } : {};
      if (!result.ok) {
        await audit.record(ctx, { action: 'auth.sign_in_failed', organizationId: null, ...target, data: { email, reason: result.reason } });
        // One answer for an unknown e-mail, a wrong password and a locked-out source.
        throw invalidCredentials();
      }
      await audit.record(ctx, { action: 'auth.signed_in', organizationId: null, ...target });
      res.json(result.session);
    });

    router.post('/refresh', validateBody(refreshRequestSchema), async (req, res) => {
      const { refreshToken } = res.locals.body as z.output<typeof refreshRequestSchema>;
      const result = await sessions.refresh(refreshToken);
      if (!result.ok) {
        if (result.reason === 'reused') {
          await audit.record(auditContext(req, res), { action: 'auth.refresh_token_reused', organizationId: null, targetType: 'user', targetId: result.userId });
        }
        throw invalidRefreshToken();
      }
      res.json(result.session);
    });

    router.post('/sign-out', validateBody(signOutRequestSchema), async (req, res) => {
      const { refreshToken } = res.locals.body as z.output<typeof signOutRequestSchema>;
      const userId = await sessions.signOut(refreshToken);
      // An unknown token is answered the same: signing out twice is harmless.
      if (userId) await audit.record(auditContext(req, res), { action: 'auth.signed_out', organizationId: null, targetType: 'user', targetId: userId });
      res.status(204).end();
    });

    router.get('/me', async (_req, res) => {
      const p = principalOf(res);
      const user = p.type === 'user' ? await users.get(p.userId) : undefined;
      if (!user) throw problems.unauthenticated();
      const body: Me = { user: users.view(user), memberships: await users.membershipsOf(user.id) };
      res.json(body);
    });

    router.post('/switch-organization', validateBody(switchOrganizationRequestSchema), async (req, res) => {
      const p = principalOf(res);
      if (p.type !== 'user') throw problems.unauthenticated();
      const { organization } = res.locals.body as z.output<typeof switchOrganizationRequestSchema>;
      const result = await sessions.switchOrganization(p.userId, p.sessionId, organization);
      if (!result.ok) {
        if (result.reason === 'session_ended') throw problems.unauthenticated('This session has ended (signed out or expired). Sign in again.', 'credential_revoked');
        throw problems.notFound('No such organisation.');
      }
      await audit.record(auditContext(req, res), {
        action: 'auth.organization_switched',
        organizationId: result.switched.organization.id,
        targetType: 'organization',
        targetId: result.switched.organization.id,
      });
      res.json(result.switched);
    });

    router.post('/password-reset', validateBody(passwordResetRequestSchema), async (req, res) => {
      const { email } = res.locals.body as z.output<typeof passwordResetRequestSchema>;
      const ctx = auditContext(req, res);
      // Answered before the lookup and the mail, and always 202: neither the answer nor its timing
      // may tell which addresses have accounts.
      passwordResets.requestInBackground(
        email,
        (userId) => audit.record(ctx, { action: 'auth.password_reset_requested', organizationId: null, targetType: 'user', targetId: userId }),
        (err) => req.log.error({ err: { message: (err as Error).message } }, 'password reset not sent'),
      );
      res.status(202).end();
    });

    router.post('/password-reset/confirm', validateBody(passwordResetConfirmSchema), async (req, res) => {
      const { token, password } = res.locals.body as z.output<typeof passwordResetConfirmSchema>;
      const userId = await passwordResets.confirm(token, password);
      if (!userId) throw invalidToken();
      await audit.record(auditContext(req, res), { action: 'auth.password_reset', organizationId: null, targetType: 'user', targetId: userId });
      res.status(204).end();
    });

    router.post('/invitations/accept', validateBody(acceptInvitationRequestSchema), async (req, res) => {
      const body = res.locals.body as AcceptInvitationRequest;
      const accepted = await members.acceptInvitation(body, clientAddress(req));
      // The new member is the actor: they proved themselves with the link.
      const actor: Principal = {
        type: 'user',
        userId: accepted.user.id,
        email: accepted.user.email,
        operator: accepted.user.operator,
        sessionId: accepted.sessionId,
        organizationId: accepted.organizationId,
        role: accepted.role,
      };
      await audit.record(
        { ...auditContext(req, res), principal: actor },
        {
          action: 'member.joined',
          organizationId: accepted.organizationId,
          targetType: 'member',
          targetId: accepted.membershipId,
          data: { userId: accepted.user.id, email: accepted.user.email, role: accepted.role, newAccount: accepted.newAccount },
        },
      );
      res.json(accepted.session);
    });

    return router;
  },

  docs(registry) {
    const json = <S extends z.ZodType>(schema: S) => ({ required: true, content: { 'application/json': { schema } } });
    const session = { description: 'A new session.', content: { 'application/json': { schema: sessionSchema } } };
    const invalid = problemResponse('The body does not match the schema (`validation_failed`).');

    registry.registerPath({
      method: 'post',
      path: '/v1/auth/sign-in',
      tags: ['Auth'],
      operationId: 'signIn',
      security: [], // public: no credentials are read
      summary: 'Sign in',
      description:
        'Exchanges an e-mail address and password for a 15-minute access token and a 30-day refresh token. ' +
        'A wrong password, an unknown address and a locked-out source get the same 401. After 5 failures in a row from one ' +
        'address the account is locked for that address for 1 minute, doubling with each further failure up to 1 hour; ' +
        'other addresses are not affected, and a password reset lifts every lock.',
      request: { body: json(signInRequestSchema) },
      responses: {
        200: session,
        400: invalid,
        401: problemResponse('Wrong e-mail address or password (`invalid_credentials`).'),
        429: problemResponse('Too many failed sign-ins from this address (`rate_limited`).'),
      },
    });
    registry.registerPath({
      method: 'post',
      path: '/v1/auth/refresh',
      tags: ['Auth'],
      operationId: 'refreshSession',
      security: [], // public: no credentials are read
      summary: 'Refresh a session',
      description:
        'Exchanges a refresh token for a new access token and a new refresh token; the one presented is used up. ' +
        'Presenting a used token again signs out every session descended from the same sign-in (theft detection).',
      request: { body: json(refreshRequestSchema) },
      responses: { 200: session, 400: invalid, 401: problemResponse('Unknown, used, revoked or expired refresh token (`invalid_token`).') },
    });
    registry.registerPath({
      method: 'post',
      path: '/v1/auth/sign-out',
      tags: ['Auth'],
      operationId: 'signOut',
      security: [], // public: no credentials are read
      summary: 'Sign out',
      description: 'Revokes the refresh token and every token rotated from the same sign-in. Access tokens already issued run out within 15 minutes.',
      request: { body: json(signOutRequestSchema) },
      responses: { 204: { description: 'Signed out (also for an unknown token).' }, 400: invalid },
    });
    registry.registerPath({
      method: 'get',
      path: '/v1/auth/me',
      tags: ['Auth'],
      operationId: 'getCurrentUser',
      summary: 'The signed-in user',
      description: 'The user behind the access token and the organisations they belong to. For console users only; API keys get 403.',
      security: [{ bearer: [] }],
      responses: {
        200: { description: 'The user and their memberships.', content: { 'application/json': { schema: meSchema } } },
        401: problemResponse('No or invalid access token.'),
        403: problemResponse('Called with an API key.'),
      },
    });
    registry.registerPath({
      method: 'post',
      path: '/v1/auth/switch-organization',
      tags: ['Auth'],
      operationId: 'switchOrganization',
      summary: 'Act in another organisation',
      description:
        'Issues an access token that acts in the given organisation (a membership of yours; the operator may choose any). ' +
        'The session remembers the choice: later refreshes keep it. Console users only; API keys act in their own organisation.',
      security: [{ bearer: [] }],
      request: { body: json(switchOrganizationRequestSchema) },
      responses: {
        200: { description: 'A token for the chosen organisation.', content: { 'application/json': { schema: switchedOrganizationSchema } } },
        400: invalid,
        401: problemResponse('No, unknown or expired access token, or the session has ended (`credential_*`).'),
        403: problemResponse('Called with an API key.'),
        404: problemResponse('Not an organisation you may act in.'),
      },
    });
    registry.registerPath({
      method: 'post',
      path: '/v1/auth/password-reset',
      tags: ['Auth'],
      operationId: 'requestPasswordReset',
      security: [], // public: no credentials are read
      summary: 'Ask for a password reset',
      description:
        'E-mails a link to `/reset-password?token=…` that works once, for one hour. ' +
        'Always answers 202, whether or not the address has an account.',
      request: { body: json(passwordResetRequestSchema) },
      responses: { 202: { description: 'Accepted; a link is sent if the account exists.' }, 400: invalid },
    });
    registry.registerPath({
      method: 'post',
      path: '/v1/auth/password-reset/confirm',
      tags: ['Auth'],
      operationId: 'confirmPasswordReset',
      security: [], // public: no credentials are read
      summary: 'Set a new password',
      description: 'Sets a new password with the token from the reset link, lifts any lockout and signs out every session of the account.',
      request: { body: json(passwordResetConfirmSchema) },
      responses: {
        204: { description: 'The password is changed.' },
        400: problemResponse('Invalid body, or the token is unknown, used or expired (`invalid_token`).'),
      },
    });
    registry.registerPath({
      method: 'post',
      path: '/v1/auth/invitations/accept',
      tags: ['Auth'],
      operationId: 'acceptInvitation',
      security: [], // public: no credentials are read
      summary: 'Accept an invitation',
      description:
        'Uses the token from an invitation link (once, within 7 days). A new address gets an account with the given name ' +
        'and password; an existing account gains the membership once its own password is confirmed in `password` (the link alone ' +
        'never signs in to an existing account). Answers with a session.',
      request: { body: json(acceptInvitationRequestSchema) },
      responses: {
        200: session,
        400: problemResponse(
          'Invalid body, a new account without name or password, an existing account without its password, or the token is unknown, used or expired (`invalid_token`).',
        ),
        401: problemResponse('The password of the existing account is wrong (`invalid_credentials`), also while that account is locked for this address.'),
      },
    });
  },
};
