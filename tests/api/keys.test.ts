import request from 'supertest';
import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hashSecret, parseKey } from '../../api/auth/key-format.js';
import { apiKeys, auditEvents, idempotencyRecords, organizations } from '../../api/db/schema.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

let now = new Date('2026-12-01T10:00:00Z');
const clock = () => now;
const advance = (ms: number) => (now = new Date(now.getTime() + ms));

let t: TestApp;
let orgA: { id: string };
let orgB: { id: string };
let managerA: string;
let managerB: string;
const VD = { supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 } };

beforeAll(async () => {
  t = await createTestApp({}, clock);
  orgA = await createOrganization(t, 'harbor-lane-test');
  // The internal plan: these tests create far more keys than a free organisation may hold.
  await t.database.db.update(organizations).set({ planId: 'platform' }).where(eq(organizations.id, orgA.id));
  orgB = await createOrganization(t, 'kestrel-finch-test');
  managerA = (await createKey(t, orgA.id, { scopes: ['keys:manage', 'sizing:run', 'usage:read'] })).token;
  managerB = (await createKey(t, orgB.id, { scopes: ['keys:manage', 'sizing:run'] })).token;
});
afterAll(() => t.close());

const as = (token: string) => ({
  get: (path: string) => request(t.app).get(path).set('Authorization', `Bearer ${token}`),
  post: (path: string, body?: object) => request(t.app).post(path).set('Authorization', `Bearer ${token}`).send(body ?? {}),
});
const size = (token: string, origin?: string) => {
  const r = request(t.app).post('/v1/calculations/voltage-drop').set('Authorization', `Bearer ${token}`);
  return (origin ? r.set('Origin', origin) : r).send(VD);
};

async function newSecretKey(scopes = ['sizing:run']) {
  const res = await as(managerA).post('/v1/keys', { name: 'Checkout server', scopes }).expect(201);
  return res.body as { key: { id: string; keyId: string }; token: string };
}

describe('creating keys', () => {
  it('shows the whole key once and stores only an HMAC of its secret', async () => {
    const { key, token } = await newSecretKey();
    expect(token).toMatch(/^tw_server_[a-z2-7]{12}_[A-Za-z0-9_-]{32}$/);
    const parsed = parseKey(token)!;
    expect(parsed.keyId).toBe(key.keyId);

    const [row] = await t.database.db.select().from(apiKeys).where(eq(apiKeys.id, key.id));
    expect(row.secretHash).toBe(hashSecret(t.secrets.pepper, key.keyId, parsed.secret));
    expect(JSON.stringify(row)).not.toContain(parsed.secret);

    const listed = await as(managerA).get('/v1/keys').expect(200);
    expect(JSON.stringify(listed.body)).not.toContain(parsed.secret);
    expect(JSON.stringify(listed.body)).not.toContain(row.secretHash);
    const one = await as(managerA).get(`/v1/keys/${key.id}`).expect(200);
    expect(one.body.token).toBeUndefined();
    expect(one.body.keyId).toBe(key.keyId);

    await size(token).expect(200);
  });

  it('never grants more scopes than the creator holds', async () => {
    const res = await as(managerA).post('/v1/keys', { name: 'Too much', scopes: ['catalog:write'] }).expect(403);
    expect(res.body.code).toBe('scope_exceeds_creator');
    expect(res.body.errors[0].path).toBe('scopes');
  });

  it('requires allowed origins on a embed key and gives it sizing only', async () => {
    const missing = await as(managerA).post('/v1/keys', { name: 'Pages', kind: 'embed' }).expect(400);
    expect(missing.body.errors.map((e: { path: string }) => e.path)).toContain('allowedOrigins');
    const wide = await as(managerA).post('/v1/keys', { name: 'Pages', kind: 'embed', allowedOrigins: ['https://shop.example.test'], scopes: ['usage:read'] }).expect(400);
    expect(wide.body.errors.map((e: { path: string }) => e.path)).toContain('scopes');
  });

  it('records api_key.created in the audit trail without the secret', async () => {
    const { key, token } = await newSecretKey();
    const events = await t.database.db.select().from(auditEvents).where(eq(auditEvents.targetId, key.keyId));
    expect(events.map((e) => e.action)).toEqual(['api_key.created']);
    expect(JSON.stringify(events)).not.toContain(parseKey(token)!.secret);
  });

  it('replays a create with the same Idempotency-Key and refuses the key with another body', async () => {
    const first = await as(managerA).post('/v1/keys', { name: 'Retry-safe' }).set('Idempotency-Key', 'create-1').expect(201);
    const again = await as(managerA).post('/v1/keys', { name: 'Retry-safe' }).set('Idempotency-Key', 'create-1').expect(201);
    // No marker header: the replay is byte for byte the first answer, its requestId the first call's.
    expect(again.text).toBe(first.text);
    expect(first.body.requestId).toBe(first.headers['x-request-id']);
    expect(again.body.requestId).not.toBe(again.headers['x-request-id']);
    expect(Object.keys(again.headers).filter((h) => /replay/i.test(h))).toEqual([]);
    const other = await as(managerA).post('/v1/keys', { name: 'Something else' }).set('Idempotency-Key', 'create-1').expect(422);
    expect(other.body.code).toBe('idempotency_key_reused');
  });
});

describe('what a key may do to other keys', () => {
  it('cannot rotate or revoke a key with scopes it does not hold', async () => {
    const narrow = await as(managerA).post('/v1/keys', { name: 'Key admin only', scopes: ['keys:manage'] }).expect(201);
    const strong = await newSecretKey(['sizing:run', 'usage:read']);
    expect((await as(narrow.body.token).post(`/v1/keys/${strong.key.id}/rotate`, {}).expect(403)).body.code).toBe('scope_exceeds_caller');
    expect((await as(narrow.body.token).post(`/v1/keys/${strong.key.id}/revoke`).expect(403)).body.code).toBe('scope_exceeds_caller');
    await size(strong.token).expect(200);
  });

  it('cannot make a key that outlives it', async () => {
    const parent = await as(managerA).post('/v1/keys', { name: 'Temporary manager', scopes: ['keys:manage', 'sizing:run'], expiresAt: new Date(now.getTime() + 3600_000).toISOString() }).expect(201);
    const forever = await as(parent.body.token).post('/v1/keys', { name: 'Forever' }).expect(403);
    expect(forever.body.code).toBe('expiry_exceeds_creator');
    await as(parent.body.token).post('/v1/keys', { name: 'Within', expiresAt: new Date(now.getTime() + 1800_000).toISOString() }).expect(201);
  });

  it('refuses an origin whose port does not exist', async () => {
    for (const origin of ['https://shop.example.test:99999', 'https://shop.example.test:0']) {
      const res = await as(managerA).post('/v1/keys', { name: 'Bad port', kind: 'embed', allowedOrigins: [origin] }).expect(400);
      expect(res.body.errors[0].path).toBe('allowedOrigins.0');
    }
    await as(managerA).post('/v1/keys', { name: 'Good port', kind: 'embed', allowedOrigins: ['https://shop.example.test:8443'] }).expect(201);
  });

  it('refuses a wildcard origin over a whole top-level domain', async () => {
    const res = await as(managerA).post('/v1/keys', { name: 'Too wide', kind: 'embed', allowedOrigins: ['https://*.test'] }).expect(400);
    expect(res.body.errors.map((e: { path: string }) => e.path)).toContain('allowedOrigins.0');
  });

  it('replays a created key’s secret only to the same credential and only for 10 minutes', async () => {
    const first = await as(managerA).post('/v1/keys', { name: 'Short replay' }).set('Idempotency-Key', 'short-1').expect(201);
    // Another credential of the same organisation with the same Idempotency-Key is another request.
    const otherManager = (await createKey(t, orgA.id, { scopes: ['keys:manage', 'sizing:run'] })).token;
    const other = await as(otherManager).post('/v1/keys', { name: 'Short replay' }).set('Idempotency-Key', 'short-1').expect(201);
    expect(other.body.token).not.toBe(first.body.token);
    advance(10 * 60_000 - 1000);
    expect((await as(managerA).post('/v1/keys', { name: 'Short replay' }).set('Idempotency-Key', 'short-1').expect(201)).body.token).toBe(first.body.token);
    advance(2000);
    const late = await as(managerA).post('/v1/keys', { name: 'Short replay' }).set('Idempotency-Key', 'short-1').expect(409);
    expect(late.body.code).toBe('idempotency_replay_expired');
    expect(late.text).not.toContain(first.body.token);
  });

  it('keeps a replayable create only encrypted: the token is not in the database', async () => {
    const res = await as(managerA).post('/v1/keys', { name: 'Sealed' }).set('Idempotency-Key', 'sealed-1').expect(201);
    const rows = await t.database.db.select().from(idempotencyRecords).where(eq(idempotencyRecords.key, 'sealed-1'));
    expect(rows).toHaveLength(1);
    expect(JSON.stringify(rows[0].body)).not.toContain(parseKey(res.body.token)!.secret);
  });
});

describe('using keys', () => {
  it('refuses malformed and tampered keys', async () => {
    const { token } = await newSecretKey();
    for (const bad of ['tw_server_short', `${token.slice(0, -1)}${token.endsWith('A') ? 'B' : 'A'}`, token.replace('tw_server_', 'tw_embed_'), token.toUpperCase()]) {
      const res = await size(bad);
      expect(res.status, bad).toBe(401);
      expect(res.headers['content-type']).toContain('application/problem+json');
    }
  });

  it('refuses a key without the scope the route needs', async () => {
    const { token } = await newSecretKey(['usage:read']);
    const res = await size(token).expect(403);
    expect(res.body.code).toBe('insufficient_scope');
  });

  it('stops an expired key', async () => {
    const res = await as(managerA).post('/v1/keys', { name: 'Short-lived', expiresAt: new Date(now.getTime() + 60_000).toISOString() }).expect(201);
    await size(res.body.token).expect(200);
    advance(61_000);
    expect((await size(res.body.token).expect(401)).body.code).toBe('credential_expired');
  });
});

describe('rotating and revoking', () => {
  it('keeps the old secret working for the overlap, then only the new one', async () => {
    const { key, token: oldToken } = await newSecretKey();
    const rotated = await as(managerA).post(`/v1/keys/${key.id}/rotate`, { overlapHours: 1 }).expect(200);
    const newToken = rotated.body.token as string;
    expect(parseKey(newToken)!.keyId).toBe(key.keyId);
    await size(oldToken).expect(200);
    await size(newToken).expect(200);
    advance(3601_000);
    await size(oldToken).expect(401);
    await size(newToken).expect(200);
  });

  it('ends the old secret at once with an overlap of 0', async () => {
    const { key, token } = await newSecretKey();
    await size(token).expect(200); // now cached by the hot path
    const rotated = await as(managerA).post(`/v1/keys/${key.id}/rotate`, { overlapHours: 0 }).expect(200);
    await size(token).expect(401);
    await size(rotated.body.token).expect(200);
  });

  it('serialises concurrent rotations: every token handed out works, and every overlap granted is honoured', async () => {
    const { key, token: original } = await newSecretKey();
    const answers = await Promise.all([1, 2, 3].map(() => as(managerA).post(`/v1/keys/${key.id}/rotate`, { overlapHours: 2 })));
    const won = answers.filter((r) => r.status === 200);
    const refused = answers.filter((r) => r.status !== 200);
    expect(won.length).toBeGreaterThanOrEqual(1);
    for (const r of refused) expect(r.body).toEqual(expect.objectContaining({ status: 409, code: 'rotation_in_progress' }));
    // The original and every secret handed out work until their overlaps end; the newest for good.
    for (const tok of [original, ...won.map((r) => r.body.token as string)]) await size(tok).expect(200);
    advance(2 * 3600_000 - 1000);
    for (const tok of [original, ...won.map((r) => r.body.token as string)]) await size(tok).expect(200);
    advance(2000);
    await size(original).expect(401);
    await size(won.at(-1)!.body.token).expect(200);
  });

  it('refuses a rotation while another of the same key runs (409 rotation_in_progress)', async () => {
    const { key } = await newSecretKey();
    const tries = await Promise.allSettled([1, 2, 3, 4].map(() => t.app.locals.services.apiKeys.rotate(orgA.id, key.id, 1)));
    expect(tries.filter((r) => r.status === 'fulfilled')).toHaveLength(1);
    for (const r of tries.filter((x): x is PromiseRejectedResult => x.status === 'rejected')) expect(r.reason).toMatchObject({ status: 409, code: 'rotation_in_progress' });
  });

  it('keeps an earlier overlap running through a later rotation', async () => {
    const { key, token: first } = await newSecretKey();
    const second = (await as(managerA).post(`/v1/keys/${key.id}/rotate`, { overlapHours: 48 }).expect(200)).body.token as string;
    advance(3600_000);
    const third = (await as(managerA).post(`/v1/keys/${key.id}/rotate`, { overlapHours: 0 }).expect(200)).body;
    // The second secret was given no overlap; the first keeps the 48 h it was granted.
    await size(second).expect(401);
    await size(first).expect(200);
    expect(third.key.previousSecretValidUntil).toBe(new Date(now.getTime() + 47 * 3600_000).toISOString());
    advance(47 * 3600_000);
    await size(first).expect(401);
    await size(third.token).expect(200);
  });

  it('revokes at once, even a key the hot path has cached', async () => {
    const { key, token } = await newSecretKey();
    await size(token).expect(200);
    const revoked = await as(managerA).post(`/v1/keys/${key.id}/revoke`).expect(200);
    expect(revoked.body.status).toBe('revoked');
    expect((await size(token).expect(401)).body.code).toBe('credential_revoked');
    await as(managerA).post(`/v1/keys/${key.id}/rotate`, {}).expect(409);
  });
});

describe('embed keys in the browser', () => {
  let pub: string;
  beforeAll(async () => {
    const res = await as(managerA)
      .post('/v1/keys', { name: 'Product pages', kind: 'embed', allowedOrigins: ['https://shop.harborlane.test', 'https://*.harborlane.test'] })
      .expect(201);
    pub = res.body.token;
  });

  it('works from an allowed origin and answers with CORS headers the page can read', async () => {
    const res = await size(pub, 'https://shop.harborlane.test').expect(200);
    expect(res.headers['access-control-allow-origin']).toBe('https://shop.harborlane.test');
    expect(res.headers['access-control-expose-headers']).toContain('X-Request-Id');
    expect(res.headers['access-control-expose-headers']).toContain('RateLimit');
    await size(pub, 'https://checkout.eu.harborlane.test').expect(200);
  });

  it('answers CORS only on the sizing routes, and only for the presented embed key’s origins', async () => {
    const SHOP = 'https://shop.harborlane.test';
    const { token: shopKey } = await createKey(t, orgA.id, { kind: 'embed', allowedOrigins: [SHOP] });
    const { token: otherKey } = await createKey(t, orgA.id, { kind: 'embed', allowedOrigins: ['https://other-shop.test'] });
    // Preflights on account routes never allow a page, even from an origin some key lists.
    for (const [path, method] of [['/v1/auth/sign-in', 'POST'], ['/v1/keys', 'POST'], ['/v1/members', 'GET'], ['/v1/usage', 'GET']]) {
      const pre = await request(t.app).options(path).set('Origin', SHOP).set('Access-Control-Request-Method', method).expect(204);
      expect(pre.headers['access-control-allow-origin']).toBeUndefined();
    }
    const signIn = await request(t.app).post('/v1/auth/sign-in').set('Origin', SHOP).send({ email: 'x@y.test', password: 'whatever-it-is' });
    expect(signIn.headers['access-control-allow-origin']).toBeUndefined();
    // The real request: the presented key's own origins only.
    expect((await size(shopKey, SHOP).expect(200)).headers['access-control-allow-origin']).toBe(SHOP);
    const wrongKey = await size(otherKey, SHOP).expect(403);
    expect(wrongKey.headers['access-control-allow-origin']).toBeUndefined();
    const serverKeyFromPage = await size(managerA, SHOP).expect(200);
    expect(serverKeyFromPage.headers['access-control-allow-origin']).toBeUndefined();
  });

  it('is refused without an Origin, or from another origin', async () => {
    expect((await size(pub).expect(403)).body.code).toBe('origin_required');
    expect((await size(pub, 'https://harborlane.test').expect(403)).body.code).toBe('origin_not_allowed');
    expect((await size(pub, 'https://shop.harborlane.test.evil.test').expect(403)).body.code).toBe('origin_not_allowed');
  });

  it('answers a preflight from the origin alone', async () => {
    const ok = await request(t.app)
      .options('/v1/estimates')
      .set('Origin', 'https://shop.harborlane.test')
      .set('Access-Control-Request-Method', 'POST')
      .set('Access-Control-Request-Headers', 'authorization, content-type')
      .expect(204);
    expect(ok.headers['access-control-allow-origin']).toBe('https://shop.harborlane.test');
    expect(ok.headers['access-control-allow-headers']).toContain('Authorization');
    const denied = await request(t.app).options('/v1/estimates').set('Origin', 'https://elsewhere.test').set('Access-Control-Request-Method', 'POST').expect(204);
    expect(denied.headers['access-control-allow-origin']).toBeUndefined();
  });

  it('cannot manage keys', async () => {
    await as(pub).get('/v1/keys').set('Origin', 'https://shop.harborlane.test').expect(403);
  });
});

describe('isolation between organisations', () => {
  it('never shows, rotates or revokes another organisation’s key (404)', async () => {
    const { key } = await newSecretKey();
    await as(managerB).get(`/v1/keys/${key.id}`).expect(404);
    await as(managerB).post(`/v1/keys/${key.id}/rotate`, {}).expect(404);
    await as(managerB).post(`/v1/keys/${key.id}/revoke`).expect(404);
    const listed = await as(managerB).get('/v1/keys?limit=100').expect(200);
    expect(listed.body.items.map((k: { id: string }) => k.id)).not.toContain(key.id);
  });

  it('pages through keys with a cursor', async () => {
    const first = await as(managerA).get('/v1/keys?limit=2').expect(200);
    expect(first.body.items).toHaveLength(2);
    expect(first.body.nextCursor).not.toBeNull();
    const second = await as(managerA).get(`/v1/keys?limit=2&cursor=${first.body.nextCursor}`).expect(200);
    const ids = [...first.body.items, ...second.body.items].map((k: { id: string }) => k.id);
    expect(new Set(ids).size).toBe(ids.length);
    await as(managerA).get('/v1/keys?cursor=not-a-cursor').expect(400);
  });
});

describe('limits on keys per organisation', () => {
  it('caps active keys by plan (free: 5) and counts only working keys', async () => {
    const org = await createOrganization(t); // the free plan (migration 0007: 5 keys)
    const admin = (await createKey(t, org.id, { scopes: ['keys:manage', 'sizing:run'] })).token;
    for (let i = 2; i <= 5; i++) await as(admin).post('/v1/keys', { name: `Key ${i}` }).expect(201);
    const sixth = await as(admin).post('/v1/keys', { name: 'Key 6' }).expect(409);
    expect(sixth.body.code).toBe('key_limit_reached');
    const list = await as(admin).get('/v1/keys').expect(200);
    const spare = list.body.items.find((k: { name: string }) => k.name === 'Key 5');
    await as(admin).post(`/v1/keys/${spare.id}/revoke`).expect(200);
    await as(admin).post('/v1/keys', { name: 'Key 6' }).expect(201);
  });

  it('limits key creations per organisation and hour, whichever credential creates them', async () => {
    const org = await createOrganization(t);
    const admin = (await createKey(t, org.id, { scopes: ['keys:manage', 'sizing:run'] })).token;
    const otherAdmin = (await createKey(t, org.id, { scopes: ['keys:manage', 'sizing:run'] })).token;
    // Free plan: 5 creations an hour (its key cap), shared by both credentials; refused ones do not count.
    await as(admin).post('/v1/keys', { name: 'bad\u0000name' }).expect(400);
    await as(admin).post('/v1/keys', { name: 'One' }).expect(201);
    await as(otherAdmin).post('/v1/keys', { name: 'Two' }).expect(201);
    await as(admin).post('/v1/keys', { name: 'Three' }).expect(201);
    // Revoked again at once: the cap on active keys never binds here, only the creation rate.
    for (const k of (await as(admin).get('/v1/keys').expect(200)).body.items.filter((x: { name: string }) => ['One', 'Two', 'Three'].includes(x.name))) {
      await as(admin).post(`/v1/keys/${k.id}/revoke`).expect(200);
    }
    await as(otherAdmin).post('/v1/keys', { name: 'Four' }).expect(201);
    await as(admin).post('/v1/keys', { name: 'Five' }).expect(201);
    const sixth = await as(admin).post('/v1/keys', { name: 'Six' }).expect(429);
    expect(sixth.headers['ratelimit-policy']).toContain('"key-creations"; q=5; w=3600');
    advance(3600_000);
  });
});

describe('GET /v1/keys/current', () => {
  it('tells any server key, whatever its scopes, its own row, organisation and plan, and never its secret', async () => {
    const { key, token } = await newSecretKey(['sizing:run']);
    const res = await as(token).get('/v1/keys/current').expect(200);
    expect(res.body.key).toMatchObject({ id: key.id, keyId: key.keyId, name: 'Checkout server', scopes: ['sizing:run'] });
    expect(res.body.organization).toMatchObject({ id: orgA.id, slug: 'harbor-lane-test' });
    expect(res.body.plan).toEqual({ id: 'platform', name: expect.any(String) });
    expect(JSON.stringify(res.body)).not.toContain(parseKey(token)!.secret);
  });

  it('is refused to embed keys and to signed-in users, and a revoked key is unknown', async () => {
    const embed = await createKey(t, orgB.id, { kind: 'embed', allowedOrigins: ['https://shop.kestrelfinch.test'] });
    expect((await as(embed.token).get('/v1/keys/current').set('Origin', 'https://shop.kestrelfinch.test').expect(403)).body.code).toBe('embed_key_not_allowed');
    const { key, token } = await newSecretKey(['sizing:run']);
    await as(managerA).post(`/v1/keys/${key.id}/revoke`).expect(200);
    expect((await as(token).get('/v1/keys/current').expect(401)).body.code).toBe('credential_revoked');
  });
});
