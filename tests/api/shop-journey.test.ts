import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { estimateExamples } from '../../shared/schemas/estimate-examples.js';
import { createOperator, signIn, switchTo } from '../support/accounts.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

// The "done when", end to end through the API only: a shop admin is invited, signs in,
// creates a embed key for the shop's origin and a secret key, sizes a stair with each,
// sees the calls counted, hits the rate limit, and rotates and revokes keys.
let now = new Date('2026-12-01T09:00:00Z');
let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({}, () => now);
});
afterAll(() => t.close());

const SHOP = 'https://shop.harborlane.test';
const auth = (token: string) => ({ Authorization: `Bearer ${token}` });

describe('a shop comes on board', () => {
  it('goes from invitation to counted, limited, rotated and revoked keys', async () => {
    const operator = await createOperator(t.app);
    const ops = (await signIn(t.app, operator.email)).accessToken;

    const org = await request(t.app).post('/v1/organizations').set(auth(ops)).send({ slug: 'harbor-lane', name: 'Harbor Lane Lighting' }).expect(201);
    const orgId = org.body.id ?? org.body.organization?.id;
    expect(orgId).toBeTruthy();
    const opsInHarbor = await switchTo(t.app, ops, 'harbor-lane');
    await request(t.app)
      .post('/v1/members/invitations')
      .set(auth(opsInHarbor))
      .send({ email: 'mira@harborlane.test', role: 'admin' })
      .expect(201);

    const outbox = await request(t.app).get('/v1/dev/outbox').set(auth(ops)).expect(200);
    const invite = outbox.body.items.find((m: { to: string; subject: string }) => m.to === 'mira@harborlane.test');
    const inviteToken = /token=([^\s&]+)/.exec(invite.text)![1];
    await request(t.app).post('/v1/auth/invitations/accept').send({ token: decodeURIComponent(inviteToken), name: 'Mira', password: 'harbor-lane-pass-1' }).expect(200);

    const mira = (await signIn(t.app, 'mira@harborlane.test', 'harbor-lane-pass-1')).accessToken;
    const pub = await request(t.app).post('/v1/keys').set(auth(mira)).send({ name: 'Product pages', kind: 'embed', allowedOrigins: [SHOP] }).expect(201);
    const sec = await request(t.app).post('/v1/keys').set(auth(mira)).send({ name: 'Checkout', scopes: ['sizing:run', 'usage:read'] }).expect(201);

    const fromPage = await request(t.app).post('/v1/estimates').set(auth(pub.body.token)).set('Origin', SHOP).send(estimateExamples.alderRowTownhouse).expect(200);
    expect(fromPage.headers['access-control-allow-origin']).toBe(SHOP);
    await request(t.app).post('/v1/estimates').set(auth(sec.body.token)).send(estimateExamples.alderRowTownhouse).expect(200);

    const usage = await request(t.app).get('/v1/usage').set(auth(sec.body.token)).expect(200);
    expect(usage.body.totals.requests).toBeGreaterThanOrEqual(2);

    // The free plan's per-minute rate (migrations/0001: 60/min): keep calling until refused.
    let limited: request.Response | undefined;
    for (let i = 0; i < 80 && !limited; i++) {
      const res = await request(t.app).post('/v1/calculations/reels').set(auth(sec.body.token)).send({ piecesMm: [850] });
      if (res.status === 429) limited = res;
      else expect(res.status).toBe(200);
    }
    expect(limited?.body.code).toBe('rate_limited');
    expect(Number(limited?.headers['retry-after'])).toBeGreaterThan(0);
    expect(limited?.headers['ratelimit']).toBeTruthy();

    const rotated = await request(t.app).post(`/v1/keys/${sec.body.key.id}/rotate`).set(auth(mira)).send({ overlapHours: 0 }).expect(200);
    await request(t.app).post('/v1/estimates').set(auth(sec.body.token)).send(estimateExamples.alderRowTownhouse).expect(401);
    await request(t.app).post(`/v1/keys/${pub.body.key.id}/revoke`).set(auth(mira)).expect(200);
    await request(t.app).post('/v1/estimates').set(auth(pub.body.token)).set('Origin', SHOP).send(estimateExamples.alderRowTownhouse).expect(401);

    const audit = await request(t.app).get('/v1/audit-events?limit=100').set(auth(mira)).expect(200);
    const actions = audit.body.items.map((e: { action: string }) => e.action);
    for (const action of ['member.joined', 'api_key.created', 'api_key.rotated', 'api_key.revoked']) expect(actions).toContain(action);
    expect(rotated.body.token).not.toBe(sec.body.token);
  });
});
