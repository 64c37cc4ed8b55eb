import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { harborLaneCatalog, harborLaneCheckout } from '../../shared/schemas/estimate-examples.js';
import { createMember, signIn } from '../support/accounts.js';
import { createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

/**
 * A stored estimate re-run after a price change in the organisation's stored catalog: the invented
 * Harbor Lane catalog (EUR, 20 % tax) and the Alder Row stair (14 treads, 24 V 10 W/m strip HL-S24-10).
 */
let t: TestApp;
let admin: string;
let estimator: string;
const { catalog: _inline, ...alderRow } = harborLaneCheckout;

beforeAll(async () => {
  t = await createTestApp();
  const org = await createOrganization(t, 'rerun-a');
  admin = (await signIn(t.app, (await createMember(t.app, org.id, 'admin')).email)).accessToken;
  estimator = (await signIn(t.app, (await createMember(t.app, org.id, 'estimator')).email)).accessToken;
  for (const item of harborLaneCatalog.items) await request(t.app).post('/v1/catalog/items').set('Authorization', `Bearer ${admin}`).send(item).expect(201);
  await request(t.app).patch('/v1/catalog').set('Authorization', `Bearer ${admin}`).send({ taxRatePercent: 20 }).expect(200);
});
afterAll(() => t.close());

const as = (token: string) => ({
  get: (path: string) => request(t.app).get(path).set('Authorization', `Bearer ${token}`),
  post: (path: string, body: object = {}) => request(t.app).post(path).set('Authorization', `Bearer ${token}`).send(body),
  patch: (path: string, body: object) => request(t.app).patch(path).set('Authorization', `Bearer ${token}`).send(body),
});

/** Cents, to compare money without binary fractions. */
const cents = (amount: number) => Math.round(amount * 100);

describe('re-running a stored estimate after a price change', () => {
  it('stores a new estimate and shows the old and the new totals and catalog versions', async () => {
    const project = (await as(estimator).post('/v1/projects', { name: 'Alder Row, house 7' }).expect(201)).body;
    const stair = (await as(estimator).post(`/v1/projects/${project.id}/stairs`, { name: 'Main stair', input: alderRow }).expect(201)).body;
    const first = (await as(estimator).post(`/v1/projects/${project.id}/stairs/${stair.id}/estimates`).expect(201)).body;
    const versionBefore = (await as(admin).get('/v1/catalog').expect(200)).body.version;
    expect(first).toMatchObject({ pricingSource: 'stored', catalogVersion: versionBefore });
    expect(first.result.pricing).toMatchObject({ source: 'stored', catalogVersion: versionBefore, currency: 'EUR', taxRatePercent: 20, complete: true });
    const stripLine = first.result.bom.find((l: { sku?: string }) => l.sku === 'HL-S24-10');
    expect(stripLine.unitPrice).toBe(39);

    // The strip goes from 39.00 to 42.50 EUR a reel.
    await as(admin).patch('/v1/catalog/items/HL-S24-10', { unitPrice: 42.5 }).expect(200);
    const rerun = await as(estimator).post(`/v1/estimates/${first.id}/rerun`).expect(201);
    const { changes } = rerun.body;

    // By hand: the net grows by 3.50 per strip reel; the tax is 20 % of the net, rounded to the cent.
    const oldNet = first.result.pricing.net;
    const newNetCents = cents(oldNet) + 350 * stripLine.quantity;
    expect(cents(changes.figures.bomTotal.old)).toBe(cents(oldNet));
    expect(cents(changes.figures.bomTotal.new)).toBe(newNetCents);
    expect(changes.figures.bomTotal.changed).toBe(true);
    expect(cents(changes.figures.gross.old)).toBe(cents(first.result.pricing.gross));
    expect(cents(changes.figures.gross.new)).toBe(newNetCents + Math.round(newNetCents * 0.2));
    expect(changes.catalogVersion).toEqual({ old: versionBefore, new: versionBefore + 1, changed: true });
    // Nothing electrical changed: same load, drivers, drop, reels and check statuses.
    for (const figure of ['totalLoadW', 'driverCount', 'worstDropPercent', 'reels'] as const) expect(changes.figures[figure].changed).toBe(false);
    expect(changes.checks).toEqual([]);
    expect(changes.changed).toBe(true);

    expect(rerun.body).toMatchObject({ rerunOf: first.id, catalogVersion: versionBefore + 1, pricingSource: 'stored' });
    expect(cents(rerun.body.result.pricing.net)).toBe(newNetCents);
    // The old estimate keeps the quote it made.
    const old = (await as(estimator).get(`/v1/estimates/${first.id}`).expect(200)).body;
    expect(old.result.pricing.net).toBe(oldNet);
    expect(old.catalogVersion).toBe(versionBefore);

    // The stair's list shows both, newest first, with their totals.
    const listed = (await as(estimator).get(`/v1/projects/${project.id}/stairs/${stair.id}/estimates`).expect(200)).body.items;
    expect(listed.map((e: { id: string }) => e.id)).toEqual([rerun.body.id, first.id]);
    expect(cents(listed[0].bomTotal)).toBe(newNetCents);
    expect(listed[1]).toMatchObject({ bomTotal: oldNet, gross: first.result.pricing.gross, currency: 'EUR', catalogVersion: versionBefore });
  });

  it('a retired strip leaves the re-run’s strip line unpriced and its net lower', async () => {
    const project = (await as(estimator).post('/v1/projects', { name: 'Alder Row, house 8' }).expect(201)).body;
    const stair = (await as(estimator).post(`/v1/projects/${project.id}/stairs`, { name: 'Main stair', input: alderRow }).expect(201)).body;
    const first = (await as(estimator).post(`/v1/projects/${project.id}/stairs/${stair.id}/estimates`).expect(201)).body;
    await request(t.app).delete('/v1/catalog/items/HL-S24-10').set('Authorization', `Bearer ${admin}`).expect(200);
    const rerun = (await as(estimator).post(`/v1/estimates/${first.id}/rerun`).expect(201)).body;
    expect(rerun.result.pricing.complete).toBe(false);
    const strip = rerun.result.bom.find((l: { category: string }) => l.category === 'strip');
    expect(strip.lineTotal).toBeUndefined();
    expect(strip.missing?.kind).toBe('strip');
    expect(cents(rerun.changes.figures.bomTotal.new)).toBeLessThan(cents(rerun.changes.figures.bomTotal.old));
    await request(t.app).patch('/v1/catalog/items/HL-S24-10').set('Authorization', `Bearer ${admin}`).send({ active: true }).expect(200);
  });
});
