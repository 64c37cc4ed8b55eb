import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { POLICIES, type Policy } from '../../api/auth/policy.js';
import { ROLES, SCOPES, roleAtLeast, type Role, type Scope } from '../../api/auth/scopes.js';
import { scopeGranted } from '../../shared/tables/access.js';
import { createMember, createOperator, signIn, switchTo } from '../support/accounts.js';
import { mountedRoutes } from '../support/mounted-routes.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

// Served outside /v1 (docs, console): not governed by the policy table.
// /metrics is outside /v1 and its policy (scrape token or operator) is its own; tests/api/metrics.test.ts tries every kind of credential on it.
const OUTSIDE_API = new Set(['GET /openapi.json', 'GET /docs', 'GET /{*splat}', 'GET /metrics']);
const ORIGIN = 'https://shop.matrix.test';

let now = new Date('2026-12-01T10:00:00Z');
const clock = () => now;

interface Credential {
  name: string;
  token?: string;
  origin?: string;
  /** What this credential is, for the expectation: derived independently of authorize(). */
  headers?: Record<string, string>;
  as:
    | { kind: 'none' }
    | { kind: 'dead' }
    | { kind: 'key'; embed: boolean; scopes: readonly Scope[] }
    | { kind: 'user'; operator: boolean; role: Role | null };
}

let t: TestApp;
const credentials: Credential[] = [];

beforeAll(async () => {
  t = await createTestApp({}, clock);
  const org = await createOrganization(t, 'matrix-org');
  credentials.push({ name: 'no credentials', as: { kind: 'none' } });
  for (const scope of SCOPES) {
    credentials.push({ name: `secret key with ${scope}`, token: (await createKey(t, org.id, { scopes: [scope] })).token, as: { kind: 'key', embed: false, scopes: [scope] } });
  }
  const pub = await createKey(t, org.id, { kind: 'embed', allowedOrigins: [ORIGIN] });
  credentials.push({ name: 'embed key', token: pub.token, origin: ORIGIN, as: { kind: 'key', embed: true, scopes: ['sizing:run'] } });
  // A shop page's key that may also list the catalog (the embeddable estimator's key).
  const shopPage = await createKey(t, org.id, { kind: 'embed', scopes: ['sizing:run', 'catalog:read'], allowedOrigins: [ORIGIN] });
  credentials.push({ name: 'embed key with catalog:read', token: shopPage.token, origin: ORIGIN, as: { kind: 'key', embed: true, scopes: ['sizing:run', 'catalog:read'] } });

  const expiring = await createKey(t, org.id, { scopes: [...SCOPES], expiresAt: new Date(now.getTime() + 1000) });
  const revoked = await createKey(t, org.id, { scopes: [...SCOPES] });
  await t.app.locals.services.apiKeys.revoke(org.id, revoked.key.id);
  credentials.push({ name: 'expired key', token: expiring.token, as: { kind: 'dead' } });
  credentials.push({ name: 'revoked key', token: revoked.token, as: { kind: 'dead' } });
  credentials.push({ name: 'malformed token', token: 'tw_server_nope', as: { kind: 'dead' } });
  credentials.push({ name: 'forged access token', token: 'eyJhbGciOiJub25lIn0.eyJzdWIiOiJ4In0.', as: { kind: 'dead' } });

  for (const role of ROLES) {
    const { email } = await createMember(t.app, org.id, role);
    credentials.push({ name: `${role} user`, token: (await signIn(t.app, email)).accessToken, as: { kind: 'user', operator: false, role } });
  }
  const outsider = await t.app.locals.services.users.createUser({ email: 'no-org@members.test', name: 'No organisation', password: 'stair-glow-test-pass' });
  credentials.push({ name: 'user of no organisation', token: (await signIn(t.app, outsider.email)).accessToken, as: { kind: 'user', operator: false, role: null } });
  const operator = await createOperator(t.app);
  const opToken = (await signIn(t.app, operator.email)).accessToken;
  credentials.push({ name: 'operator', token: opToken, as: { kind: 'user', operator: true, role: null } });
  credentials.push({ name: 'operator in the organisation', token: await switchTo(t.app, opToken, 'matrix-org'), as: { kind: 'user', operator: true, role: 'admin' } });
  now = new Date(now.getTime() + 5000); // past the expiring key's expiry
});
afterAll(() => t.close());

/** The expected outcome, read from the policy by rules stated here rather than by authorize(). */
function expected(policy: Policy, cred: Credential): 'allow' | 'deny' {
  if (policy.public) return 'allow';
  // A key's own description: every server key, nobody else.
  if (policy.serverKeyItself) return cred.as.kind === 'key' && !cred.as.embed ? 'allow' : 'deny';
  if (cred.as.kind === 'user') {
    if (policy.operator) return cred.as.operator ? 'allow' : 'deny';
    if (!policy.role) return 'allow';
    return cred.as.role !== null && roleAtLeast(cred.as.role, policy.role) ? 'allow' : 'deny';
  }
  if (cred.as.kind !== 'key') return 'deny';
  if (policy.operator) return 'deny';
  if (!policy.scope) return 'deny';
  if (cred.as.embed && !policy.embed) return 'deny';
  return scopeGranted(cred.as.scopes, policy.scope) ? 'allow' : 'deny';
}

const concretePath = (pattern: string) => pattern.replace(/:(\w+)/g, '00000000-0000-4000-8000-000000000000');

describe('the policy table', () => {
  it('has an entry for every mounted route (a new route without one fails here)', () => {
    const documented = new Set(Object.keys(POLICIES).map((k) => k.replace(/:(\w+)/g, '{$1}')));
    const missing = mountedRoutes(t.app).filter((r) => !OUTSIDE_API.has(r) && !documented.has(r));
    expect(missing).toEqual([]);
  });

  it('lists no route that is not mounted', () => {
    const mounted = new Set(mountedRoutes(t.app));
    const stale = Object.keys(POLICIES).filter((k) => !mounted.has(k.replace(/:(\w+)/g, '{$1}')));
    expect(stale).toEqual([]);
  });
});

describe('every route × every credential', () => {
  const routes = Object.entries(POLICIES);
  it.each(routes)('%s', async (route, policy) => {
    const [method, pattern] = route.split(' ');
    const outcomes: string[] = [];
    for (const cred of credentials) {
      let r = request(t.app)[method.toLowerCase() as 'get' | 'post' | 'patch' | 'delete'](concretePath(pattern));
      if (cred.token) r = r.set('Authorization', `Bearer ${cred.token}`);
      if (cred.origin) r = r.set('Origin', cred.origin);
      for (const [name, value] of Object.entries(cred.headers ?? {})) r = r.set(name, value);
      const res = method === 'GET' || method === 'DELETE' ? await r : await r.send({});
      const got = res.status === 401 || res.status === 403 ? 'deny' : 'allow';
      const want = expected(policy, cred);
      if (got !== want) outcomes.push(`${cred.name}: expected ${want}, got ${res.status} ${res.body?.code ?? ''}`);
      if (want === 'deny') expect(res.headers['content-type'], `${route} ${cred.name}`).toContain('application/problem+json');
    }
    expect(outcomes).toEqual([]);
  });
});
