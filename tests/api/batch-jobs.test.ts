import { randomBytes } from 'node:crypto';
import { parse } from 'csv-parse/sync';
import { and, eq } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { batchJobRows, batchJobs, organizations, outboxMessages, plans } from '../../api/db/schema.js';
import { alderRowCornerUnit, alderRowTownhouse, harborLaneCatalog, harborLaneCheckout, quaysideCorridor } from '../../shared/schemas/estimate-examples.js';
import { requestToRow, stairRowColumns } from '../../shared/schemas/stair-row.js';
import { BATCH_RESULT_COLUMNS, batchResultRow } from '../../shared/sizing/batch/result-row.js';
import { writeCsv } from '../../shared/tables/csv.js';
import { bearer, createMember, signIn } from '../support/accounts.js';
import { closeTraffic } from '../support/app-instance.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';
import { batchJobView, type BatchJobRow } from '../../api/services/batch-jobs/view.js';
import { createBatchJobService } from '../../api/services/batch-jobs/runner.js';
import { jsonRows } from '../../api/services/batch-jobs/intake.js';
import { createLogger } from '../../api/logger.js';
import { HttpProblem } from '../../api/problem.js';

const { catalog: _inline, ...alderRowUnpriced } = harborLaneCheckout;
// A plan made for these tests: 10 quota units a month, a rate that never binds.
const TINY = { monthlyQuota: 10, ratePerMinute: 1000 };

let now = new Date('2026-11-20T10:00:00Z');
const clock = () => now;

let t: TestApp;
let orgId: string;
let batchKey: string;
let readKey: string;
let embedKey: string;
let sizingKey: string;
let otherKey: string;
let estimator: { token: string; email: string };
let viewer: string;
let adminEmail: string;
let tinyKey: string;
let tinyAdmin: string;
let tinyOrgId: string;

const jobs = () => t.app.locals.services.batchJobs;

/** The items both the synchronous batch and the job get: good ones, a bad one, one priced from the stored catalog. */
const ITEMS = [
  { ref: 'Plot 14', request: alderRowTownhouse },
  { ref: 'Plot 15', request: { ...alderRowCornerUnit, staircase: { ...alderRowCornerUnit.staircase, treads: -3 } } },
  { request: quaysideCorridor },
  { ref: 'Plot 16', request: { ...alderRowTownhouse, cable: { maxDropPercnt: 3 } } },
  { ref: 'Plot 17', request: alderRowUnpriced },
];

beforeAll(async () => {
  t = await createTestApp({}, clock);
  const org = await createOrganization(t, `jobs-a-${randomBytes(2).toString('hex')}`);
  orgId = org.id;
  const other = await createOrganization(t, `jobs-b-${randomBytes(2).toString('hex')}`);
  batchKey = (await createKey(t, org.id, { scopes: ['batches:write', 'usage:read'] })).token;
  readKey = (await createKey(t, org.id, { scopes: ['batches:read'] })).token;
  sizingKey = (await createKey(t, org.id, { scopes: ['sizing:run'] })).token;
  embedKey = (await createKey(t, org.id, { kind: 'embed' })).token;
  otherKey = (await createKey(t, other.id, { scopes: ['batches:write'] })).token;
  const admin = await createMember(t.app, org.id, 'admin');
  adminEmail = admin.email;
  const adminToken = (await signIn(t.app, admin.email)).accessToken;
  const est = await createMember(t.app, org.id, 'estimator');
  estimator = { token: (await signIn(t.app, est.email)).accessToken, email: est.email };
  viewer = (await signIn(t.app, (await createMember(t.app, org.id, 'viewer')).email)).accessToken;
  for (const item of harborLaneCatalog.items) await request(t.app).post('/v1/catalog/items').set(bearer(adminToken)).send(item).expect(201);

  const planId = `tiny-${randomBytes(3).toString('hex')}`;
  await t.database.db.insert(plans).values({ id: planId, name: 'Tiny', ...TINY });
  const tiny = await createOrganization(t, `jobs-tiny-${randomBytes(2).toString('hex')}`);
  tinyOrgId = tiny.id;
  await t.database.db.update(organizations).set({ planId }).where(eq(organizations.id, tiny.id));
  tinyAdmin = (await signIn(t.app, (await createMember(t.app, tiny.id, 'admin')).email)).accessToken;
  tinyKey = (await createKey(t, tiny.id, { scopes: ['batches:write'] })).token;
});
afterAll(async () => {
  await jobs().close();
  await closeTraffic(t.app);
  await t.close();
});

const postJson = (token: string, body: object, query = '') => request(t.app).post(`/v1/batches${query}`).set(bearer(token)).send(body);
const upload = (token: string, content: string, filename: string, contentType: string, name?: string) => {
  const req = request(t.app).post('/v1/batches').set(bearer(token));
  if (name) req.field('name', name);
  return req.attach('file', Buffer.from(content), { filename, contentType });
};
const ndjsonLines = (text: string) =>
  text
    .split('\n')
    .filter((l) => l !== '')
    .map((l) => JSON.parse(l));

/** The rows of a job as stored: how many, how many distinct, how many answered. */
async function rowCounts(jobId: string) {
  const rows = await t.database.db.select({ idx: batchJobRows.idx, answer: batchJobRows.answer }).from(batchJobRows).where(eq(batchJobRows.jobId, jobId));
  return { rows: rows.length, distinct: new Set(rows.map((r) => r.idx)).size, answered: rows.filter((r) => r.answer !== null).length };
}

describe('POST /v1/batches with JSON items', () => {
  it('queues a job (202 + Location), sizes it in the background, and answers each row as POST /v1/estimates/batch does', async () => {
    const created = await postJson(batchKey, { name: 'Alder Row, plots 14-17', items: ITEMS }).expect(202);
    expect(created.headers.location).toBe(`/v1/batches/${created.body.id}`);
    expect(created.body).toMatchObject({ name: 'Alder Row, plots 14-17', status: 'queued', source: 'json', detail: 'summary', rows: { total: 5, done: 0 }, progress: 0, catalogVersion: expect.any(Number) });
    expect(created.body.createdBy.type).toBe('key');

    await jobs().drain();
    const job = await request(t.app).get(created.headers.location).set(bearer(readKey)).expect(200);
    expect(job.body).toMatchObject({ status: 'succeeded', stopReason: null, rows: { total: 5, done: 5, ok: 3, failed: 2 }, progress: 1, etaSeconds: null });
    expect(job.headers['retry-after']).toBeUndefined();

    const sync = await request(t.app).post('/v1/estimates/batch').set(bearer(batchKey)).send({ items: ITEMS }).expect(200);
    const results = await request(t.app).get(`${created.headers.location}/results`).set(bearer(readKey)).expect(200);
    expect(results.headers['content-type']).toMatch(/^application\/x-ndjson/);
    expect(ndjsonLines(results.text)).toEqual(sync.body.items);
    expect(job.body.rows.withFailingChecks).toBe(sync.body.summary.withFailingChecks);

    const errors = await request(t.app).get(`${created.headers.location}/errors`).set(bearer(readKey)).expect(200);
    expect(ndjsonLines(errors.text).map((i: { index: number }) => i.index)).toEqual([1, 3]);
    expect(await rowCounts(created.body.id)).toEqual({ rows: 5, distinct: 5, answered: 5 });
  });

  it('keeps detail=full: ok lines carry the whole estimate', async () => {
    const created = await postJson(batchKey, { items: ITEMS.slice(0, 1) }, '?detail=full').expect(202);
    await jobs().drain();
    const [line] = ndjsonLines((await request(t.app).get(`/v1/batches/${created.body.id}/results`).set(bearer(batchKey)).expect(200)).text);
    expect(line.status).toBe('ok');
    expect(line.result.engineVersion).toBe(created.body.engineVersion);
  });

  it('replays the first answer to a retry with the same Idempotency-Key: one job, not two', async () => {
    const key = `job-${randomBytes(4).toString('hex')}`;
    const count = async () => (await t.database.db.select({ id: batchJobs.id }).from(batchJobs).where(eq(batchJobs.organizationId, orgId))).length;
    const before = await count();
    const first = await postJson(batchKey, { items: ITEMS.slice(0, 1) }).set('Idempotency-Key', key).expect(202);
    const again = await postJson(batchKey, { items: ITEMS.slice(0, 1) }).set('Idempotency-Key', key).expect(202);
    expect(again.body).toEqual(first.body);
    expect((await postJson(batchKey, { items: ITEMS.slice(0, 2) }).set('Idempotency-Key', key).expect(422)).body.code).toBe('idempotency_key_reused');
    expect(await count()).toBe(before + 1);
    await jobs().drain();
  });

  it('refuses an empty list and unknown fields of the envelope (400)', async () => {
    await postJson(batchKey, { items: [] }).expect(400);
    const res = await postJson(batchKey, { items: ITEMS, colour: 'blue' }).expect(400);
    expect(res.body.code).toBe('validation_failed');
  });
});

describe('POST /v1/batches with a file', () => {
  // Plus a misspelt column, which only the row that fills it trips over.
  const columns = [...stairRowColumns(ITEMS.map((i) => i.request)), 'cable.maxDropPercnt'];
  const csvOf = (items: { ref?: string; request: object }[]) =>
    writeCsv([
      columns,
      ...items.map((i) => {
        const row = requestToRow(i.request, i.ref);
        return columns.map((c) => row[c]);
      }),
    ]);

  it('reads a stair-row CSV: every row its own answer, and the CSV results parse back to the result rows', async () => {
    const created = await upload(batchKey, csvOf(ITEMS.filter((i) => typeof i.request === 'object')), 'plots.csv', 'text/csv', 'From a spreadsheet').expect(202);
    expect(created.body).toMatchObject({ source: 'csv', name: 'From a spreadsheet', rows: { total: 5 } });
    await jobs().drain();
    const ndjson = ndjsonLines((await request(t.app).get(`/v1/batches/${created.body.id}/results?format=ndjson`).set(bearer(batchKey)).expect(200)).text);
    expect(ndjson.map((i: { ref: string | null; status: string }) => [i.ref, i.status])).toEqual([
      ['Plot 14', 'ok'],
      ['Plot 15', 'error'],
      [null, 'ok'],
      ['Plot 16', 'error'],
      ['Plot 17', 'ok'],
    ]);
    // The typo column `cable.maxDropPercnt` is that row's unknown field.
    expect(ndjson[3].problem.errors).toEqual([{ path: 'cable.maxDropPercnt', message: 'unknown field' }]);

    const csv = await request(t.app).get(`/v1/batches/${created.body.id}/results?format=csv`).set(bearer(batchKey)).expect(200);
    expect(csv.headers['content-type']).toMatch(/^text\/csv/);
    expect(csv.text.startsWith('\uFEFF')).toBe(true);
    expect(csv.text.indexOf('\uFEFF', 1)).toBe(-1);
    const records = parse(csv.text, { bom: true }) as string[][];
    expect(records[0]).toEqual([...BATCH_RESULT_COLUMNS]);
    expect(records.slice(1)).toEqual(ndjson.map((item: Parameters<typeof batchResultRow>[0]) => batchResultRow(item).map((c) => (c === null ? '' : String(c)))));
    expect(csv.text).toBe(writeCsv([BATCH_RESULT_COLUMNS, ...ndjson.map(batchResultRow)]));
  });

  it('tells uploads apart under one Idempotency-Key: the same file is replayed, another file is a 422', async () => {
    const key = `upload-${randomBytes(4).toString('hex')}`;
    const count = async () => (await t.database.db.select({ id: batchJobs.id }).from(batchJobs).where(eq(batchJobs.organizationId, orgId))).length;
    const before = await count();
    const file = csvOf(ITEMS.slice(0, 2));
    const first = await upload(batchKey, file, 'plots.csv', 'text/csv').set('Idempotency-Key', key).expect(202);
    const again = await upload(batchKey, file, 'plots.csv', 'text/csv').set('Idempotency-Key', key).expect(202);
    expect(again.body).toEqual(first.body);
    // Same name, same size class, other rows: not the request the key stands for.
    const other = await upload(batchKey, csvOf(ITEMS.slice(1, 3)), 'plots.csv', 'text/csv').set('Idempotency-Key', key).expect(422);
    expect(other.body.code).toBe('idempotency_key_reused');
    expect(await count()).toBe(before + 1);
    await jobs().drain();
  });

  it('reads NDJSON line by line: a line that is not JSON is its own error', async () => {
    const text = [JSON.stringify(ITEMS[0]), '{ not json', '', JSON.stringify({ ref: 'Corridor', request: quaysideCorridor }), JSON.stringify({ request: alderRowTownhouse, extra: 1 })].join('\n');
    const created = await upload(batchKey, text, 'plots.ndjson', 'application/octet-stream').expect(202);
    expect(created.body).toMatchObject({ source: 'ndjson', rows: { total: 4 } });
    await jobs().drain();
    const lines = ndjsonLines((await request(t.app).get(`/v1/batches/${created.body.id}/results`).set(bearer(batchKey)).expect(200)).text);
    expect(lines.map((i: { index: number; status: string }) => [i.index, i.status])).toEqual([
      [0, 'ok'],
      [1, 'error'],
      [2, 'ok'],
      [3, 'error'],
    ]);
    expect(lines[3].problem.errors).toEqual([{ path: 'extra', message: 'unknown field' }]);
  });

  it('refuses a file it cannot read at all, and leaves no job behind', async () => {
    const before = (await t.database.db.select({ id: batchJobs.id }).from(batchJobs)).length;
    const unknownKind = await upload(batchKey, 'hello', 'notes.txt', 'text/plain').expect(400);
    expect(unknownKind.body.code).toBe('not_csv');
    const twice = await upload(batchKey, 'ref,ref\r\na,b\r\n', 'twice.csv', 'text/csv').expect(400);
    expect(twice.body.code).toBe('not_csv');
    const broken = await upload(batchKey, 'ref,layout\r\n"unclosed,tread-strips\r\n', 'broken.csv', 'text/csv').expect(400);
    expect(broken.body.code).toBe('not_csv');
    const headerOnly = await upload(batchKey, 'ref,layout\r\n', 'empty.csv', 'text/csv').expect(400);
    expect(headerOnly.body.code).toBe('validation_failed');
    await request(t.app).post('/v1/batches').set(bearer(batchKey)).field('name', 'no file').expect(400);
    await request(t.app).post('/v1/batches').set(bearer(batchKey)).set('content-type', 'text/csv').send('ref\r\nx\r\n').expect(415);
    expect((await t.database.db.select({ id: batchJobs.id }).from(batchJobs)).length).toBe(before);
  });
});

describe('the row cap', () => {
  it('refuses a job over the cap whole (413 too_many_rows) after reading one row too many, and leaves no rows behind', async () => {
    const services = t.app.locals.services;
    // The real cap is MAX_JOB_ROWS (100 000); the same code with a cap of 3.
    const small = createBatchJobService({ database: t.database, clock, logger: createLogger('silent'), quotas: services.quotas, usageMeter: services.usageMeter, mailer: services.mailer, catalog: services.catalog, publicUrl: 'http://localhost', retentionDays: 7, maxRows: 3 });
    const job = { organizationId: orgId, name: null, source: 'json' as const, detail: 'summary' as const, createdBy: { type: 'key' as const, id: 'cap-test' }, meteredKeyId: 'cap-test' };
    const refused = await small.create(job, jsonRows(ITEMS.slice(0, 4))).catch((err: unknown) => err);
    expect(refused).toBeInstanceOf(HttpProblem);
    expect(refused).toMatchObject({ status: 413, code: 'too_many_rows' });
    expect(await t.database.db.select().from(batchJobs).where(eq(batchJobs.createdById, 'cap-test'))).toEqual([]);
    const fits = await small.create(job, jsonRows(ITEMS.slice(0, 3)));
    expect(fits.rows.total).toBe(3);
    await small.close();
  });
});

describe('cancel, list and access', () => {
  it('cancels a queued job: nothing is answered after it; cancelling again is 409', async () => {
    const created = await postJson(batchKey, { items: ITEMS }).expect(202);
    const cancelled = await request(t.app).post(`/v1/batches/${created.body.id}/cancel`).set(bearer(batchKey)).expect(200);
    expect(cancelled.body).toMatchObject({ status: 'cancelled', stopReason: 'cancelled', rows: { done: 0 } });
    await jobs().drain();
    expect(await rowCounts(created.body.id)).toEqual({ rows: 5, distinct: 5, answered: 0 });
    const again = await request(t.app).post(`/v1/batches/${created.body.id}/cancel`).set(bearer(batchKey)).expect(409);
    expect(again.body.code).toBe('batch_finished');
  });

  it('lists jobs newest first with a cursor', async () => {
    now = new Date(now.getTime() + 1000);
    const newest = await postJson(batchKey, { name: 'newest', items: ITEMS.slice(0, 1) }).expect(202);
    const first = await request(t.app).get('/v1/batches?limit=1').set(bearer(viewer)).expect(200);
    expect(first.body.items.map((j: { id: string }) => j.id)).toEqual([newest.body.id]);
    expect(first.body.nextCursor).toEqual(expect.any(String));
    const second = await request(t.app).get(`/v1/batches?limit=1&cursor=${first.body.nextCursor}`).set(bearer(viewer)).expect(200);
    expect(second.body.items[0].id).not.toBe(newest.body.id);
    await jobs().drain();
  });

  it('hides another organisation’s job (404) and keeps embed keys, sizing-only keys and viewers from creating', async () => {
    const created = await postJson(batchKey, { items: ITEMS.slice(0, 1) }).expect(202);
    for (const path of ['', '/results', '/errors']) await request(t.app).get(`/v1/batches/${created.body.id}${path}`).set(bearer(otherKey)).expect(404);
    await request(t.app).post(`/v1/batches/${created.body.id}/cancel`).set(bearer(otherKey)).expect(404);
    await request(t.app).get('/v1/batches/not-a-uuid').set(bearer(batchKey)).expect(404);
    expect((await request(t.app).get('/v1/batches').set(bearer(otherKey)).expect(200)).body.items).toEqual([]);

    await postJson(embedKey, { items: ITEMS }).expect(403);
    await postJson(sizingKey, { items: ITEMS }).expect(403);
    await postJson(viewer, { items: ITEMS }).expect(403);
    await postJson(readKey, { items: ITEMS }).expect(403);
    await request(t.app).get(`/v1/batches/${created.body.id}`).set(bearer(viewer)).expect(200);
    await jobs().drain();
  });
});

describe('running jobs', () => {
  it('answers every row exactly once when two runners size the same job at once', async () => {
    const items = Array.from({ length: 650 }, (_, i) => ({ ref: `Plot ${i + 1}`, request: i % 7 === 3 ? { layout: 'tread-strips' } : alderRowTownhouse }));
    const created = await postJson(batchKey, { items }).expect(202);
    await Promise.all([jobs().drain(), jobs().drain()]);
    const [job] = await t.database.db.select().from(batchJobs).where(eq(batchJobs.id, created.body.id));
    expect(await rowCounts(created.body.id)).toEqual({ rows: 650, distinct: 650, answered: 650 });
    expect(job).toMatchObject({ status: 'succeeded', rowsDone: 650, rowsTotal: 650 });
    expect(job.rowsOk + job.rowsFailed).toBe(650);
    expect(job.rowsFailed).toBe(items.filter((i) => !('staircase' in i.request)).length);
    // Read back over more than one page of the database (500 rows a page), in row order.
    const lines = ndjsonLines((await request(t.app).get(`/v1/batches/${created.body.id}/results`).set(bearer(batchKey)).expect(200)).text);
    expect(lines.map((l: { index: number }) => l.index)).toEqual(items.map((_, i) => i));
    const csv = parse((await request(t.app).get(`/v1/batches/${created.body.id}/errors?format=csv`).set(bearer(batchKey)).expect(200)).text, { bom: true }) as string[][];
    expect(csv.slice(1).map((r) => Number(r[0]))).toEqual(items.flatMap((item, i) => ('staircase' in item.request ? [] : [i + 1])));
  });

  it('stops at the monthly quota with the rows done kept, and tells the admins', async () => {
    const items = Array.from({ length: 15 }, (_, i) => ({ ref: `Unit ${i + 1}`, request: alderRowTownhouse }));
    const created = await postJson(tinyKey, { items }).expect(202); // the call itself uses 1 of the 10 units
    await jobs().drain();
    // The key has no calls left either; a signed-in admin reads (reading is not sizing, so not metered for users).
    const job = await request(t.app).get(`/v1/batches/${created.body.id}`).set(bearer(tinyAdmin)).expect(200);
    expect(job.body).toMatchObject({ status: 'stopped', stopReason: 'quota_exceeded', rows: { total: 15, done: 9, ok: 9 } });
    const lines = ndjsonLines((await request(t.app).get(`/v1/batches/${created.body.id}/results`).set(bearer(tinyAdmin)).expect(200)).text);
    expect(lines.map((l: { index: number }) => l.index)).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8]);
    // Nothing left at all: a new job is refused, but the key that made the job still follows it
    // and reads its results (batch reads are counted, never refused by nor charged to the quota).
    expect((await postJson(tinyKey, { items }).expect(429)).body.code).toBe('quota_exceeded');
    expect((await request(t.app).get(`/v1/batches/${created.body.id}`).set(bearer(tinyKey)).expect(200)).body.rows.done).toBe(9);
    const byKey = ndjsonLines((await request(t.app).get(`/v1/batches/${created.body.id}/results`).set(bearer(tinyKey)).expect(200)).text);
    expect(byKey).toEqual(lines);
    await jobs().mailed();
    const mail = await t.database.db.select().from(outboxMessages);
    expect(mail.some((m) => m.subject.includes('stopped at the monthly quota') && m.text.includes('9 of 15 rows'))).toBe(true);
    const [stored] = await t.database.db.select().from(batchJobs).where(eq(batchJobs.organizationId, tinyOrgId));
    expect(stored.notifiedAt).not.toBeNull();
  });

  it('e-mails the creator when a job finishes: the user who made it, or for a key the admins', async () => {
    const byUser = await postJson(estimator.token, { name: 'Evening run', items: ITEMS.slice(0, 2) }).expect(202);
    expect(byUser.body.createdBy.type).toBe('user');
    await jobs().drain();
    await jobs().mailed();
    const mail = await t.database.db.select().from(outboxMessages);
    const toUser = mail.filter((m) => m.to === estimator.email);
    expect(toUser.map((m) => m.subject)).toContain('Treadwise: batch job "Evening run" has finished');
    expect(mail.some((m) => m.to === adminEmail && m.subject.includes('has finished'))).toBe(true);
  });
});

describe('retention', () => {
  it('deletes a job and its rows once it has expired, and no sooner', async () => {
    const created = await postJson(batchKey, { items: ITEMS.slice(0, 2) }).expect(202);
    await jobs().drain();
    const job = (await request(t.app).get(`/v1/batches/${created.body.id}`).set(bearer(batchKey)).expect(200)).body;
    // BATCH_RETENTION_DAYS defaults to 7: kept from the finish for a week.
    expect(new Date(job.expiresAt).getTime() - new Date(job.finishedAt).getTime()).toBe(7 * 24 * 3600 * 1000);
    now = new Date(new Date(job.expiresAt).getTime() - 1000);
    await jobs().sweep();
    await request(t.app).get(`/v1/batches/${created.body.id}`).set(bearer(batchKey)).expect(200);
    now = new Date(new Date(job.expiresAt).getTime() + 1000);
    await jobs().sweep();
    await request(t.app).get(`/v1/batches/${created.body.id}`).set(bearer(batchKey)).expect(404);
    expect(await t.database.db.select().from(batchJobRows).where(and(eq(batchJobRows.jobId, created.body.id)))).toEqual([]);
  });
});

describe('progress of a running job', () => {
  it('gives the rate since the start and the time left at that rate; none before the start or after the end', async () => {
    const created = await postJson(batchKey, { items: ITEMS }).expect(202);
    const [row] = await t.database.db.select().from(batchJobs).where(eq(batchJobs.id, created.body.id));
    const startedAt = new Date('2026-12-01T09:00:00Z');
    const running: BatchJobRow = { ...row, status: 'running', rowsTotal: 1000, rowsDone: 250, startedAt };
    // 250 rows in 10 s: 25 rows/s, 750 left: 30 s.
    expect(batchJobView(running, new Date('2026-12-01T09:00:10Z'))).toMatchObject({ progress: 0.25, rowsPerSecond: 25, etaSeconds: 30 });
    expect(batchJobView({ ...row, rowsTotal: 1000 }, new Date('2026-12-01T09:00:10Z'))).toMatchObject({ status: 'queued', progress: 0, rowsPerSecond: null, etaSeconds: null });
    const finished: BatchJobRow = { ...running, status: 'succeeded', rowsDone: 1000, finishedAt: new Date('2026-12-01T09:00:20Z') };
    expect(batchJobView(finished, new Date('2026-12-02T00:00:00Z'))).toMatchObject({ progress: 1, rowsPerSecond: 50, etaSeconds: null });
    await request(t.app).post(`/v1/batches/${created.body.id}/cancel`).set(bearer(batchKey)).expect(200);
  });
});
