import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { anotherInstance } from '../support/app-instance.js';
import { harborLaneCatalog, harborLaneCheckout } from '../../shared/schemas/estimate-examples.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

// Time stands still, so the 5 s key cache never expires on its own: only the database
// notification can make instance B forget a key that instance A changed.
const frozen = new Date('2026-12-01T10:00:00Z');
let t: TestApp;
let b: TestApp['app'];
let manager: string;
beforeAll(async () => {
  t = await createTestApp({}, () => frozen);
  b = anotherInstance(t, {}, () => frozen);
  await Promise.all([t.app.locals.services.keyEvents.listening, b.locals.services.keyEvents.listening]);
  const org = await createOrganization(t);
  manager = (await createKey(t, org.id, { scopes: ['keys:manage', 'sizing:run'] })).token;
});
afterAll(() => t.close());

const VD = { supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 } };
const sizeOn = (app: TestApp['app'], token: string) => request(app).post('/v1/calculations/voltage-drop').set('Authorization', `Bearer ${token}`).send(VD);

describe('a key changed on one instance', () => {
  it('stops working on another instance that had it cached, without waiting for the cache to expire', async () => {
    const created = await request(t.app).post('/v1/keys').set('Authorization', `Bearer ${manager}`).send({ name: 'Two servers' }).expect(201);
    await sizeOn(b, created.body.token).expect(200); // cached on B now
    await request(t.app).post(`/v1/keys/${created.body.key.id}/revoke`).set('Authorization', `Bearer ${manager}`).expect(200);
    await expect.poll(async () => (await sizeOn(b, created.body.token)).status, { timeout: 3000, interval: 50 }).toBe(401);
  });

  it('makes a rotated key’s old secret stop on the other instance when the overlap is 0', async () => {
    const created = await request(t.app).post('/v1/keys').set('Authorization', `Bearer ${manager}`).send({ name: 'Rotated' }).expect(201);
    await sizeOn(b, created.body.token).expect(200);
    const rotated = await request(t.app).post(`/v1/keys/${created.body.key.id}/rotate`).set('Authorization', `Bearer ${manager}`).send({ overlapHours: 0 }).expect(200);
    await expect.poll(async () => (await sizeOn(b, created.body.token)).status, { timeout: 3000, interval: 50 }).toBe(401);
    await sizeOn(b, rotated.body.token).expect(200);
  });
});

describe('a stored catalog changed on one instance', () => {
  it('prices estimates on another instance from the new version at once, although it had the old one cached', async () => {
    const org = await createOrganization(t);
    const { token } = await createKey(t, org.id, { scopes: ['catalog:write', 'catalog:read', 'sizing:run'] });
    for (const item of harborLaneCatalog.items) {
      await request(t.app).post('/v1/catalog/items').set('Authorization', `Bearer ${token}`).send(item).expect(201);
    }
    const { catalog: _inline, ...stair } = harborLaneCheckout;
    const priceOn = async (app: TestApp['app']) => (await request(app).post('/v1/estimates').set('Authorization', `Bearer ${token}`).send(stair).expect(200)).body.pricing;
    const before = await priceOn(b); // B reads and caches the catalog now
    await request(t.app).patch('/v1/catalog/items/HL-S24-10').set('Authorization', `Bearer ${token}`).send({ unitPrice: 41 }).expect(200);
    // The cache is trusted for 5 s of real time; only the notification makes B read the new version sooner.
    await expect.poll(async () => (await priceOn(b)).catalogVersion, { timeout: 3000, interval: 50 }).toBe(before.catalogVersion + 1);
    expect((await priceOn(b)).net).toBeGreaterThan(before.net);
  });
});

const keys = (path: string, body: object = {}) => request(t.app).post(path).set('Authorization', `Bearer ${manager}`).send(body);

// Its secret is remembered for a few seconds (KeyCache): a change must end that at once too.
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
