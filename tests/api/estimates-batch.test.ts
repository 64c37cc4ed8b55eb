import { randomBytes } from 'node:crypto';
import fc from 'fast-check';
import { asc, eq, inArray } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { organizations, outboxMessages, plans } from '../../api/db/schema.js';
import { checkItems } from '../../api/routes/estimates-batch.js';
import { MAX_BATCH_ITEMS } from '../../shared/schemas/estimate-batch.js';
import {
  alderRowCornerUnit,
  alderRowTownhouse,
  alderRowWithRail,
  estimateExamples,
  harborLaneCatalog,
  harborLaneCheckout,
  quaysideCorridor,
} from '../../shared/schemas/estimate-examples.js';
import { bearer, createMember, signIn } from '../support/accounts.js';
import { closeTraffic } from '../support/app-instance.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

const PATH = '/v1/estimates/batch';
const { catalog: _inline, ...alderRowUnpriced } = harborLaneCheckout;
// A plan made for these tests: 10 quota units a month (80 % is the 8th unit), a rate that never binds.
const TINY = { monthlyQuota: 10, ratePerMinute: 1000 };

let now = new Date('2026-11-20T10:00:00Z');
const clock = () => now;

let t: TestApp;
let planId: string;
let batchKey: string;
let sizingOnlyKey: string;
let embedKey: string;
let estimator: string;
let viewer: string;
let otherBatchKey: string;

beforeAll(async () => {
  t = await createTestApp({}, clock);
  planId = `tiny-${randomBytes(3).toString('hex')}`;
  await t.database.db.insert(plans).values({ id: planId, name: 'Tiny', ...TINY });
  const org = await createOrganization(t, 'batch-a');
  const other = await createOrganization(t, 'batch-b');
  batchKey = (await createKey(t, org.id, { scopes: ['batches:write', 'usage:read'] })).token;
  sizingOnlyKey = (await createKey(t, org.id, { scopes: ['sizing:run'] })).token;
  embedKey = (await createKey(t, org.id, { kind: 'embed' })).token;
  otherBatchKey = (await createKey(t, other.id, { scopes: ['batches:write'] })).token;
  const admin = (await signIn(t.app, (await createMember(t.app, org.id, 'admin')).email)).accessToken;
  estimator = (await signIn(t.app, (await createMember(t.app, org.id, 'estimator')).email)).accessToken;
  viewer = (await signIn(t.app, (await createMember(t.app, org.id, 'viewer')).email)).accessToken;
  // Organisation A keeps the demo catalog; B has none.
  for (const item of harborLaneCatalog.items) await request(t.app).post('/v1/catalog/items').set(bearer(admin)).send(item).expect(201);
});
afterAll(async () => {
  await closeTraffic(t.app);
  await t.close();
});

const batch = (token: string, body: unknown, query = '') => request(t.app).post(`${PATH}${query}`).set(bearer(token)).send(body as object);

describe('POST /v1/estimates/batch', () => {
  it('answers each item on its own: good ones sized, bad ones with their own problem, refs echoed, counts summed', async () => {
    const res = await batch(batchKey, {
      items: [
        { ref: 'Plot 14', request: alderRowTownhouse },
        { ref: 'Plot 15', request: { ...alderRowCornerUnit, staircase: { ...alderRowCornerUnit.staircase, treads: -3 } } },
        { request: quaysideCorridor },
        { ref: 'Plot 16', request: { ...alderRowTownhouse, cable: { maxDropPercnt: 3 } } },
        { ref: 'Plot 17', request: 'not an estimate' },
      ],
    }).expect(200);

    expect(res.body.detail).toBe('summary');
    expect(res.body.items.map((i: { index: number; ref: string | null; status: string }) => [i.index, i.ref, i.status])).toEqual([
      [0, 'Plot 14', 'ok'],
      [1, 'Plot 15', 'error'],
      [2, null, 'ok'],
      [3, 'Plot 16', 'error'],
      [4, 'Plot 17', 'error'],
    ]);
    // The same figures a single estimate answers.
    const single = await request(t.app).post('/v1/estimates').set(bearer(sizingOnlyKey)).send(alderRowTownhouse).expect(200);
    const first = res.body.items[0];
    expect(first.summary).toEqual(single.body.summary);
    expect(first.layout).toBe('tread-strips');
    expect(first.failingChecks).toEqual(single.body.checks.filter((c: { status: string }) => c.status === 'fail').map((c: { id: string }) => c.id));
    expect(first.bomTotal).toBe(single.body.bomTotal);
    expect(first.result).toBeUndefined();

    expect(res.body.items[1].problem).toMatchObject({ code: 'validation_failed' });
    expect(res.body.items[1].problem.errors.map((e: { path: string }) => e.path)).toContain('staircase.treads');
    expect(res.body.items[3].problem.errors).toEqual([{ path: 'cable.maxDropPercnt', message: 'unknown field' }]);
    expect(res.body.items[4].problem.code).toBe('validation_failed');

    expect(res.body.summary).toMatchObject({ items: 5, ok: 2, failed: 3 });
    const withFailing = res.body.items.filter((i: { status: string; failingChecks?: string[] }) => i.status === 'ok' && i.failingChecks!.length > 0);
    expect(res.body.summary.withFailingChecks).toBe(withFailing.length);
  });

  it('adds the whole estimate with detail=full, equal to the single estimate', async () => {
    const res = await batch(batchKey, { items: [{ ref: 'A', request: alderRowCornerUnit }] }, '?detail=full').expect(200);
    const single = await request(t.app).post('/v1/estimates').set(bearer(sizingOnlyKey)).send(alderRowCornerUnit).expect(200);
    expect(res.body.detail).toBe('full');
    expect(res.body.items[0].result).toEqual(single.body);
  });

  it('counts the checks that fail, item by item', async () => {
    // Three treads on a controller that needs at least six: tread-count-range fails in both items.
    const short = { ...alderRowTownhouse, staircase: { ...alderRowTownhouse.staircase, treads: 3 }, controller: { profile: { outputs: 20, maxCurrentPerOutputA: 3, minTreads: 6 } } };
    const res = await batch(batchKey, { items: [{ request: short }, { request: short }, { request: alderRowTownhouse }] }).expect(200);
    expect(res.body.items[0].failingChecks).toContain('tread-count-range');
    const entry = res.body.summary.failingChecks.find((c: { id: string }) => c.id === 'tread-count-range');
    expect(entry).toEqual({ id: 'tread-count-range', items: 2 });
    expect(res.body.summary.withFailingChecks).toBeGreaterThanOrEqual(2);
  });

  it('refuses an empty batch, more than 500 items and unknown envelope fields as 400', async () => {
    await batch(batchKey, { items: [] }).expect(400);
    const tooMany = await batch(batchKey, { items: new Array(MAX_BATCH_ITEMS + 1).fill({ request: quaysideCorridor }) }).expect(400);
    expect(tooMany.headers['content-type']).toMatch(/^application\/problem\+json/);
    expect(tooMany.body.errors[0].path).toBe('items');
    const unknown = await batch(batchKey, { items: [{ request: quaysideCorridor, reff: 'x' }] }).expect(400);
    expect(unknown.body.errors).toEqual([{ path: 'items.0.reff', message: 'unknown field' }]);
    await batch(batchKey, { items: [{ request: quaysideCorridor }] }, '?detail=everything').expect(400);
  });

  it('takes the whole 500 items in one body, past the usual JSON limit', async () => {
    const items = new Array(MAX_BATCH_ITEMS).fill(null).map((_, i) => ({ ref: `Plot ${i + 1}`, request: alderRowWithRail }));
    // Over the API's default JSON limit (256 kB, JSON_BODY_LIMIT) that every other route keeps.
    expect(Buffer.byteLength(JSON.stringify({ items }))).toBeGreaterThan(256 * 1024);
    await request(t.app).post('/v1/estimates').set(bearer(sizingOnlyKey)).send({ ...alderRowWithRail, pad: 'x'.repeat(300 * 1024) }).expect(413);
    const key = await partnerKey();
    const res = await batch(key, { items }).expect(200);
    expect(res.body.summary).toMatchObject({ items: 500, ok: 500, failed: 0 });
    expect(res.body.items[499].ref).toBe('Plot 500');
  });

  it('is refused to embed keys, keys without batches:write and viewers; estimators may call it', async () => {
    const body = { items: [{ request: quaysideCorridor }] };
    expect((await batch(embedKey, body).set('Origin', 'https://shop.example')).status).toBe(403);
    await batch(sizingOnlyKey, body).expect(403);
    await batch(viewer, body).expect(403);
    await batch(estimator, body).expect(200);
  });

  it('prices each organisation from its own stored catalog only', async () => {
    const mine = await batch(batchKey, { items: [{ request: alderRowUnpriced }] }, '?detail=full').expect(200);

    expect(mine.body.items[0].result.pricing.source).toBe('stored');
    expect(mine.body.items[0].bomTotal).toBeGreaterThan(0);
    // B has no catalog: the controller named by its SKU cannot be found, A's catalog is never read.
    const theirs = await batch(otherBatchKey, { items: [{ request: alderRowUnpriced }, { request: alderRowTownhouse }] }, '?detail=full').expect(200);
    expect(theirs.body.items[0]).toMatchObject({ status: 'error', problem: { code: 'validation_failed' } });
    expect(theirs.body.items[0].problem.errors[0].path).toBe('controller.profileId');
    // An inline profile sizes, unpriced.
    expect(theirs.body.items[1].status).toBe('ok');
    expect(theirs.body.items[1].result.pricing).toBeUndefined();
    expect(theirs.body.items[1].bomTotal).toBeUndefined();
    const mineToo = await batch(batchKey, { items: [{ request: alderRowTownhouse }] }, '?detail=full').expect(200);
    expect(mineToo.body.items[0].result.pricing.source).toBe('stored');
  });
});

/** A fresh key on the partner plan (large quota and cost budget) for the 500-item batch. */
async function partnerKey(): Promise<string> {
  const org = await createOrganization(t);
  await t.database.db.update(organizations).set({ planId: 'partner' }).where(eq(organizations.id, org.id));
  return (await createKey(t, org.id, { scopes: ['batches:write'] })).token;
}

async function tinyOrganization() {
  const org = await createOrganization(t);
  await t.database.db.update(organizations).set({ planId }).where(eq(organizations.id, org.id));
  const admins = [(await createMember(t.app, org.id, 'admin')).email];
  // Usage is read as a signed-in viewer: those calls are not metered, so they use no units.
  const reader = (await signIn(t.app, (await createMember(t.app, org.id, 'viewer')).email)).accessToken;
  const { token } = await createKey(t, org.id, { scopes: ['batches:write', 'sizing:run'] });
  return { org, admins, token, reader };
}

const usedThisMonth = async (reader: string) => {
  await t.app.locals.services.usageMeter.flush();
  const res = await request(t.app).get('/v1/usage').set(bearer(reader)).expect(200);
  return res.body.quota.usedThisMonth as number;
};

const mailTo = (addresses: string[]) => t.database.db.select().from(outboxMessages).where(inArray(outboxMessages.to, addresses)).orderBy(asc(outboxMessages.subject));

describe('quota units', () => {
  it('a batch of 3 uses 3 units, in the quota and in the usage report', async () => {
    now = new Date('2026-11-20T10:00:00Z');
    const { token, reader } = await tinyOrganization();
    const res = await batch(token, { items: [{ request: quaysideCorridor }, { request: alderRowTownhouse }, { request: { layout: 'nope' } }] }).expect(200);
    expect(res.headers.ratelimit).toContain('"monthly-quota"; r=7;');
    expect(await usedThisMonth(reader)).toBe(3);
    const usage = await request(t.app).get('/v1/usage').set(bearer(reader)).expect(200);
    expect(usage.body.totals).toMatchObject({ requests: 1, limited: 0, units: 3 });
  });

  it('a batch larger than what is left is refused whole and uses nothing', async () => {
    now = new Date('2026-11-20T10:00:00Z');
    const { token, reader } = await tinyOrganization();
    await batch(token, { items: new Array(6).fill({ request: quaysideCorridor }) }).expect(200);
    expect(await usedThisMonth(reader)).toBe(6);

    const refused = await batch(token, { items: new Array(5).fill({ request: quaysideCorridor }) }).expect(429);
    expect(refused.body.code).toBe('quota_exceeded');
    expect(refused.body.detail).toContain('needs 5 quota units');
    expect(refused.body.detail).toContain('4 of the 10');
    expect(refused.headers['retry-after']).toBeDefined();
    expect(refused.headers.ratelimit).toContain('"monthly-quota"; r=4;');
    expect(refused.headers.ratelimit.match(/"monthly-quota"/g)).toHaveLength(1); // the admission's own entry was replaced
    expect(await usedThisMonth(reader)).toBe(6);

    // What is left is still there, to the unit.
    await batch(token, { items: new Array(4).fill({ request: quaysideCorridor }) }).expect(200);
    expect(await usedThisMonth(reader)).toBe(10);
    await batch(token, { items: [{ request: quaysideCorridor }] }).expect(429);
    const usage = await request(t.app).get('/v1/usage').set(bearer(reader)).expect(200);
    expect(usage.body.totals).toMatchObject({ requests: 4, limited: 2, units: 10 });
  });

  it('sends the 80 % and 100 % notices once each, batch or single call', async () => {
    now = new Date('2026-11-20T10:00:00Z');
    const { org, admins, token } = await tinyOrganization();
    await batch(token, { items: new Array(7).fill({ request: quaysideCorridor }) }).expect(200);
    await t.app.locals.services.quotas.idle();
    expect(await mailTo(admins)).toEqual([]);
    // Refused whole, the batch of 5 used nothing: its admission alone (8 of 10) sends no notice.
    await batch(token, { items: new Array(5).fill({ request: quaysideCorridor }) }).expect(429);
    await t.app.locals.services.quotas.idle();
    expect(await mailTo(admins)).toEqual([]);

    await batch(token, { items: new Array(2).fill({ request: quaysideCorridor }) }).expect(200); // 9 of 10: past 80 %
    await t.app.locals.services.quotas.idle();
    expect((await mailTo(admins)).map((m) => m.subject)).toEqual([`Treadwise: ${org.name} has used 80 % of its monthly quota units`]);

    await request(t.app).post('/v1/estimates').set(bearer(token)).send(quaysideCorridor).expect(200); // the 10th
    await batch(token, { items: [{ request: quaysideCorridor }] }).expect(429);
    await t.app.locals.services.quotas.idle();
    expect((await mailTo(admins)).map((m) => m.subject)).toEqual([
      `Treadwise: ${org.name} has used 80 % of its monthly quota units`,
      `Treadwise: ${org.name} has used its monthly quota units`,
    ]);
  });
});

describe('checking items one by one', () => {
  // Whatever an item holds, it becomes its parsed request or its own validation problem, never a throw.
  const anything = fc.oneof(
    fc.anything(),
    fc.constantFrom(...Object.values(estimateExamples)).chain((example) =>
      fc.tuple(fc.constantFrom(...Object.keys(example)), fc.anything()).map(([key, value]) => ({ ...example, [key]: value })),
    ),
  );
  it('answers every item, in order, with a parsed request or field errors', () => {
    fc.assert(
      fc.property(fc.array(anything, { minLength: 1, maxLength: 8 }), (requests) => {
        const checked = checkItems({ items: requests.map((request) => ({ request })) });
        expect(checked.map((c) => c.index)).toEqual(requests.map((_, i) => i));
        for (const item of checked) {
          if ('problem' in item) {
            expect(item.problem.code).toBe('validation_failed');
            expect(item.problem.errors!.length).toBeGreaterThan(0);
          } else {
            expect(item.input.layout).toBeDefined();
          }
        }
      }),
      { numRuns: 300, seed: 0xba7c },
    );
  });
});
