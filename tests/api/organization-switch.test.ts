import { decodeJwt } from 'jose';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sessionSchema, switchedOrganizationSchema } from '../../shared/schemas/accounts.js';
import { bearer, createMember, createOperator, signIn, TEST_PASSWORD } from '../support/accounts.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

// The organisation a console user acts in travels in the access token; switching issues a new one.
let t: TestApp;
let harbor: { id: string };
let kestrel: { id: string };
let quayside: { id: string };

beforeAll(async () => {
  t = await createTestApp();
  harbor = await createOrganization(t, 'harbor-lane');
  kestrel = await createOrganization(t, 'kestrel-finch');
  quayside = await createOrganization(t, 'quayside-studio');
});
afterAll(() => t.close());

const members = (token: string) => request(t.app).get('/v1/members').set(bearer(token));
const switchOrg = (token: string, organization: string) => request(t.app).post('/v1/auth/switch-organization').set(bearer(token)).send({ organization });

describe('POST /v1/auth/switch-organization', () => {
  it('acts in the first membership at sign-in, names it in the token and switches to another membership', async () => {
    const { user, email } = await createMember(t.app, harbor.id, 'admin', 'two-orgs@members.test');
    await t.app.locals.services.members.addMember({ organizationId: kestrel.id, userId: user.id, role: 'viewer' });
    const session = sessionSchema.parse((await request(t.app).post('/v1/auth/sign-in').send({ email, password: TEST_PASSWORD }).expect(200)).body);
    expect(session.organization?.slug).toBe('harbor-lane'); // memberships are listed by slug; the first is the default
    expect(decodeJwt(session.accessToken).org).toBe(harbor.id);
    expect((await members(session.accessToken).expect(200)).body.items.map((m: { email: string }) => m.email)).toContain(email);

    const switched = switchedOrganizationSchema.parse((await switchOrg(session.accessToken, 'kestrel-finch').expect(200)).body);
    expect(switched).toMatchObject({ organization: { id: kestrel.id, slug: 'kestrel-finch' }, role: 'viewer' });
    expect(decodeJwt(switched.accessToken).org).toBe(kestrel.id);
    // As a viewer in Kestrel & Finch: may list members but not invite.
    await members(switched.accessToken).expect(200);
    const invite = await request(t.app).post('/v1/members/invitations').set(bearer(switched.accessToken)).send({ email: 'x@kestrelfinch.test', role: 'viewer' }).expect(403);
    expect(invite.body.code).toBe('insufficient_role');
    // The old token still acts where it was issued.
    await request(t.app).post('/v1/members/invitations').set(bearer(session.accessToken)).send({ email: 'y@harborlane.test', role: 'viewer' }).expect(201);
  });

  it('keeps the organisation last switched to across a refresh', async () => {
    const { user, email } = await createMember(t.app, harbor.id, 'estimator', 'refresher@members.test');
    await t.app.locals.services.members.addMember({ organizationId: quayside.id, userId: user.id, role: 'admin' });
    const session = await signIn(t.app, email);
    await switchOrg(session.accessToken, quayside.id).expect(200);
    const refreshed = sessionSchema.parse((await request(t.app).post('/v1/auth/refresh').send({ refreshToken: session.refreshToken }).expect(200)).body);
    expect(refreshed.organization?.id).toBe(quayside.id);
    expect(decodeJwt(refreshed.accessToken).org).toBe(quayside.id);
    // and once more, from the rotated refresh token
    const again = sessionSchema.parse((await request(t.app).post('/v1/auth/refresh').send({ refreshToken: refreshed.refreshToken }).expect(200)).body);
    expect(again.organization?.slug).toBe('quayside-studio');
  });

  it('answers 404 for an organisation the user does not belong to, by slug or by id', async () => {
    const { email } = await createMember(t.app, harbor.id, 'admin', 'one-org@members.test');
    const { accessToken } = await signIn(t.app, email);
    expect((await switchOrg(accessToken, 'kestrel-finch').expect(404)).body.code).toBe('not_found');
    await switchOrg(accessToken, kestrel.id).expect(404);
    await switchOrg(accessToken, 'no-such-org').expect(404);
  });

  it('lets the operator act in any organisation, as its admin, and platform-wide before switching', async () => {
    const ops = await createOperator(t.app);
    const session = await signIn(t.app, ops.email);
    expect(session.organization).toBeNull();
    expect((await members(session.accessToken).expect(403)).body.code).toBe('organization_required');
    const switched = switchedOrganizationSchema.parse((await switchOrg(session.accessToken, 'quayside-studio').expect(200)).body);
    expect(switched.role).toBe('admin');
    await members(switched.accessToken).expect(200);
  });

  it('acts nowhere once the membership named in the token is removed', async () => {
    await createMember(t.app, kestrel.id, 'admin', 'staying@members.test'); // an organisation keeps an admin
    const { member, email } = await createMember(t.app, kestrel.id, 'estimator', 'leaving@members.test');
    const { accessToken } = await signIn(t.app, email);
    await members(accessToken).expect(200);
    await t.app.locals.services.members.remove(kestrel.id, member.id);
    expect((await members(accessToken).expect(403)).body.code).toBe('organization_required');
  });

  it('is for console users: API keys get 403, a signed-out session 401 credential_revoked', async () => {
    const { token } = await createKey(t, harbor.id, { scopes: ['sizing:run', 'usage:read', 'keys:manage'] });
    await switchOrg(token, 'kestrel-finch').expect(403);
    const { email } = await createMember(t.app, harbor.id, 'viewer', 'signing-out@members.test');
    const session = await signIn(t.app, email);
    await request(t.app).post('/v1/auth/sign-out').send({ refreshToken: session.refreshToken }).expect(204);
    expect((await switchOrg(session.accessToken, 'harbor-lane').expect(401)).body.code).toBe('credential_revoked');
  });
});

describe('credential failure codes', () => {
  it('answers credential_missing without credentials and credential_unknown for an old-format key', async () => {
    expect((await request(t.app).get('/v1/members').expect(401)).body.code).toBe('credential_missing');
    const { token } = await createKey(t, harbor.id);
    const oldFormat = token.replace(/^tw_server_/, 'tw_old_'); // any other prefix, as an earlier format would have
    const res = await request(t.app).post('/v1/calculations/reels').set(bearer(oldFormat)).send({ piecesMm: [850] }).expect(401);
    expect(res.body.code).toBe('credential_unknown');
    await request(t.app).post('/v1/calculations/reels').set(bearer(token)).send({ piecesMm: [850] }).expect(200);
  });
});

describe('lists', () => {
  it('answer { items, nextCursor } with nextCursor null on the last page, and cap the page size at 200', async () => {
    const { email } = await createMember(t.app, quayside.id, 'admin', 'lister@members.test');
    const { accessToken } = await signIn(t.app, email);
    const page = await request(t.app).get('/v1/members?limit=1').set(bearer(accessToken)).expect(200);
    expect(Object.keys(page.body).sort()).toEqual(['items', 'nextCursor']);
    let cursor: string | null = page.body.nextCursor;
    let seen = page.body.items.length;
    while (cursor) {
      const next = await request(t.app).get(`/v1/members?limit=1&cursor=${encodeURIComponent(cursor)}`).set(bearer(accessToken)).expect(200);
      seen += next.body.items.length;
      cursor = next.body.nextCursor;
    }
    expect(cursor).toBeNull();
    expect(seen).toBeGreaterThanOrEqual(2);
    await request(t.app).get('/v1/members?limit=200').set(bearer(accessToken)).expect(200);
    const over = await request(t.app).get('/v1/members?limit=201').set(bearer(accessToken)).expect(400);
    expect(over.body.errors[0].path).toBe('limit');
  });
});
