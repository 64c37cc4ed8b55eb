import { eq } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auditEvents } from '../../api/db/schema.js';
import { organizationPageSchema, organizationSchema, type OrganizationView } from '../../shared/schemas/accounts.js';
import { bearer, createMember, createOperator, signIn } from '../support/accounts.js';
import { createKey } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

let t: TestApp;
let operatorToken: string;
const created: Record<string, OrganizationView> = {};

beforeAll(async () => {
  t = await createTestApp({}, () => new Date('2026-12-01T09:00:00Z'));
  operatorToken = (await signIn(t.app, (await createOperator(t.app)).email)).accessToken;
  for (const [slug, name] of [
    ['harbor-lane', 'Harbor Lane Lighting'],
    ['kestrel-finch', 'Kestrel & Finch Builders'],
    ['quayside-studio', 'Quayside Studio'],
  ]) {
    const res = await request(t.app).post('/v1/organizations').set(bearer(operatorToken)).send({ slug, name }).expect(201);
    created[slug] = organizationSchema.parse(res.body);
  }
});
afterAll(() => t.close());

describe('POST /v1/organizations', () => {
  it('creates on the free plan by default, audited', async () => {
    const org = created['harbor-lane'];
    expect(org).toMatchObject({ slug: 'harbor-lane', name: 'Harbor Lane Lighting', planId: 'free' }); // default plan: api/db/schema.ts
    const [event] = await t.database.db.select().from(auditEvents).where(eq(auditEvents.targetId, org.id));
    expect(event).toMatchObject({ action: 'organization.created', organizationId: org.id, actorType: 'user' });
  });

  it('takes a plan, and refuses a taken slug (409) or an unknown plan (400)', async () => {
    // plan ids seeded in migrations/0001: free, shop, partner
    const res = await request(t.app).post('/v1/organizations').set(bearer(operatorToken)).send({ slug: 'alder-row', name: 'Alder Row', planId: 'shop' }).expect(201);
    expect(res.body.planId).toBe('shop');
    const taken = await request(t.app).post('/v1/organizations').set(bearer(operatorToken)).send({ slug: 'alder-row', name: 'Again' }).expect(409);
    expect(taken.body.code).toBe('slug_taken');
    const plan = await request(t.app).post('/v1/organizations').set(bearer(operatorToken)).send({ slug: 'no-plan', name: 'No plan', planId: 'gold' }).expect(400);
    expect(plan.body.code).toBe('unknown_plan');
    const slug = await request(t.app).post('/v1/organizations').set(bearer(operatorToken)).send({ slug: 'Bad Slug', name: 'Bad' }).expect(400);
    expect(slug.body.errors[0].path).toBe('slug');
  });

  it('is for the operator only: an admin or an API key is refused', async () => {
    const admin = await createMember(t.app, created['harbor-lane'].id, 'admin');
    const adminToken = (await signIn(t.app, admin.email)).accessToken;
    const res = await request(t.app).post('/v1/organizations').set(bearer(adminToken)).send({ slug: 'sneaky', name: 'Sneaky' }).expect(403);
    expect(res.body.code).toBe('operator_only');
    const { token } = await createKey(t, created['harbor-lane'].id, { scopes: ['keys:manage', 'usage:read'] });
    await request(t.app).post('/v1/organizations').set(bearer(token)).send({ slug: 'sneaky', name: 'Sneaky' }).expect(403);
  });
});

describe('GET /v1/organizations', () => {
  it('shows the operator every organisation, page by page, by slug', async () => {
    const slugs: string[] = [];
    let cursor: string | undefined;
    do {
      const res = await request(t.app)
        .get('/v1/organizations')
        .query({ limit: 2, ...(cursor ? { cursor } : {}) })
        .set(bearer(operatorToken))
        .expect(200);
      const page = organizationPageSchema.parse(res.body);
      slugs.push(...page.items.map((o) => o.slug));
      cursor = page.nextCursor ?? undefined;
    } while (cursor);
    expect(slugs).toEqual([...slugs].sort());
    expect(slugs).toEqual(expect.arrayContaining(['harbor-lane', 'kestrel-finch', 'quayside-studio']));
    expect(new Set(slugs).size).toBe(slugs.length);
  });

  it('shows a user only their own organisations, and a key only its own', async () => {
    const both = await createMember(t.app, created['kestrel-finch'].id, 'viewer');
    await t.app.locals.services.members.addMember({ organizationId: created['quayside-studio'].id, userId: both.user.id, role: 'estimator' });
    const userToken = (await signIn(t.app, both.email)).accessToken;
    const mine = organizationPageSchema.parse((await request(t.app).get('/v1/organizations').set(bearer(userToken)).expect(200)).body);
    expect(mine.items.map((o) => o.slug)).toEqual(['kestrel-finch', 'quayside-studio']);

    const { token } = await createKey(t, created['quayside-studio'].id, { scopes: ['usage:read'] });
    const keyView = organizationPageSchema.parse((await request(t.app).get('/v1/organizations').set(bearer(token)).expect(200)).body);
    expect(keyView.items.map((o) => o.slug)).toEqual(['quayside-studio']);
  });

  it('needs usage:read on a key', async () => {
    const { token } = await createKey(t, created['quayside-studio'].id, { scopes: ['sizing:run'] });
    const res = await request(t.app).get('/v1/organizations').set(bearer(token)).expect(403);
    expect(res.body.code).toBe('insufficient_scope');
  });
});

describe('GET /v1/organizations/:id', () => {
  it('answers members, own keys and the operator; anyone else gets 404', async () => {
    const harbor = created['harbor-lane'];
    const kestrel = created['kestrel-finch'];
    const member = await createMember(t.app, harbor.id, 'viewer');
    const memberToken = (await signIn(t.app, member.email)).accessToken;
    expect((await request(t.app).get(`/v1/organizations/${harbor.id}`).set(bearer(memberToken)).expect(200)).body).toEqual(harbor);
    const other = await request(t.app).get(`/v1/organizations/${kestrel.id}`).set(bearer(memberToken)).expect(404);
    expect(other.body.code).toBe('not_found');

    const { token } = await createKey(t, harbor.id, { scopes: ['usage:read'] });
    await request(t.app).get(`/v1/organizations/${harbor.id}`).set(bearer(token)).expect(200);
    await request(t.app).get(`/v1/organizations/${kestrel.id}`).set(bearer(token)).expect(404);

    await request(t.app).get(`/v1/organizations/${kestrel.id}`).set(bearer(operatorToken)).expect(200);
    await request(t.app).get('/v1/organizations/00000000-0000-4000-8000-000000000000').set(bearer(operatorToken)).expect(404);
  });
});

describe('PATCH /v1/organizations/:id', () => {
  it('lets the operator rename and change the plan, audited from → to', async () => {
    const quay = created['quayside-studio'];
    const res = await request(t.app).patch(`/v1/organizations/${quay.id}`).set(bearer(operatorToken)).send({ name: 'Quayside Studio Ltd', planId: 'partner' }).expect(200);
    expect(res.body).toMatchObject({ id: quay.id, slug: 'quayside-studio', name: 'Quayside Studio Ltd', planId: 'partner' });
    const events = (await t.database.db.select().from(auditEvents).where(eq(auditEvents.action, 'organization.updated'))).filter((e) => e.targetId === quay.id);
    expect(events).toHaveLength(1);
    expect(events[0].data).toEqual({ name: { from: 'Quayside Studio', to: 'Quayside Studio Ltd' }, planId: { from: 'free', to: 'partner' } });
    const empty = await request(t.app).patch(`/v1/organizations/${quay.id}`).set(bearer(operatorToken)).send({}).expect(400);
    expect(empty.body.code).toBe('validation_failed');
  });

  it('refuses an organisation’s own admin', async () => {
    const harbor = created['harbor-lane'];
    const admin = await createMember(t.app, harbor.id, 'admin');
    const adminToken = (await signIn(t.app, admin.email)).accessToken;
    await request(t.app).patch(`/v1/organizations/${harbor.id}`).set(bearer(adminToken)).send({ planId: 'partner' }).expect(403);
    expect((await t.app.locals.services.organizations.get(harbor.id))?.planId).toBe('free');
  });
});
