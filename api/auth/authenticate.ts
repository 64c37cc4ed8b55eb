import type { RequestHandler } from 'express';
import { and, eq } from 'drizzle-orm';
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

/** Credential failures share four codes, for keys and access tokens alike. */
const unknownCredential = (what: string) => problems.unauthenticated(`The ${what} is not valid.`, 'credential_unknown');
const expiredCredential = (what: string) => problems.unauthenticated(`The ${what} has expired.`, 'credential_expired');

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
    if (!bearer) throw problems.unauthenticated('The Authorization header must be `Bearer <token>`.', 'credential_unknown');
    const token = bearer[1];
    res.locals.principal = token.startsWith('tw_') ? await keyPrincipal(deps, token, req.headers.origin) : await userPrincipal(deps, token);
    next();
  };
}

async function keyPrincipal(deps: AuthenticateDeps, token: string, origin: string | undefined): Promise<Principal> {
  const parsed = parseKey(token);
  if (!parsed) throw unknownCredential('API key');
  const row = await deps.keyCache.get(parsed.keyId);
  const now = deps.clock();
  if (!row || row.kind !== parsed.kind) throw unknownCredential('API key');
  const valid = deps.keyCache.secretValid(row, token, () => {
    const digest = hashSecret(deps.pepper, parsed.keyId, parsed.secret);
    if (digestsEqual(digest, row.secretHash)) return { validUntil: Number.POSITIVE_INFINITY };
    const nowIso = now.toISOString();
    const overlap = row.overlappingSecrets.find((s) => s.validUntil > nowIso && digestsEqual(digest, s.hash));
    return overlap ? { validUntil: Date.parse(overlap.validUntil) } : null;
  });
  if (!valid) throw unknownCredential('API key');
  if (row.revokedAt) throw problems.unauthenticated('The API key has been revoked.', 'credential_revoked');
  if (row.expiresAt && row.expiresAt <= now) throw expiredCredential('API key');
  if (row.kind === 'embed') {
    // Embed keys are public by nature: they only work from the shop's own pages.
    if (!origin) throw problems.forbidden('An embed key must be used from a browser page (Origin header).', 'origin_required');
    if (!originAllowed(origin, row.allowedOrigins)) throw problems.forbidden(`Origin ${origin} is not allowed for this key.`, 'origin_not_allowed');
  }
  return { type: 'api_key', apiKeyId: row.id, keyId: row.keyId, kind: row.kind, organizationId: row.organizationId, scopes: row.scopes as Scope[] };
}

/**
 * The organisation travels in the token (`org`), chosen at sign-in or with
 * POST /v1/auth/switch-organization; the role is read fresh, so a changed or removed membership
 * takes effect at once.
 */
async function userPrincipal(deps: AuthenticateDeps, token: string): Promise<Principal> {
  const verified = await deps.accessTokens.verify(token);
  if (!verified.ok) throw verified.reason === 'expired' ? expiredCredential('access token') : unknownCredential('access token');
  const { claims } = verified;
  const [user] = await deps.db.select().from(users).where(eq(users.id, claims.sub));
  if (!user) throw unknownCredential('access token');

  const base = { type: 'user' as const, userId: user.id, email: user.email, operator: user.operator, sessionId: claims.sid };
  if (!claims.org) return { ...base, organizationId: null, role: null };
  if (user.operator) {
    const [org] = await deps.db.select({ id: organizations.id }).from(organizations).where(eq(organizations.id, claims.org));
    return { ...base, organizationId: org?.id ?? null, role: org ? 'admin' : null };
  }
  const [membership] = await deps.db
    .select({ role: memberships.role })
    .from(memberships)
    .where(and(eq(memberships.userId, user.id), eq(memberships.organizationId, claims.org)));
  // No longer a member: the token acts nowhere until the user switches.
  return { ...base, organizationId: membership ? claims.org : null, role: membership?.role ?? null };
}
