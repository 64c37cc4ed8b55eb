import { eq } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { organizations } from '../../api/db/schema.js';
import { alderRowTownhouse } from '../../shared/schemas/estimate-examples.js';
import { bearer, createMember, createOperator, signIn } from '../support/accounts.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

const SCRAPE_TOKEN = 'scrape-token-for-tests-0123456789';
const VD = { supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 } };

let t: TestApp;
let key: string;
let operator: string;
let admin: string;
let embed: string;
beforeAll(async () => {
  t = await createTestApp({ METRICS_TOKEN: SCRAPE_TOKEN });
  const org = await createOrganization(t);
  // The free plan: 60 calls a minute (migration 0001), so a 429 is quick to reach.
  await t.database.db.update(organizations).set({ planId: 'free' }).where(eq(organizations.id, org.id));
  key = (await createKey(t, org.id, { scopes: ['sizing:run', 'usage:read'] })).token;
  embed = (await createKey(t, org.id, { kind: 'embed', allowedOrigins: ['https://shop.metrics.test'] })).token;
  const ops = await createOperator(t.app);
  operator = (await signIn(t.app, ops.email)).accessToken;
  const member = await createMember(t.app, org.id, 'admin');
  admin = (await signIn(t.app, member.email)).accessToken;
});
afterAll(() => t.close());

const scrape = () => request(t.app).get('/metrics').set(bearer(SCRAPE_TOKEN));
/** The value of one sample line, or undefined when the text has none. */
const sample = (text: string, line: string) => {
  const found = text.split('\n').find((l) => l.startsWith(`${line} `));
  return found === undefined ? undefined : Number(found.slice(line.length + 1));
};

describe('GET /metrics', () => {
  it('is not public: no credentials 401, a wrong token 401, server and embed keys and an organisation admin 403', async () => {
    expect((await request(t.app).get('/metrics')).status).toBe(401);
    expect((await request(t.app).get('/metrics').set(bearer('not-the-scrape-token'))).status).toBe(401);
    const byKey = await request(t.app).get('/metrics').set(bearer(key));
    expect(byKey.status).toBe(403);
    expect(byKey.headers['content-type']).toContain('application/problem+json');
    expect((await request(t.app).get('/metrics').set(bearer(admin))).status).toBe(403);
    expect((await request(t.app).get('/metrics').set(bearer(embed)).set('Origin', 'https://shop.metrics.test')).status).toBe(403);
  });

  it('answers the scraper and the operator in the OpenMetrics text format', async () => {
    for (const token of [SCRAPE_TOKEN, operator]) {
      const res = await request(t.app).get('/metrics').set(bearer(token));
      expect(res.status).toBe(200);
      expect(res.headers['content-type']).toContain('application/openmetrics-text; version=1.0.0');
      expect(res.text.endsWith('# EOF\n')).toBe(true);
      expect(res.text).toContain('# TYPE treadwise_process_resident_memory_bytes gauge');
    }
  });

  it('counts calls by route pattern and status, engine time, quota units and limit refusals', async () => {
    const before = (await scrape()).text;
    const count = (text: string, line: string) => sample(text, line) ?? 0;
    const route = 'treadwise_http_requests_total{route="POST /v1/calculations/voltage-drop",status="200"}';
    const engine = 'treadwise_engine_duration_seconds_count{operation="voltage-drop"}';
    const units = 'treadwise_quota_units_total';
    const refused = 'treadwise_limit_refusals_total{reason="rate_limited"}';

    let ok = 0;
    let limited = 0;
    while (limited === 0 && ok < 100) {
      const res = await request(t.app).post('/v1/calculations/voltage-drop').set(bearer(key)).send(VD);
      if (res.status === 429) limited++;
      else if (res.status === 200) ok++;
      else throw new Error(`unexpected ${res.status}`);
    }

    const after = (await scrape()).text;
    expect(limited).toBe(1);
    expect(count(after, route) - count(before, route)).toBe(ok);
    expect(count(after, engine) - count(before, engine)).toBe(ok);
    expect(count(after, units) - count(before, units)).toBe(ok);
    expect(count(after, refused) - count(before, refused)).toBe(1);
    // Latency histogram by route and status class; ids never appear in labels.
    expect(after).toMatch(/treadwise_http_request_duration_seconds_bucket\{le="0\.005",route="POST \/v1\/calculations\/voltage-drop",status_class="2xx"\} \d+/);
    expect(after).not.toMatch(/route="[^"]*[0-9a-f]{8}-[0-9a-f]{4}/);
  });
});

describe('GET /metrics and batch jobs', () => {
  it('shows the rows still to size while a job waits, and the job by status once it has run', async () => {
    const org = await createOrganization(t);
    const { token } = await createKey(t, org.id, { scopes: ['batches:write'] });
    const items = [{ ref: 'Plot 1', request: alderRowTownhouse }, { ref: 'Plot 2', request: alderRowTownhouse }, { ref: 'Plot 3', request: { layout: 'nonsense' } }];
    await request(t.app).post('/v1/batches').set(bearer(token)).send({ name: 'Metrics', items }).expect(202);
    const waiting = (await scrape()).text;
    expect(sample(waiting, 'treadwise_batch_rows{state="pending"}')).toBe(3);
    expect(sample(waiting, 'treadwise_batch_jobs{status="queued"}')).toBe(1);
    await t.app.locals.services.batchJobs.drain();
    const done = (await scrape()).text;
    expect(sample(done, 'treadwise_batch_rows{state="pending"}')).toBe(0);
    expect(sample(done, 'treadwise_batch_jobs{status="succeeded"}')).toBe(1);
    expect(sample(done, 'treadwise_batch_jobs{status="queued"}')).toBeUndefined();
  });
});
