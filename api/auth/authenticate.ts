import type { RequestHandler } from 'express';
import { and, eq, or } from 'drizzle-orm';
import type { Db } from '../db/client.js';
import { memberships, organizations, users } from '../db/schema.js';
import { problems } from '../problem.js';
import type { AccessTokens } from './access-tokens.js';
import { digestsEqual, hashSecret, parseKey } from './key-format.js';
import type { KeyCache } from './key-cache.js';
import { originAllowed } from './origins.js';
import { policyFor } from './policy.js';
import type { Principal } from './principal.js';
import type { Scope } from './scopes.js';

export interface AuthenticateDeps {
  db: Db;
  pepper: Buffer;
  keyCache: KeyCache;
  accessTokens: AccessTokens;
  clock: () => Date;
}

const BEARER = /^Bearer ([^\s]+)$/i; // RFC 9110 §11.1: the scheme is case-insensitive
const ORG_HEADER = 'treadwise-organization';

/**
 * Establishes `res.locals.principal` from `Authorization: Bearer …` (an API key or a console
 * access token). No credentials: anonymous (the policy decides). Bad credentials: 401 at once,
 * except on public routes, where credentials are not looked at.
 */
export function authenticate(deps: AuthenticateDeps): RequestHandler {
  return async (req, res, next) => {
    // Node keeps one of two Authorization headers; which credential counts must not be a guess.
    if ((req.headersDistinct.authorization?.length ?? 0) > 1) throw problems.badRequest('duplicate_authorization', 'Send one Authorization header, not several.');
    const header = req.headers.authorization;
    // Public routes ignore credentials, so a stale token never blocks sign-in, refresh or health.
    if (!header || policyFor(req.method, req.baseUrl + req.path)?.policy.public) {
      res.locals.principal = { type: 'anonymous' } satisfies Principal;
      return next();
    }
    const bearer = BEARER.exec(header);
    if (!bearer) throw problems.unauthenticated('The Authorization header must be `Bearer <token>`.');
    const token = bearer[1];
    res.locals.principal = token.startsWith('tw_') ? await keyPrincipal(deps, token, req.headers.origin) : await userPrincipal(deps, token, req.headers[ORG_HEADER]);
    next();
  };
}

async function keyPrincipal(deps: AuthenticateDeps, token: string, origin: string | undefined): Promise<Principal> {
  const parsed = parseKey(token);
  if (!parsed) throw problems.unauthenticated('The API key is malformed.', 'invalid_api_key');
  const row = await deps.keyCache.get(parsed.keyId);
  const now = deps.clock();
  if (!row || row.kind !== parsed.kind) throw problems.unauthenticated('The API key is not valid.', 'invalid_api_key');
  const digest = hashSecret(deps.pepper, parsed.keyId, parsed.secret);
  const current = digestsEqual(digest, row.secretHash);
  const previous =
    !current && row.previousSecretHash !== null && row.previousValidUntil !== null && row.previousValidUntil > now && digestsEqual(digest, row.previousSecretHash);
  if (!current && !previous) throw problems.unauthenticated('The API key is not valid.', 'invalid_api_key');
  if (row.revokedAt) throw problems.unauthenticated('The API key has been revoked.', 'api_key_revoked');
  if (row.expiresAt && row.expiresAt <= now) throw problems.unauthenticated('The API key has expired.', 'api_key_expired');
  if (row.kind === 'publishable') {
    // Browser keys are public by nature: they only work from the shop's own pages.
    if (!origin) throw problems.forbidden('A publishable key must be used from a browser page (Origin header).', 'origin_required');
    if (!originAllowed(origin, row.allowedOrigins)) throw problems.forbidden(`Origin ${origin} is not allowed for this key.`, 'origin_not_allowed');
  }
  return { type: 'api_key', apiKeyId: row.id, keyId: row.keyId, kind: row.kind, organizationId: row.organizationId, scopes: row.scopes as Scope[] };
}

async function userPrincipal(deps: AuthenticateDeps, token: string, orgHeader: string | string[] | undefined): Promise<Principal> {
  const claims = await deps.accessTokens.verify(token);
  if (!claims) throw problems.unauthenticated('The access token is invalid or expired.', 'invalid_token');
  const [user] = await deps.db.select().from(users).where(eq(users.id, claims.sub));
  if (!user) throw problems.unauthenticated('The access token is invalid or expired.', 'invalid_token');

  const wanted = typeof orgHeader === 'string' && orgHeader.length > 0 ? orgHeader : undefined;
  const base = { type: 'user' as const, userId: user.id, email: user.email, operator: user.operator };
  if (user.operator) {
    if (!wanted) return { ...base, organizationId: null, role: null };
    const org = await findOrganization(deps.db, wanted);
    if (!org) throw problems.notFound('No such organisation.');
    return { ...base, organizationId: org.id, role: 'admin' };
  }
  const rows = await deps.db
    .select({ organizationId: memberships.organizationId, role: memberships.role, slug: organizations.slug })
    .from(memberships)
    .innerJoin(organizations, eq(organizations.id, memberships.organizationId))
    .where(eq(memberships.userId, user.id));
  const chosen = wanted ? rows.find((r) => r.slug === wanted || r.organizationId === wanted) : rows.length === 1 ? rows[0] : undefined;
  // Not a member: the organisation is not found, so ids do not leak.
  if (wanted && !chosen) throw problems.notFound('No such organisation.');
  return { ...base, organizationId: chosen?.organizationId ?? null, role: chosen?.role ?? null };
}

async function findOrganization(db: Db, slugOrId: string) {
  const isUuid = /^[0-9a-f-]{36}$/i.test(slugOrId);
  const [org] = await db
    .select({ id: organizations.id })
    .from(organizations)
    .where(isUuid ? or(eq(organizations.id, slugOrId), eq(organizations.slug, slugOrId)) : and(eq(organizations.slug, slugOrId)));
  return org;
}
