import { Router, type Request, type Response } from 'express';
import { z } from 'zod';
import {
  apiKeyPageSchema,
  apiKeySchema,
  apiKeyWithTokenSchema,
  createApiKeyRequestSchema,
  currentKeySchema,
  rotateApiKeyRequestSchema,
  type CreateApiKeyRequest,
} from '../../shared/schemas/api-keys.js';
import { organizationOf, principalOf } from '../auth/principal.js';
import { EMBED_SCOPES, ROLE_SCOPES, type Scope } from '../auth/scopes.js';
import { idempotent, SECRET_REPLAY_WINDOW_MS } from '../middleware/idempotency.js';
import { validateBody, validateQuery } from '../middleware/validate.js';
import { problemResponse } from '../openapi/document.js';
import { HttpProblem } from '../problem.js';
import { auditContext } from '../services/audit.js';
import type { Services } from '../services/container.js';
import { adminEmails } from '../services/org-admins.js';
import { pageQuerySchema, type PageQuery } from '../services/pagination.js';
import type { AppDeps } from '../deps.js';
import type { RouteModule } from './route-module.js';

/** What the caller may grant: a new key never gets more than its creator holds. */
function grantableScopes(res: Response): readonly Scope[] {
  const p = principalOf(res);
  if (p.type === 'api_key') return p.scopes;
  if (p.type === 'user' && p.role) return ROLE_SCOPES[p.role];
  return [];
}

/**
 * Tells the organisation's admins. Sent after the change is committed and not awaited: a mail
 * failure must not turn a created or rotated key (whose token is in this response) into a 500.
 */
function notifyAdmins(deps: AppDeps, services: Services, organizationId: string, subject: string, text: string): void {
  adminEmails(deps.database.db, organizationId)
    .then((to) => Promise.all(to.map((address) => services.mailer.send({ to: address, subject, text }))))
    .catch((err) => deps.logger.error({ err: { message: (err as Error).message } }, 'key notice not sent'));
}

/** A key may only act on keys it could have created: no more scopes than its own. */
async function assertKeyMayManage(res: Response, services: Services, organizationId: string, id: string): Promise<void> {
  const p = principalOf(res);
  if (p.type !== 'api_key') return;
  const target = await services.apiKeys.get(organizationId, id);
  if (!target.scopes.every((s) => p.scopes.includes(s as Scope))) {
    throw new HttpProblem(403, 'scope_exceeds_caller', 'Key too powerful', 'A key cannot rotate or revoke a key with scopes it does not hold.');
  }
}

export const keyRoutes: RouteModule = {
  basePath: '/v1/keys',

  router(deps, services) {
    const router = Router();
    const { apiKeys, audit, keyCache } = services; // keyCache: the creating key's own row
    const idParam = (req: Request) => String(req.params.id);

    router.get('/', validateQuery(pageQuerySchema), async (_req, res) => {
      res.json(await apiKeys.list(organizationOf(res), res.locals.query as PageQuery));
    });

    router.post('/', validateBody(createApiKeyRequestSchema), idempotent({ db: deps.database.db, clock: deps.clock, pepper: deps.secrets.pepper, secretReplayMs: SECRET_REPLAY_WINDOW_MS }), async (req, res) => {
      const body = res.locals.body as CreateApiKeyRequest;
      const organizationId = organizationOf(res);
      const scopes = body.scopes ?? (['sizing:run'] as Scope[]);
      const ceiling = body.kind === 'embed' ? EMBED_SCOPES : grantableScopes(res);
      const excess = scopes.filter((s) => !ceiling.includes(s) || !grantableScopes(res).includes(s));
      if (excess.length) {
        throw new HttpProblem(403, 'scope_exceeds_creator', 'Scopes not grantable', `You cannot grant ${excess.join(', ')}.`, {
          errors: [{ path: 'scopes', message: `not grantable: ${excess.join(', ')}` }],
        });
      }
      const expiresAt = body.expiresAt ? new Date(body.expiresAt) : null;
      if (expiresAt && expiresAt <= deps.clock()) {
        throw new HttpProblem(400, 'validation_failed', 'Invalid request', 'The expiry is in the past.', { errors: [{ path: 'expiresAt', message: 'must be in the future' }] });
      }
      const p = principalOf(res);
      if (p.type === 'api_key') {
        // A key cannot outlive itself through the keys it makes.
        const parent = await keyCache.get(p.keyId);
        if (parent?.expiresAt && (!expiresAt || expiresAt > parent.expiresAt)) {
          throw new HttpProblem(403, 'expiry_exceeds_creator', 'Expiry not grantable', `The new key must expire by ${parent.expiresAt.toISOString()}, as the key creating it does.`, {
            errors: [{ path: 'expiresAt', message: `must be on or before ${parent.expiresAt.toISOString()}` }],
          });
        }
      }
      const plan = await services.plans.forOrganization(organizationId);
      if ((await apiKeys.countActive(organizationId)) >= plan.maxApiKeys) {
        throw new HttpProblem(
          409,
          'key_limit_reached',
          'Key limit reached',
          `The ${plan.name} plan allows ${plan.maxApiKeys} active keys per organisation. Revoke a key you no longer use, or move to a larger plan.`,
        );
      }
      const { key, token } = await apiKeys.create({
        organizationId,
        kind: body.kind,
        name: body.name,
        scopes: [...new Set(scopes)],
        allowedOrigins: (body.allowedOrigins ?? []).map((o) => o.toLowerCase()),
        expiresAt,
        createdByUserId: p.type === 'user' ? p.userId : null,
        createdByKeyId: p.type === 'api_key' ? p.keyId : null,
      });
      await services.keyEvents.changed(key.keyId); // a new embed key's origins, on every instance
      await audit.record(auditContext(req, res), {
        action: 'api_key.created',
        organizationId,
        targetType: 'api_key',
        targetId: key.keyId,
        data: { name: key.name, kind: key.kind, scopes: key.scopes, allowedOrigins: key.allowedOrigins },
      });
      notifyAdmins(deps, services, organizationId, `Treadwise: API key "${key.name}" created`, `A ${key.kind} key ${key.keyId} ("${key.name}") was created with scopes ${key.scopes.join(', ')}.`);
      res.status(201).json({ key, requestId: String(req.id), token });
    });

    router.get('/current', async (_req, res) => {
      const p = principalOf(res);
      if (p.type !== 'api_key') throw new Error('GET /v1/keys/current reached without a key'); // authorize() lets only keys through
      const organization = await services.organizations.get(p.organizationId);
      if (!organization) throw new HttpProblem(404, 'not_found', 'Not found', 'The organisation of this key no longer exists.');
      const [key, plan] = await Promise.all([apiKeys.get(p.organizationId, p.apiKeyId), services.plans.forOrganization(p.organizationId)]);
      res.json({ key, organization, plan: { id: plan.id, name: plan.name } } satisfies z.input<typeof currentKeySchema>);
    });

    router.get('/:id', async (req, res) => {
      res.json(await apiKeys.get(organizationOf(res), idParam(req)));
    });

    router.post('/:id/rotate', validateBody(rotateApiKeyRequestSchema), async (req, res) => {
      const organizationId = organizationOf(res);
      const { overlapHours } = res.locals.body as z.output<typeof rotateApiKeyRequestSchema>;
      await assertKeyMayManage(res, services, organizationId, idParam(req));
      const { key, token } = await apiKeys.rotate(organizationId, idParam(req), overlapHours);
      await services.keyEvents.changed(key.keyId);
      await audit.record(auditContext(req, res), { action: 'api_key.rotated', organizationId, targetType: 'api_key', targetId: key.keyId, data: { overlapHours } });
      notifyAdmins(deps, services, organizationId, `Treadwise: API key "${key.name}" rotated`, `Key ${key.keyId} ("${key.name}") has a new secret. The old one works until ${key.previousSecretValidUntil ?? 'now'}.`);
      res.json({ key, requestId: String(req.id), token });
    });

    router.post('/:id/revoke', async (req, res) => {
      const organizationId = organizationOf(res);
      await assertKeyMayManage(res, services, organizationId, idParam(req));
      const { key, changed } = await apiKeys.revoke(organizationId, idParam(req));
      await services.keyEvents.changed(key.keyId);
      if (changed) {
        await audit.record(auditContext(req, res), { action: 'api_key.revoked', organizationId, targetType: 'api_key', targetId: key.keyId });
        notifyAdmins(deps, services, organizationId, `Treadwise: API key "${key.name}" revoked`, `Key ${key.keyId} ("${key.name}") was revoked and no longer works.`);
      }
      res.json(key);
    });

    return router;
  },

  docs(registry) {
    const security = [{ bearer: [] }];
    const idParams = z.object({ id: z.uuid().meta({ description: 'The key’s id (not its keyId).' }) });
    const problems = {
      401: problemResponse('No or invalid credentials.'),
      403: problemResponse('Needs the admin role or the keys:manage scope.'),
    };
    registry.registerPath({
      method: 'get',
      path: '/v1/keys',
      tags: ['API keys'],
      operationId: 'listApiKeys',
      summary: 'List API keys',
      description: 'The organisation’s keys, newest first, with cursor pagination. Secrets are never listed.',
      security,
      request: { query: pageQuerySchema },
      responses: {
        200: { description: 'A page of keys.', content: { 'application/json': { schema: apiKeyPageSchema } } },
        400: problemResponse('A malformed or unknown query parameter (`validation_failed`) or cursor (`invalid_cursor`).'),
        ...problems,
      },
    });
    registry.registerPath({
      method: 'get',
      path: '/v1/keys/current',
      tags: ['API keys'],
      operationId: 'getCurrentApiKey',
      summary: 'The server key making the call',
      description:
        'Any server key, whatever its scopes: its own row (name, scopes, expiry, last use; never the secret), its organisation and the plan it runs under. ' +
        'Signed-in users get 403 `keys_only` (they have `GET /v1/auth/me`); embed keys get 403.',
      security,
      responses: {
        200: { description: 'The key, its organisation and plan.', content: { 'application/json': { schema: currentKeySchema } } },
        401: problemResponse('No or invalid credentials.'),
        403: problemResponse('Not a server key.'),
      },
    });
    registry.registerPath({
      method: 'post',
      path: '/v1/keys',
      tags: ['API keys'],
      operationId: 'createApiKey',
      summary: 'Create an API key',
      description:
        'Creates a server (`tw_server_…`) or embed (`tw_embed_…`) key. The whole key is in this response only; ' +
        'Treadwise keeps just an HMAC of its secret. Scopes can never exceed the creator’s. Send `Idempotency-Key` to retry safely: since the answer holds the secret, a retry is replayed only to the same credential (key, or sign-in session) and only for 10 minutes, then answers 409 `idempotency_replay_expired`.',
      security,
      request: {
        headers: z.object({ 'Idempotency-Key': z.string().max(255).optional() }),
        body: { required: true, content: { 'application/json': { schema: createApiKeyRequestSchema } } },
      },
      responses: {
        201: { description: 'The key and its token (shown once).', content: { 'application/json': { schema: apiKeyWithTokenSchema } } },
        400: problemResponse('Invalid request.'),
        ...problems,
        409: problemResponse('The plan’s cap on active keys is reached (`key_limit_reached`), or a request with this Idempotency-Key is still running, or its 10-minute replay window has ended (`idempotency_replay_expired`).'),
        422: problemResponse('Idempotency-Key reused with another body.'),
      },
    });
    registry.registerPath({
      method: 'get',
      path: '/v1/keys/{id}',
      tags: ['API keys'],
      operationId: 'getApiKey',
      summary: 'Get an API key',
      description: 'One key of the organisation; another organisation’s key is not found.',
      security,
      request: { params: idParams },
      responses: { 200: { description: 'The key.', content: { 'application/json': { schema: apiKeySchema } } }, ...problems, 404: problemResponse('No such key.') },
    });
    registry.registerPath({
      method: 'post',
      path: '/v1/keys/{id}/rotate',
      tags: ['API keys'],
      operationId: 'rotateApiKey',
      summary: 'Rotate an API key',
      description: 'Issues a new secret for the same key id. The old secret keeps working beside it for `overlapHours` (0 to 72), then stops.',
      security,
      request: { params: idParams, body: { required: false, content: { 'application/json': { schema: rotateApiKeyRequestSchema } } } },
      responses: {
        200: { description: 'The key and its new token (shown once).', content: { 'application/json': { schema: apiKeyWithTokenSchema } } },
        400: problemResponse('The body does not match the schema, e.g. `overlapHours` beyond 72 or an unknown field (`validation_failed`).'),
        ...problems,
        404: problemResponse('No such key.'),
        409: problemResponse('The key is revoked or expired (`key_revoked`, `key_expired`), or another rotation of it is running (`rotation_in_progress`).'),
      },
    });
    registry.registerPath({
      method: 'post',
      path: '/v1/keys/{id}/revoke',
      tags: ['API keys'],
      operationId: 'revokeApiKey',
      summary: 'Revoke an API key',
      description: 'Stops the key at once, on every instance within seconds and on this one immediately. Revoking twice is harmless.',
      security,
      request: { params: idParams },
      responses: { 200: { description: 'The revoked key.', content: { 'application/json': { schema: apiKeySchema } } }, ...problems, 404: problemResponse('No such key.') },
    });
  },
};
