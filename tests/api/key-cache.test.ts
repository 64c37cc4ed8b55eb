import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { KeyCache } from '../../api/auth/key-cache.js';
import type { ApiKeyRow } from '../../api/services/api-keys.js';
import { anotherInstance } from '../support/app-instance.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

const row = (keyId: string) => ({ keyId }) as unknown as ApiKeyRow;

describe('KeyCache: verified secrets', () => {
  it('verifies a secret once per row and TTL, and never from another token or another row', () => {
    let now = 0;
    const cache = new KeyCache(async () => undefined, () => now, 5_000);
    const a = row('aaaaaaaaaaaa');
    let checks = 0;
    const verify = () => (checks++, { validUntil: Number.POSITIVE_INFINITY });
    expect(cache.secretValid(a, 'tw_server_aaaaaaaaaaaa_one', verify)).toBe(true);
    expect(cache.secretValid(a, 'tw_server_aaaaaaaaaaaa_one', verify)).toBe(true);
    expect(checks).toBe(1);
    expect(cache.secretValid(a, 'tw_server_aaaaaaaaaaaa_two', () => null)).toBe(false); // another secret: checked, refused
    expect(cache.secretValid(row('aaaaaaaaaaaa'), 'tw_server_aaaaaaaaaaaa_one', verify)).toBe(true); // a reloaded row: verified afresh
    expect(checks).toBe(2);
    now = 5_000;
    cache.secretValid(a, 'tw_server_aaaaaaaaaaaa_one', verify);
    expect(checks).toBe(3);
  });

  it('forgets a key’s verified secrets on invalidate, and an overlapping secret at its own end', () => {
    let now = 0;
    const cache = new KeyCache(async () => undefined, () => now, 5_000);
    const a = row('aaaaaaaaaaaa');
    let checks = 0;
    cache.secretValid(a, 't1', () => (checks++, { validUntil: Number.POSITIVE_INFINITY }));
    cache.invalidate('aaaaaaaaaaaa');
    expect(cache.secretValid(a, 't1', () => (checks++, null))).toBe(false);
    cache.secretValid(a, 't2', () => (checks++, { validUntil: 1_000 }));
    now = 1_000;
    expect(cache.secretValid(a, 't2', () => (checks++, null))).toBe(false);
    expect(checks).toBe(4);
  });
});

// Time stands still, so no cache expires on its own: only the key events can make an instance forget.
const frozen = new Date('2026-12-01T10:00:00Z');
let t: TestApp;
let b: TestApp['app'];
let manager: string;
beforeAll(async () => {
  t = await createTestApp({}, () => frozen);
  b = anotherInstance(t, {}, () => frozen);
  await Promise.all([t.app.locals.services.keyEvents.listening, b.locals.services.keyEvents.listening]);
  manager = (await createKey(t, (await createOrganization(t)).id, { scopes: ['keys:manage', 'sizing:run'] })).token;
});
afterAll(() => t.close());

const VD = { supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 } };
const sizeOn = (app: TestApp['app'], token: string) => request(app).post('/v1/calculations/voltage-drop').set('Authorization', `Bearer ${token}`).send(VD);
const keys = (path: string, body: object = {}) => request(t.app).post(path).set('Authorization', `Bearer ${manager}`).send(body);

describe('a key whose secret was just verified', () => {
  it('is refused at once when revoked, on the instance that revoked it', async () => {
    const created = await keys('/v1/keys', { name: 'Just used' }).expect(201);
    await sizeOn(t.app, created.body.token).expect(200);
    await sizeOn(t.app, created.body.token).expect(200); // verified from the cache now
    await keys(`/v1/keys/${created.body.key.id}/revoke`).expect(200);
    expect((await sizeOn(t.app, created.body.token).expect(401)).body.code).toBe('credential_revoked');
  });

  it('loses its old secret at once when rotated without overlap, here and on another instance', async () => {
    const created = await keys('/v1/keys', { name: 'Rotated while hot' }).expect(201);
    for (const app of [t.app, b, t.app, b]) await sizeOn(app, created.body.token).expect(200);
    const rotated = await keys(`/v1/keys/${created.body.key.id}/rotate`, { overlapHours: 0 }).expect(200);
    expect((await sizeOn(t.app, created.body.token).expect(401)).body.code).toBe('credential_unknown');
    await expect.poll(async () => (await sizeOn(b, created.body.token)).status, { timeout: 3000, interval: 50 }).toBe(401);
    await sizeOn(t.app, rotated.body.token).expect(200);
    await sizeOn(b, rotated.body.token).expect(200);
  });
});
