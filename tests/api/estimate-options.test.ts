import fc from 'fast-check';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { organizations } from '../../api/db/schema.js';
import type { StoredCatalogItem } from '../../shared/schemas/catalog-store.js';
import { alderRowStair, harborLaneCatalog, hlM05Motion } from '../../shared/schemas/estimate-examples.js';
import { alderRowKitOptions, harborLaneKitOptions, kitOptionsResponseSchema, type KitOptionsResult } from '../../shared/schemas/estimate-options.js';
import { bearer, createMember, signIn } from '../support/accounts.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

const PATH = '/v1/estimates/options';
const SHOP_ORIGIN = 'https://shop.harborlane.test';

let t: TestApp;
let shopId: string;
let server: string;
let embed: string;
let estimator: string;
let viewer: string;
let otherOrgKey: string;

/** An organisation on the partner plan: its cost budget (250 000 a minute) holds every search of this file. */
async function partnerOrganization(slug: string) {
  const [org] = await t.database.db.insert(organizations).values({ slug, name: `Test ${slug}`, planId: 'partner' }).returning();
  return org!;
}

beforeAll(async () => {
  t = await createTestApp();
  const shop = await partnerOrganization('harbor-lane-options');
  shopId = shop.id;
  const { catalog } = t.app.locals.services;
  await catalog.update(shopId, { currency: 'EUR', taxRatePercent: 20 });
  await catalog.importItems(shopId, harborLaneCatalog.items as unknown as StoredCatalogItem[]);
  ({ token: server } = await createKey(t, shopId, { scopes: ['sizing:run'] }));
  ({ token: embed } = await createKey(t, shopId, { kind: 'embed', allowedOrigins: [SHOP_ORIGIN] }));
  estimator = (await signIn(t.app, (await createMember(t.app, shopId, 'estimator')).email)).accessToken;
  viewer = (await signIn(t.app, (await createMember(t.app, shopId, 'viewer')).email)).accessToken;
  const other = await partnerOrganization('no-catalog-options');
  ({ token: otherOrgKey } = await createKey(t, other.id, { scopes: ['sizing:run'] }));
});
afterAll(() => t.close());

const post = (token: string, body: object) => request(t.app).post(PATH).set(bearer(token)).send(body);

function expectRanked(body: KitOptionsResult, limit: number) {
  expect(body.designs.length).toBeLessThanOrEqual(limit);
  body.designs.forEach((d, i) => {
    expect(d.rank).toBe(i + 1);
    if (i > 0) expect(d.pricing.net).toBeGreaterThanOrEqual(body.designs[i - 1]!.pricing.net);
    expect(d.summary.checks.fail).toBe(0);
  });
  expect(body.passed + body.failed + body.overBudget).toBe(body.candidates);
}

describe('POST /v1/estimates/options with an inline catalog', () => {
  it('answers three ranked designs, each with its cart and a request that sizes it in full', async () => {
    const res = await post(server, harborLaneKitOptions).expect(200);
    const body = kitOptionsResponseSchema.parse(res.body);
    expect(body).toMatchObject({ currency: 'EUR', pricingSource: 'inline', catalogVersion: null, layout: 'tread-strips' });
    expect(body.designs).toHaveLength(3);
    expectRanked(body, 3);
    // The 12 V strip (HL-S12-07) loads its only 12 V driver past 80 %: 14 × 0.85 m × 7.2 W/m = 85.7 W > 80 W (hand arithmetic)
    expect(body.failuresByCheck['driver-loading']).toBeGreaterThan(0);
    for (const d of body.designs) expect(d.choices.stripSku).toBe('HL-S24-10');
    // The kits are wired to mains-fed drivers: the estimate's cautions come with them.
    expect(body.cautions.length).toBeGreaterThan(0);

    const top = body.designs[0]!;
    const full = await request(t.app)
      .post('/v1/estimates')
      .set(bearer(server))
      .send({ ...top.estimateRequest, catalog: harborLaneKitOptions.catalog })
      .expect(200);
    expect(full.body.summary).toEqual(top.summary);
    expect(full.body.bomTotal).toBe(top.pricing.net);
  });

  it('refuses an unknown field and a limit out of range with 400 problems naming them', async () => {
    const typo = await post(server, { ...harborLaneKitOptions, constraints: { stripSku: ['HL-S24-10'] } }).expect(400);
    expect(typo.headers['content-type']).toContain('application/problem+json');
    expect(typo.body.errors).toEqual(expect.arrayContaining([expect.objectContaining({ path: 'constraints.stripSku' })]));
    const tooMany = await post(server, { ...harborLaneKitOptions, limit: 11 }).expect(400);
    expect(tooMany.body.errors[0].path).toBe('limit');
  });
});

describe('POST /v1/estimates/options with the stored catalog', () => {
  it('prices from the organisation’s catalog and names its version', async () => {
    const head = await t.app.locals.services.catalog.get(shopId);
    const res = await post(server, alderRowKitOptions).expect(200);
    const body = kitOptionsResponseSchema.parse(res.body);
    expect(body).toMatchObject({ pricingSource: 'stored', catalogVersion: head.version });
    expect(body.designs.length).toBeGreaterThan(0);
    expectRanked(body, 5);
    for (const d of body.designs) {
      expect(d.pricing).toMatchObject({ source: 'stored', catalogVersion: head.version, taxRatePercent: 20 });
      expect(['bottom', 'middle']).toContain(d.choices.controllerPosition);
      expect(d.choices.voltageV).toBe(24);
    }
  });

  it('answers designs that POST /v1/estimates prices the same from the stored catalog', async () => {
    const body = kitOptionsResponseSchema.parse((await post(server, alderRowKitOptions).expect(200)).body);
    const top = body.designs[0]!;
    const full = await request(t.app).post('/v1/estimates').set(bearer(server)).send(top.estimateRequest).expect(200);
    expect(full.body.pricing).toEqual(top.pricing);
    expect(full.body.cart).toEqual(top.cart);
    expect(full.body.summary).toEqual(top.summary);
  });

  it('never picks a retired item', async () => {
    const { catalog } = t.app.locals.services;
    await catalog.importItems(shopId, [{ sku: 'HL-S24-05', kind: 'strip', unitPrice: 31, voltageV: 24, powerWPerM: 4.8, cutPitchMm: 100, reelLengthMm: 5000 }]);
    const onlyIt = { ...alderRowKitOptions, constraints: { stripSkus: ['HL-S24-05'] } };
    const before = kitOptionsResponseSchema.parse((await post(server, onlyIt).expect(200)).body);
    expect(before.designs.length).toBeGreaterThan(0);
    for (const d of before.designs) expect(d.choices.stripSku).toBe('HL-S24-05');
    await catalog.retire(shopId, 'HL-S24-05');
    const after = kitOptionsResponseSchema.parse((await post(server, onlyIt).expect(200)).body);
    expect(after.designs).toEqual([]);
    expect(after.pruned).toEqual([{ sku: 'HL-S24-05', kind: 'strip', reason: 'no active strip with this SKU in the catalog' }]);
    expect(after.catalogVersion).toBeGreaterThan(before.catalogVersion as number);
  });

  it('answers 422 catalog_empty for an organisation without a catalog, never another organisation’s', async () => {
    const res = await post(otherOrgKey, alderRowKitOptions).expect(422);
    expect(res.headers['content-type']).toContain('application/problem+json');
    expect(res.body.code).toBe('catalog_empty');
  });

  it('serves a signed-in estimator and refuses a viewer', async () => {
    await post(estimator, alderRowKitOptions).expect(200);
    const refused = await post(viewer, alderRowKitOptions).expect(403);
    expect(refused.headers['content-type']).toContain('application/problem+json');
  });
});

describe('POST /v1/estimates/options from a shop page', () => {
  it('serves an embed key from its allowed origin with CORS for that origin', async () => {
    const res = await post(embed, alderRowKitOptions).set('Origin', SHOP_ORIGIN).expect(200);
    expect(res.headers['access-control-allow-origin']).toBe(SHOP_ORIGIN);
    expect(res.headers['access-control-expose-headers']).toContain('RateLimit');
  });

  it('answers the preflight for the allowed origin', async () => {
    const res = await request(t.app).options(PATH).set('Origin', SHOP_ORIGIN).set('Access-Control-Request-Method', 'POST').expect(204);
    expect(res.headers['access-control-allow-origin']).toBe(SHOP_ORIGIN);
  });

  it('refuses the embed key from another origin', async () => {
    const res = await post(embed, alderRowKitOptions).set('Origin', 'https://elsewhere.test').expect(403);
    expect(res.headers['access-control-allow-origin']).toBeUndefined();
  });
});

describe('POST /v1/estimates/options against the cost budget', () => {
  it('charges every candidate it sizes', async () => {
    const org = await createOrganization(t);
    const { token } = await createKey(t, org.id, { scopes: ['sizing:run'] });
    const res = await post(token, harborLaneKitOptions).expect(200);
    // 1 + ⌈25 items / 10⌉ + 36 candidates × (1 + 14 treads) = 544 work units (hand arithmetic, the documented formula)
    expect(harborLaneKitOptions.catalog.items).toHaveLength(25);
    expect(res.body.candidates).toBe(36);
    const quota = Number(/"cost"; q=(\d+)/.exec(String(res.headers['ratelimit-policy']))?.[1]);
    const left = Number(/"cost"; r=(\d+)/.exec(String(res.headers['ratelimit']))?.[1]);
    expect(quota - left).toBe(544);
  });
});

describe('POST /v1/estimates/options under random constraints', () => {
  it('always answers a ranked, consistent result that keeps to the constraints', async () => {
    const constraints = fc.record(
      {
        stripSkus: fc.subarray(['HL-S24-10', 'HL-S12-07', 'HL-NONE'], { minLength: 1 }),
        voltagesV: fc.subarray([12, 24, 48], { minLength: 1 }),
        controllerSkus: fc.subarray(['HL-K20', 'HL-K36'], { minLength: 1 }),
        controllerPositions: fc.subarray(['bottom', 'middle', 'top'] as const, { minLength: 1 }),
        driverPositions: fc.subarray(['bottom', 'middle', 'top'] as const, { minLength: 1 }),
      },
      { requiredKeys: [] },
    );
    const body = fc.record(
      {
        constraints,
        limit: fc.integer({ min: 1, max: 10 }),
        budget: fc.record({ maxTotal: fc.integer({ min: 100, max: 600 }), basis: fc.constantFrom('net', 'gross') }),
        treads: fc.integer({ min: 2, max: 24 }),
      },
      { requiredKeys: ['treads'] },
    );
    await fc.assert(
      fc.asyncProperty(body, async ({ treads, ...rest }) => {
        const req = { layout: 'tread-strips', staircase: { ...alderRowStair, treads }, sensors: { motion: hlM05Motion }, ...rest };
        const res = await post(server, req);
        expect(res.status, JSON.stringify(req)).toBe(200);
        const answer = kitOptionsResponseSchema.parse(res.body);
        expectRanked(answer, rest.limit ?? 3);
        for (const d of answer.designs) {
          const c = rest.constraints;
          if (c?.stripSkus) expect(c.stripSkus).toContain(d.choices.stripSku);
          if (c?.voltagesV) expect(c.voltagesV).toContain(d.choices.voltageV);
          if (c?.controllerSkus) expect(c.controllerSkus).toContain(d.choices.controllerSku);
          if (c?.controllerPositions) expect(c.controllerPositions).toContain(d.choices.controllerPosition);
          if (c?.driverPositions) expect(c.driverPositions).toContain(d.choices.driverPosition);
          if (rest.budget) expect(rest.budget.basis === 'net' ? d.pricing.net : d.pricing.gross).toBeLessThanOrEqual(rest.budget.maxTotal);
        }
      }),
      { numRuns: 25, seed: 0x0b7e },
    );
  }, 60_000);
});
