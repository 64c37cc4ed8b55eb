import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { outboxPageSchema, type Session } from '../../shared/schemas/accounts.js';
import { bearer, createMember, createOperator, signIn, TEST_PASSWORD } from '../support/accounts.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { mountedRoutes } from '../support/mounted-routes.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

let now = new Date('2026-12-01T09:00:00Z');
const clock = () => now;

let t: TestApp;
let operatorToken: string;
let harbor: { id: string };
let adminToken: string;

beforeAll(async () => {
  t = await createTestApp({ PUBLIC_URL: 'https://console.treadwise.test' }, clock);
  operatorToken = (await signIn(t.app, (await createOperator(t.app, 'ops@treadwise.test')).email)).accessToken;
  harbor = await createOrganization(t, 'harbor-lane');
  adminToken = (await signIn(t.app, (await createMember(t.app, harbor.id, 'admin', 'mira@harborlane.test')).email)).accessToken;
});
afterAll(() => t.close());

describe('the invitation e-mail flow', () => {
  it('puts the invitation in the outbox, and its link signs the member up once only', async () => {
    await request(t.app).post('/v1/members/invitations').set(bearer(adminToken)).send({ email: 'theo@harborlane.test', role: 'estimator' }).expect(201);

    const outbox = outboxPageSchema.parse((await request(t.app).get('/v1/dev/outbox').set(bearer(operatorToken)).expect(200)).body);
    const message = outbox.items.find((m) => m.to === 'theo@harborlane.test');
    expect(message?.subject).toBe('You are invited to Test harbor-lane on Treadwise');
    const link = /(https:\/\/console\.treadwise\.test\/accept-invitation\?token=[A-Za-z0-9_%-]+)/.exec(message?.text ?? '');
    expect(link, 'a link to PUBLIC_URL/accept-invitation').not.toBeNull();
    const token = new URL(link![1]).searchParams.get('token')!;

    const first = await request(t.app).post('/v1/auth/invitations/accept').send({ token, name: 'Theo', password: TEST_PASSWORD }).expect(200);
    const session = first.body as Session;
    expect(session.user.email).toBe('theo@harborlane.test');
    expect(session.memberships).toEqual([{ organization: { id: harbor.id, slug: 'harbor-lane', name: 'Test harbor-lane' }, role: 'estimator' }]);

    const second = await request(t.app).post('/v1/auth/invitations/accept').send({ token, name: 'Mallory', password: 'another-password-1' }).expect(400);
    expect(second.body.code).toBe('invalid_token');
    // the first sign-up stands: Theo's password still works, the second one does not
    await signIn(t.app, 'theo@harborlane.test', TEST_PASSWORD);
    await request(t.app).post('/v1/auth/sign-in').send({ email: 'theo@harborlane.test', password: 'another-password-1' }).expect(401);
  });
});

describe('GET /v1/dev/outbox', () => {
  it('is for the operator only', async () => {
    await request(t.app).get('/v1/dev/outbox').expect(401);
    const admin = await request(t.app).get('/v1/dev/outbox').set(bearer(adminToken)).expect(403);
    expect(admin.body.code).toBe('operator_only');
    const { token } = await createKey(t, harbor.id, { scopes: ['keys:manage', 'usage:read'] });
    await request(t.app).get('/v1/dev/outbox').set(bearer(token)).expect(403);
  });

  it('pages through every message, newest first', async () => {
    for (const who of ['ines', 'ada', 'bo']) {
      now = new Date(now.getTime() + 1000);
      await t.app.locals.services.mailer.send({ to: `${who}@harborlane.test`, subject: `Note for ${who}`, text: 'A test message.' });
    }
    const subjects: string[] = [];
    const times: string[] = [];
    let cursor: string | undefined;
    do {
      const res = await request(t.app)
        .get('/v1/dev/outbox')
        .query({ limit: 2, ...(cursor ? { cursor } : {}) })
        .set(bearer(operatorToken))
        .expect(200);
      const page = outboxPageSchema.parse(res.body);
      subjects.push(...page.items.map((m) => m.subject));
      times.push(...page.items.map((m) => m.createdAt));
      cursor = page.nextCursor ?? undefined;
    } while (cursor);
    expect(subjects.filter((s) => s.startsWith('Note for'))).toEqual(['Note for bo', 'Note for ada', 'Note for ines']);
    expect(times).toEqual([...times].sort().reverse());
  });
});

describe('with SMTP configured', () => {
  it('does not exist: not mounted, and 404 even for the operator', async () => {
    const smtp = await createTestApp({ SMTP_URL: 'smtp://mail.treadwise.test:25' }, clock);
    try {
      expect(mountedRoutes(smtp.app)).not.toContain('GET /v1/dev/outbox');
      expect(mountedRoutes(t.app)).toContain('GET /v1/dev/outbox'); // the control: present without SMTP
      const ops = await createOperator(smtp.app);
      const token = (await signIn(smtp.app, ops.email)).accessToken;
      const res = await request(smtp.app).get('/v1/dev/outbox').set(bearer(token)).expect(404);
      expect(res.body.code).toBe('not_found');
    } finally {
      await smtp.close();
    }
  });
});
