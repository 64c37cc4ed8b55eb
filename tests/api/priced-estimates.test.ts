import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { harborLaneCatalog, harborLaneCheckout } from '../../shared/schemas/estimate-examples.js';
import { createMember, signIn } from '../support/accounts.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

/**
 * /v1/estimates priced from the organisation's stored catalog: the invented Harbor Lane catalog
 * of the demo scenario, 20 % tax, and the Alder Row stair (14 treads of 900 mm, 24 V 10 W/m).
 */
let t: TestApp;
let admin: string;
let estimator: string;
let otherEstimator: string;
let sizingKey: string;

const { catalog: _inline, ...alderRow } = harborLaneCheckout;

beforeAll(async () => {
  t = await createTestApp();
  const org = await createOrganization(t, 'priced-a');
  const other = await createOrganization(t, 'priced-b');
  admin = (await signIn(t.app, (await createMember(t.app, org.id, 'admin')).email)).accessToken;
  estimator = (await signIn(t.app, (await createMember(t.app, org.id, 'estimator')).email)).accessToken;
  otherEstimator = (await signIn(t.app, (await createMember(t.app, other.id, 'estimator')).email)).accessToken;
  sizingKey = (await createKey(t, org.id, { scopes: ['sizing:run'] })).token;
  for (const item of harborLaneCatalog.items) {
    await request(t.app).post('/v1/catalog/items').set('Authorization', `Bearer ${admin}`).send(item).expect(201);
  }
  await request(t.app).patch('/v1/catalog').set('Authorization', `Bearer ${admin}`).send({ taxRatePercent: 20 }).expect(200);
});
afterAll(() => t.close());

const run = (token: string, body: object) => request(t.app).post('/v1/estimates').set('Authorization', `Bearer ${token}`).send(body);
const catalogVersion = async () => (await request(t.app).get('/v1/catalog').set('Authorization', `Bearer ${admin}`).expect(200)).body.version as number;

describe('an estimate priced from the stored catalog', () => {
  it('picks concrete SKUs, answers a cart and net, tax and gross by hand arithmetic', async () => {
    const res = await run(sizingKey, alderRow).expect(200);
    const version = await catalogVersion();
    // Items added one by one (22) and the tax rate set: every change bumps the version.
    expect(version).toBe(harborLaneCatalog.items.length + 1);
    expect(res.body.pricing).toEqual({
      source: 'stored',
      catalogVersion: version,
      currency: 'EUR',
      taxRatePercent: 20,
      // Hand sum of the lines below: 117 + 119 + 12.6 + 46 + 3.2 + 119 + 25 + 9.9 + 13.8 + 2 + 5.4 = 472.90
      net: 472.9,
      // 20 % of 472.90 = 94.58 exactly; gross 472.90 + 94.58
      tax: 94.58,
      gross: 567.48,
      complete: true,
      unpricedLines: 0,
    });
    expect(res.body.bomTotal).toBe(472.9);
    expect(res.body.currency).toBe('EUR');
    const lines = Object.fromEntries((res.body.bom as { sku: string; quantity: number; lineTotal: number }[]).map((l) => [l.sku, [l.quantity, l.lineTotal]]));
    expect(lines).toEqual({
      // 14 pieces of 850 mm (900 mm tread less 25 mm each end): five fit a 5 m reel (4 250 mm), so ⌈14 / 5⌉ = 3 reels × €39
      'HL-S24-10': [3, 117],
      // one 1 m profile bar per 850 mm piece, and a pair of end caps per piece
      'HL-A100': [14, 119],
      'HL-E02': [14, 12.6],
      // 119 W load ÷ 0.8 loading = 148.75 W → the cheapest single driver of at least that: 150 W at €46
      'HL-D24-150': [1, 46],
      // the 150 W driver's feeder fuse, 6.3 A (the engine's protection rule; see docs/trade-rules.md)
      'HL-F06': [1, 3.2],
      'HL-K20': [1, 119],
      // two sensors for a straight stair, foot and head
      'HL-M05': [2, 25],
      'HL-L01': [1, 9.9],
      // 22.239 m of tread leads ordered as 23 m; 2 m of feeder; 6 m of sensor cable
      'HL-C050': [23, 13.8],
      'HL-C100': [2, 2],
      'HL-C3-050': [6, 5.4],
    });
    expect(res.body.cart).toEqual(
      (res.body.bom as { sku: string; quantity: number; unitPrice: number }[]).map(({ sku, quantity, unitPrice }) => ({ sku, quantity, unitPrice })),
    );
  });

  it('names the version that priced it, and a price change moves both', async () => {
    const before = (await run(estimator, alderRow).expect(200)).body;
    await request(t.app).patch('/v1/catalog/items/HL-D24-150').set('Authorization', `Bearer ${admin}`).send({ unitPrice: 50 }).expect(200);
    const after = (await run(estimator, alderRow).expect(200)).body;
    expect(after.pricing.catalogVersion).toBe(before.pricing.catalogVersion + 1);
    // €4 more on one driver: net +4.00, gross +4.80
    expect(after.pricing.net).toBe(476.9);
    expect(after.pricing.gross).toBe(572.28);
    await request(t.app).patch('/v1/catalog/items/HL-D24-150').set('Authorization', `Bearer ${admin}`).send({ unitPrice: 46 }).expect(200);
  });

  it('never picks a retired SKU: the next cheapest single driver fills the circuit', async () => {
    await request(t.app).delete('/v1/catalog/items/HL-D24-150').set('Authorization', `Bearer ${admin}`).expect(200);
    const res = (await run(estimator, alderRow).expect(200)).body;
    const drivers = res.bom.filter((l: { category: string }) => l.category === 'driver');
    // 148.75 W needed; 150 W retired → 240 W at €71 (never two paralleled smaller ones) …
    expect(drivers).toEqual([expect.objectContaining({ sku: 'HL-D24-240', quantity: 1, unitPrice: 71 })]);
    // … whose 15 A current limit the 2 m feeder must carry: 1.5 mm² (€1.40/m) instead of 1.0 mm² (€1.00/m).
    // 472.90 − 46 + 71 − 2.00 + 2.80 = 498.70
    expect(res.bom.filter((l: { category: string }) => l.category === 'cable').map((l: { sku: string }) => l.sku)).toEqual(['HL-C050', 'HL-C150', 'HL-C3-050']);
    expect(res.pricing.net).toBe(498.7);
    await request(t.app).patch('/v1/catalog/items/HL-D24-150').set('Authorization', `Bearer ${admin}`).send({ active: true }).expect(200);
  });

  it('says which kind and fields a line lacks, and never counts it as priced', async () => {
    await request(t.app).delete('/v1/catalog/items/HL-F06').set('Authorization', `Bearer ${admin}`).expect(200);
    const res = (await run(estimator, alderRow).expect(200)).body;
    const fuse = res.bom.find((l: { category: string }) => l.category === 'fuse');
    expect(fuse.missing).toEqual({ kind: 'fuse', fields: { ratingA: 6.3 } });
    expect(fuse.unitPrice).toBeUndefined();
    expect(res.pricing).toMatchObject({ complete: false, unpricedLines: 1, net: 469.7 }); // 472.90 − 3.20
    expect(res.cart.map((c: { sku: string }) => c.sku)).not.toContain('HL-F06');
    await request(t.app).patch('/v1/catalog/items/HL-F06').set('Authorization', `Bearer ${admin}`).send({ active: true }).expect(200);
  });

  it('opts out with useStoredCatalog false, and an inline catalog wins over the stored one', async () => {
    const k20 = harborLaneCatalog.items.find((i) => i.sku === 'HL-K20') as { profile: object };
    const unpriced = (await run(estimator, { ...alderRow, controller: { profile: k20.profile }, useStoredCatalog: false }).expect(200)).body;
    expect(unpriced.pricing).toBeUndefined();
    expect(unpriced.cart).toBeUndefined();
    expect(unpriced.bom.every((l: { unitPrice?: number }) => l.unitPrice === undefined)).toBe(true);

    const inline = (await run(estimator, { ...alderRow, catalog: { currency: 'EUR', items: [{ sku: 'X-S24', kind: 'strip', unitPrice: 10, voltageV: 24, powerWPerM: 10 }] } }).expect(400)).body;
    // the inline catalog replaces the stored one, so HL-K20 (named by profileId) is not there
    expect(inline.errors[0].path).toBe('controller.profileId');
  });

  it('an organisation without a catalog gets an unpriced estimate, never another organisation’s prices', async () => {
    const res = (await run(otherEstimator, { ...alderRow, controller: { profile: { outputs: 20, maxCurrentPerOutputA: 1.5 } } }).expect(200)).body;
    expect(res.pricing).toBeUndefined();
    expect(res.bom.some((l: { sku?: string }) => l.sku === 'HL-K20')).toBe(false);
  });

  it('profiles and end caps only when the request asks for them', async () => {
    const { profiles: _p, ...plain } = alderRow;
    const res = (await run(estimator, plain).expect(200)).body;
    expect(res.bom.map((l: { category: string }) => l.category)).not.toContain('aluminium-profile');
    expect(res.pricing.net).toBe(341.3); // 472.90 − 119 − 12.60
  });
});
