import { eq, sql } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { batchJobRows, batchJobs, organizations } from '../../api/db/schema.js';
import { alderRowCornerUnit, alderRowTownhouse, quaysideCorridor } from '../../shared/schemas/estimate-examples.js';
import { bearer } from '../support/accounts.js';
import { anotherInstance, closeTraffic } from '../support/app-instance.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

const DATABASE_URL = process.env.DATABASE_URL;
const ROWS = 3000; // 15 chunks of 200
const designs = [alderRowTownhouse, alderRowCornerUnit, quaysideCorridor, { layout: 'tread-strips' }];

// Needs a real PostgreSQL (.ci/run sets DATABASE_URL): pg-boss runs only there.
describe.skipIf(!DATABASE_URL)('two API instances sharing one batch job through pg-boss', () => {
  let t: TestApp;
  let second: TestApp['app'];
  let key: string;

  beforeAll(async () => {
    t = await createTestApp();
    second = anotherInstance(t);
    const org = await createOrganization(t);
    // The free plan's 1 000 units a month would stop the job: the internal plan never does.
    await t.database.db.update(organizations).set({ planId: 'platform' }).where(eq(organizations.id, org.id));
    key = (await createKey(t, org.id, { scopes: ['batches:write'] })).token;
    await t.app.locals.services.batchJobs.start();
    await second.locals.services.batchJobs.start();
  });
  afterAll(async () => {
    await t.app.locals.services.batchJobs.close();
    await second.locals.services.batchJobs.close();
    await closeTraffic(t.app);
    await closeTraffic(second);
    await t.database.db.execute(sql.raw(`drop schema if exists "${t.database.schemaName}_pgboss" cascade`));
    await t.close();
  });

  it('answers each chunk on one instance or the other, both take part, and no row is answered twice', async () => {
    expect(t.app.locals.services.batchJobs.distributed).toBe(true);
    expect(second.locals.services.batchJobs.distributed).toBe(true);
    const items = Array.from({ length: ROWS }, (_, i) => ({ ref: `Plot ${i + 1}`, request: designs[i % designs.length] }));
    const created = await request(t.app).post('/v1/batches').set(bearer(key)).send({ items }).expect(202);
    const callsBefore = [t.app, second].map((app) => app.locals.services.usageMeter.pendingRequests());

    // Polled in the database, so the only usage entries the instances record from here are their chunks.
    const deadline = Date.now() + 90_000;
    for (;;) {
      const [state] = await t.database.db.select({ status: batchJobs.status }).from(batchJobs).where(eq(batchJobs.id, created.body.id));
      if ((state.status !== 'queued' && state.status !== 'running') || Date.now() > deadline) break;
      await new Promise((r) => setTimeout(r, 200));
    }
    const chunks = [t.app, second].map((app, i) => app.locals.services.usageMeter.pendingRequests() - callsBefore[i]!);
    const job = (await request(second).get(`/v1/batches/${created.body.id}`).set(bearer(key)).expect(200)).body;
    expect(job).toMatchObject({ status: 'succeeded', rows: { total: ROWS, done: ROWS, failed: ROWS / designs.length } });

    const [counts] = await t.database.db
      .select({ rows: sql<number>`count(*)::int`, distinct: sql<number>`count(distinct ${batchJobRows.idx})::int`, answered: sql<number>`count(${batchJobRows.answer})::int` })
      .from(batchJobRows)
      .where(eq(batchJobRows.jobId, created.body.id));
    expect(counts).toEqual({ rows: ROWS, distinct: ROWS, answered: ROWS });
    const [stored] = await t.database.db.select().from(batchJobs).where(eq(batchJobs.id, created.body.id));
    expect(stored.rowsOk + stored.rowsFailed).toBe(ROWS);

    // Each instance records one usage entry per chunk it wrote: both took part, and together they
    // wrote at least the 15 chunks (more only when a chunk was split by a retry, never a row twice: see above).
    expect(chunks[0]).toBeGreaterThan(0);
    expect(chunks[1]).toBeGreaterThan(0);
    expect(chunks[0]! + chunks[1]!).toBeGreaterThanOrEqual(ROWS / 200);
  }, 120_000);
});
