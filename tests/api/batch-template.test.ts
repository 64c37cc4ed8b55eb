import { parse } from 'csv-parse/sync';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { unguardCell } from '../../shared/tables/csv.js';
import { estimateRequestSchema } from '../../shared/schemas/estimate.js';
import { estimateExamples } from '../../shared/schemas/estimate-examples.js';
import { REF_COLUMN, rowToRequest, stairRowColumns } from '../../shared/schemas/stair-row.js';
import { bearer, createMember, signIn } from '../support/accounts.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

const PATH = '/v1/batches/template.csv';
let t: TestApp;
let batchKey: string;
let sizingKey: string;
let viewer: string;
let estimator: string;

beforeAll(async () => {
  t = await createTestApp();
  const org = await createOrganization(t, 'template');
  batchKey = (await createKey(t, org.id, { scopes: ['batches:write'] })).token;
  sizingKey = (await createKey(t, org.id, { scopes: ['sizing:run'] })).token;
  viewer = (await signIn(t.app, (await createMember(t.app, org.id, 'viewer')).email)).accessToken;
  estimator = (await signIn(t.app, (await createMember(t.app, org.id, 'estimator')).email)).accessToken;
});
afterAll(() => t.close());

/** The CSV as a reader takes it: BOM dropped, records by header, the formula guard undone. */
function readRows(text: string): { header: string[]; rows: Record<string, string>[] } {
  const records: string[][] = parse(text, { bom: true, relax_column_count: false });
  const [header, ...body] = records;
  return { header: header!, rows: body.map((cells) => Object.fromEntries(header!.map((c, i) => [c, unguardCell(cells[i] ?? '')]))) };
}

describe('GET /v1/batches/template.csv', () => {
  it('is the schema’s columns and one valid example row per layout, each sizing as the example it shows', async () => {
    const res = await request(t.app).get(PATH).set(bearer(batchKey)).expect(200);
    expect(res.headers['content-type']).toBe('text/csv; charset=utf-8');
    expect(res.headers['content-disposition']).toBe('attachment; filename=treadwise-stairs-template.csv');
    expect(res.text.startsWith('\uFEFF')).toBe(true);

    const { header, rows } = readRows(res.text);
    expect(header).toEqual(stairRowColumns([], { omit: ['catalog'] }));
    expect(header[0]).toBe(REF_COLUMN);
    expect(rows.length).toBeGreaterThanOrEqual(4);

    const read = rows.map(rowToRequest);
    const layouts = new Set(read.map((r) => r.request.layout));
    expect([...layouts].sort()).toEqual(['rail-pixels', 'tread-pixels', 'tread-strips', 'treads-and-rail']);
    for (const { ref, request: req } of read) {
      expect(ref).toBeTruthy();
      expect(estimateRequestSchema.safeParse(req).success, ref).toBe(true);
      expect(Object.values(estimateExamples)).toContainEqual(req);
    }

    // The rows size through the synchronous batch.
    const sized = await request(t.app).post('/v1/estimates/batch').set(bearer(batchKey)).send({ items: read }).expect(200);
    expect(sized.body.summary).toMatchObject({ items: rows.length, ok: rows.length, failed: 0 });
  });

  it('needs batches:write or an estimator', async () => {
    await request(t.app).get(PATH).expect(401);
    await request(t.app).get(PATH).set(bearer(sizingKey)).expect(403);
    await request(t.app).get(PATH).set(bearer(viewer)).expect(403);
    await request(t.app).get(PATH).set(bearer(estimator)).expect(200);
  });
});
