import request from 'supertest';
import { and, eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auditEvents } from '../../api/db/schema.js';
import { createMember, signIn } from '../support/accounts.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

let t: TestApp;
let orgA: { id: string };
let orgB: { id: string };
let adminA: string;
let viewerA: string;
let writerKeyA: string;
let readerKeyA: string;
let embedKeyA: string;
let adminB: string;
const ORIGIN = 'https://shop.catalog.test';

const DRIVER = { sku: 'TW-D24-100', kind: 'driver', description: 'Driver 24 V 100 W', unitPrice: 34, voltageV: 24, ratingW: 100 };
const STRIP = { sku: 'TW-S24-10', kind: 'strip', unitPrice: 39.5, voltageV: 24, powerWPerM: 10, cutPitchMm: 50, reelLengthMm: 5000 };

beforeAll(async () => {
  t = await createTestApp();
  orgA = await createOrganization(t, 'catalog-a');
  orgB = await createOrganization(t, 'catalog-b');
  adminA = (await signIn(t.app, (await createMember(t.app, orgA.id, 'admin')).email)).accessToken;
  viewerA = (await signIn(t.app, (await createMember(t.app, orgA.id, 'viewer')).email)).accessToken;
  adminB = (await signIn(t.app, (await createMember(t.app, orgB.id, 'admin')).email)).accessToken;
  writerKeyA = (await createKey(t, orgA.id, { scopes: ['catalog:write', 'catalog:read'] })).token;
  readerKeyA = (await createKey(t, orgA.id, { scopes: ['catalog:read'] })).token;
  embedKeyA = (await createKey(t, orgA.id, { kind: 'embed', scopes: ['sizing:run', 'catalog:read'], allowedOrigins: [ORIGIN] })).token;
});
afterAll(() => t.close());

const as = (token: string) => ({
  get: (path: string) => request(t.app).get(path).set('Authorization', `Bearer ${token}`),
  post: (path: string, body: object) => request(t.app).post(path).set('Authorization', `Bearer ${token}`).send(body),
  put: (path: string, body: object) => request(t.app).put(path).set('Authorization', `Bearer ${token}`).send(body),
  patch: (path: string, body: object) => request(t.app).patch(path).set('Authorization', `Bearer ${token}`).send(body),
  delete: (path: string) => request(t.app).delete(path).set('Authorization', `Bearer ${token}`),
});

describe('the stored catalog', () => {
  it('starts empty at version 0 in EUR without tax', async () => {
    const res = await as(viewerA).get('/v1/catalog').expect(200);
    expect(res.body).toEqual({ currency: 'EUR', taxRatePercent: 0, version: 0, itemCount: 0, activeItemCount: 0, updatedAt: null });
  });

  it('an admin adds an item; the version counts every change', async () => {
    const created = await as(adminA).post('/v1/catalog/items', DRIVER).expect(201);
    expect(created.body).toEqual({ ...DRIVER, active: true });
    expect(created.headers.location).toBe('/v1/catalog/items/TW-D24-100');
    expect((await as(viewerA).get('/v1/catalog').expect(200)).body).toMatchObject({ version: 1, itemCount: 1, activeItemCount: 1 });

    await as(writerKeyA).post('/v1/catalog/items', STRIP).expect(201);
    await as(adminA).patch('/v1/catalog', { taxRatePercent: 20 }).expect(200);
    const catalog = (await as(viewerA).get('/v1/catalog').expect(200)).body;
    expect(catalog).toMatchObject({ version: 3, itemCount: 2, taxRatePercent: 20 });
    expect(catalog.updatedAt).toEqual(expect.any(String));
  });

  it('keeps prices as whole minor units and shows them in major units', async () => {
    // 39.5 EUR is 3950 cents; 39.505 is not a whole number of cents.
    expect((await as(viewerA).get('/v1/catalog/items/TW-S24-10').expect(200)).body.unitPrice).toBe(39.5);
    const bad = await as(adminA).post('/v1/catalog/items', { ...STRIP, sku: 'TW-S24-11', unitPrice: 39.505 }).expect(400);
    expect(bad.body.errors).toEqual([expect.objectContaining({ path: 'unitPrice' })]);
    await as(adminA).patch('/v1/catalog/items/TW-S24-10', { unitPrice: 0.1 }).expect(200);
    expect((await as(viewerA).get('/v1/catalog/items/TW-S24-10').expect(200)).body.unitPrice).toBe(0.1);
    await as(adminA).patch('/v1/catalog/items/TW-S24-10', { unitPrice: 39.5 }).expect(200);
  });

  it('validates each item by its kind’s schema and refuses unknown fields', async () => {
    const missing = await as(adminA).post('/v1/catalog/items', { sku: 'TW-D-X', kind: 'driver', voltageV: 24 }).expect(400);
    expect(missing.body.errors.map((e: { path: string }) => e.path)).toContain('ratingW');
    const unknown = await as(adminA).post('/v1/catalog/items', { ...DRIVER, sku: 'TW-D-Y', colour: 'blue' }).expect(400);
    expect(unknown.body.errors).toEqual([expect.objectContaining({ path: 'colour', message: 'unknown field' })]);
    await as(adminA).post('/v1/catalog/items', { sku: 'TW-C1', kind: 'cable', crossSectionMm2: 0.5, awg: 20 }).expect(400);
  });

  it('refuses a second item with the same SKU (409) and replaces one with PUT', async () => {
    const dup = await as(adminA).post('/v1/catalog/items', DRIVER).expect(409);
    expect(dup.body.code).toBe('sku_exists');
    const before = (await as(viewerA).get('/v1/catalog')).body.version;
    const replaced = await as(adminA).put('/v1/catalog/items/TW-D24-100', { ...DRIVER, ratingW: 150, unitPrice: 46 }).expect(200);
    expect(replaced.body).toMatchObject({ ratingW: 150, unitPrice: 46, active: true });
    expect((await as(viewerA).get('/v1/catalog')).body.version).toBe(before + 1);
    // The same body again changes nothing, so the version stays.
    await as(adminA).put('/v1/catalog/items/TW-D24-100', { ...DRIVER, ratingW: 150, unitPrice: 46 }).expect(200);
    expect((await as(viewerA).get('/v1/catalog')).body.version).toBe(before + 1);
    const mismatch = await as(adminA).put('/v1/catalog/items/TW-D24-100', { ...DRIVER, sku: 'TW-OTHER' }).expect(400);
    expect(mismatch.body.errors[0].path).toBe('sku');
    await as(adminA).put('/v1/catalog/items/TW-E02', { sku: 'TW-E02', kind: 'end-caps', unitPrice: 0.9 }).expect(201);
  });

  it('DELETE retires an item: it stays readable, is listed as retired and can come back', async () => {
    const retired = await as(adminA).delete('/v1/catalog/items/TW-E02').expect(200);
    expect(retired.body).toMatchObject({ sku: 'TW-E02', active: false });
    expect((await as(viewerA).get('/v1/catalog/items/TW-E02').expect(200)).body.active).toBe(false);
    const activeOnly = await as(viewerA).get('/v1/catalog/items?active=true').expect(200);
    expect(activeOnly.body.items.map((i: { sku: string }) => i.sku)).not.toContain('TW-E02');
    const retiredOnly = await as(viewerA).get('/v1/catalog/items?active=false').expect(200);
    expect(retiredOnly.body.items.map((i: { sku: string }) => i.sku)).toEqual(['TW-E02']);
    const version = (await as(viewerA).get('/v1/catalog')).body.version;
    await as(adminA).delete('/v1/catalog/items/TW-E02').expect(200); // twice is harmless, no new version
    expect((await as(viewerA).get('/v1/catalog')).body.version).toBe(version);
    await as(adminA).patch('/v1/catalog/items/TW-E02', { active: true }).expect(200);
    expect((await as(viewerA).get('/v1/catalog')).body.version).toBe(version + 1);
  });

  it('lists by SKU in cursor pages and filters by kind', async () => {
    for (const n of [1, 2, 3]) await as(adminA).post('/v1/catalog/items', { sku: `TW-C0${n}`, kind: 'cable', unitPrice: n, crossSectionMm2: 0.5 * n }).expect(201);
    const first = await as(readerKeyA).get('/v1/catalog/items?limit=2').expect(200);
    expect(first.body.items.map((i: { sku: string }) => i.sku)).toEqual(['TW-C01', 'TW-C02']);
    const second = await as(readerKeyA).get(`/v1/catalog/items?limit=2&cursor=${first.body.nextCursor}`).expect(200);
    expect(second.body.items.map((i: { sku: string }) => i.sku)).toEqual(['TW-C03', 'TW-D24-100']);
    const cables = await as(readerKeyA).get('/v1/catalog/items?kind=cable').expect(200);
    expect(cables.body.items).toHaveLength(3);
    expect(cables.body.nextCursor).toBeNull();
    await as(readerKeyA).get('/v1/catalog/items?kind=lamp').expect(400);
    await as(readerKeyA).get('/v1/catalog/items?active=yes').expect(400);
  });

  it('replays a creating POST with the same Idempotency-Key', async () => {
    const item = { sku: 'TW-L01', kind: 'daylight-sensor' };
    const first = await as(adminA).post('/v1/catalog/items', item).set('Idempotency-Key', 'add-l01').expect(201);
    const again = await as(adminA).post('/v1/catalog/items', item).set('Idempotency-Key', 'add-l01').expect(201);
    expect(again.body).toEqual(first.body);
  });

  it('records audit events for changes', async () => {
    const rows = await t.database.db.select().from(auditEvents).where(and(eq(auditEvents.organizationId, orgA.id), eq(auditEvents.targetType, 'catalog_item')));
    const actions = new Set(rows.map((r) => r.action));
    expect(actions).toEqual(new Set(['catalog_item.created', 'catalog_item.updated', 'catalog_item.replaced', 'catalog_item.retired']));
  });

  it('refuses a currency with other decimals while items are priced', async () => {
    const res = await as(adminA).patch('/v1/catalog', { currency: 'JPY' }).expect(409);
    expect(res.body.code).toBe('currency_decimals_differ');
    await as(adminA).patch('/v1/catalog', { taxRatePercent: 20.005 }).expect(400);
  });
});

describe('who may do what', () => {
  it('viewers and catalog:read keys read but cannot write', async () => {
    await as(viewerA).post('/v1/catalog/items', { ...DRIVER, sku: 'TW-V' }).expect(403);
    await as(viewerA).patch('/v1/catalog', { taxRatePercent: 5 }).expect(403);
    await as(readerKeyA).delete('/v1/catalog/items/TW-D24-100').expect(403);
    await as(readerKeyA).get('/v1/catalog/items/TW-D24-100').expect(200);
  });

  it('another organisation gets 404 on every item, and its own empty catalog', async () => {
    await as(adminB).get('/v1/catalog/items/TW-D24-100').expect(404);
    await as(adminB).patch('/v1/catalog/items/TW-D24-100', { unitPrice: 1 }).expect(404);
    await as(adminB).delete('/v1/catalog/items/TW-D24-100').expect(404);
    expect((await as(adminB).get('/v1/catalog/items').expect(200)).body.items).toEqual([]);
    expect((await as(adminB).get('/v1/catalog').expect(200)).body.version).toBe(0);
    // B's own SKU of the same name is independent of A's.
    await as(adminB).post('/v1/catalog/items', DRIVER).expect(201);
    expect((await as(viewerA).get('/v1/catalog/items/TW-D24-100')).body.ratingW).toBe(150);
  });

  it('an embed key lists active items only, with CORS for its origin, and nothing else', async () => {
    const res = await as(embedKeyA).get('/v1/catalog/items?active=false&limit=200').set('Origin', ORIGIN).expect(200);
    expect(res.headers['access-control-allow-origin']).toBe(ORIGIN);
    expect(res.body.items.length).toBeGreaterThan(0);
    expect(res.body.items.every((i: { active: boolean }) => i.active)).toBe(true);
    await as(embedKeyA).get('/v1/catalog/items/TW-D24-100').set('Origin', ORIGIN).expect(403);
    await as(embedKeyA).get('/v1/catalog').set('Origin', ORIGIN).expect(403);
  });
});
