import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';
import { parse } from 'csv-parse/sync';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { printedText } from '../../api/exports/pdf-fonts.js';
import { fileSlug } from '../../api/routes/estimate-exports.js';
import { harborLaneCatalog, harborLaneCheckout } from '../../shared/schemas/estimate-examples.js';
import { createMember, signIn } from '../support/accounts.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

/** A stored estimate's hand-over papers: the Alder Row stair priced from the invented Harbor Lane catalog (EUR, 20 % tax). */
let t: TestApp;
let viewer: string;
let readerKey: string;
let embedKey: string;
let otherAdmin: string;
let estimate: { id: string; createdAt: string; result: { pricing: { net: number; gross: number }; treads: unknown[]; cautions: { message: string }[] } };
const ORIGIN = 'https://shop.exports.test';
const { catalog: _inline, ...alderRow } = harborLaneCheckout;

beforeAll(async () => {
  t = await createTestApp();
  const org = await createOrganization(t, 'exports-a');
  const other = await createOrganization(t, 'exports-b');
  const admin = (await signIn(t.app, (await createMember(t.app, org.id, 'admin')).email)).accessToken;
  const estimator = await createMember(t.app, org.id, 'estimator', 'theo@exports.test');
  const estimatorToken = (await signIn(t.app, estimator.email)).accessToken;
  viewer = (await signIn(t.app, (await createMember(t.app, org.id, 'viewer')).email)).accessToken;
  otherAdmin = (await signIn(t.app, (await createMember(t.app, other.id, 'admin')).email)).accessToken;
  readerKey = (await createKey(t, org.id, { scopes: ['projects:read'] })).token;
  embedKey = (await createKey(t, org.id, { kind: 'embed', scopes: ['sizing:run', 'catalog:read'], allowedOrigins: [ORIGIN] })).token;
  for (const item of harborLaneCatalog.items) await request(t.app).post('/v1/catalog/items').set('Authorization', `Bearer ${admin}`).send(item).expect(201);
  await request(t.app).patch('/v1/catalog').set('Authorization', `Bearer ${admin}`).send({ taxRatePercent: 20 }).expect(200);
  const post = (path: string, body: object = {}) => request(t.app).post(path).set('Authorization', `Bearer ${estimatorToken}`).send(body).expect(201);
  const project = (await post('/v1/projects', { name: 'Alder Row, house 7', clientName: 'Kestrel & Finch Builders', siteAddress: '7 Alder Row, Millbrook' })).body;
  const stair = (await post(`/v1/projects/${project.id}/stairs`, { name: 'Main stair', input: alderRow })).body;
  estimate = (await post(`/v1/projects/${project.id}/stairs/${stair.id}/estimates`)).body;
});
afterAll(() => t.close());

const get = (token: string, path: string) => request(t.app).get(path).set('Authorization', `Bearer ${token}`);
/** The CSV as a spreadsheet reads it: BOM dropped, RFC 4180 rows. */
const rowsOf = (text: string): string[][] => parse(text.replace(/^\uFEFF/, ''), { relaxColumnCount: true });
const day = () => estimate.createdAt.slice(0, 10);

describe('the hand-over exports of a stored estimate', () => {
  it('the wiring schedule is a CSV attachment named for the project and stair, one row per tread', async () => {
    const res = await get(viewer, `/v1/estimates/${estimate.id}/wiring-schedule.csv`).expect(200);
    expect(res.headers['content-type']).toBe('text/csv; charset=utf-8');
    expect(res.headers['content-disposition']).toBe(`attachment; filename=alder-row-house-7-main-stair-wiring-schedule-${day()}.csv`);
    expect(res.text.startsWith('\uFEFF')).toBe(true);
    const rows = rowsOf(res.text);
    const cells = rows.flat();
    expect(cells).toContain('Kestrel & Finch Builders');
    expect(cells).toContain('Main stair');
    expect(cells).toContain(estimate.id);
    // 14 treads, numbered from the foot: each has its own row starting with its number.
    const header = rows.findIndex((r) => r[0] === 'tread');
    expect(header).toBeGreaterThanOrEqual(0);
    expect(rows.slice(header + 1, header + 1 + estimate.result.treads.length).map((r) => r[0])).toEqual(Array.from({ length: 14 }, (_, i) => String(i + 1)));
  });

  it('the bill of materials lists the SKUs and the stored net and gross totals', async () => {
    const res = await get(readerKey, `/v1/estimates/${estimate.id}/bom.csv`).expect(200);
    expect(res.headers['content-type']).toBe('text/csv; charset=utf-8');
    expect(res.headers['content-disposition']).toBe(`attachment; filename=alder-row-house-7-main-stair-bom-${day()}.csv`);
    const rows = rowsOf(res.text);
    expect(rows.map((r) => r[0])).toContain('HL-S24-10');
    const total = (label: string) => Number(rows.find((r) => r[2] === label)?.[6]);
    expect(total('net')).toBe(estimate.result.pricing.net);
    expect(total('gross')).toBe(estimate.result.pricing.gross);
  });

  it('the printable estimate is a PDF naming the client, the total and the cautions', async () => {
    const res = await get(viewer, `/v1/estimates/${estimate.id}/document.pdf`).buffer(true).parse((r, done) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => done(null, Buffer.concat(chunks)));
    });
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    expect(res.headers['content-disposition']).toBe(`attachment; filename=alder-row-house-7-main-stair-estimate-${day()}.pdf`);
    // Charged against the cost budget: rendering a PDF is heavy work.
    expect(String(res.headers.ratelimit)).toContain('"cost"');
    const pdf = res.body as Buffer;
    expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    const doc = await getDocument({ data: new Uint8Array(pdf), useSystemFonts: false, disableFontFace: true, isEvalSupported: false }).promise;
    let text = '';
    for (let i = 1; i <= doc.numPages; i++) text += (await (await doc.getPage(i)).getTextContent()).items.map((item) => ('str' in item ? item.str : '')).join('');
    await doc.destroy();
    const squeeze = (s: string) => printedText(s).replace(/\s+/g, '');
    const flat = text.replace(/\s+/g, '');
    expect(flat).toContain(squeeze('Kestrel & Finch Builders'));
    expect(flat).toContain(squeeze('Alder Row, house 7'));
    expect(flat).toContain(estimate.result.pricing.gross.toFixed(2));
    for (const caution of estimate.result.cautions) expect(flat).toContain(squeeze(caution.message));
  });

  it('other organisations get 404, embed keys 403', async () => {
    for (const file of ['wiring-schedule.csv', 'bom.csv', 'document.pdf']) {
      const path = `/v1/estimates/${estimate.id}/${file}`;
      expect((await get(otherAdmin, path).expect(404)).body.code).toBe('estimate_not_found');
      expect((await get(embedKey, path).set('Origin', ORIGIN).expect(403)).body.code).toBe('embed_key_not_allowed');
      await get(viewer, `/v1/estimates/00000000-0000-4000-8000-000000000000/${file}`).expect(404);
    }
  });
});

describe('file names', () => {
  it('are ASCII slugs of the project and stair', () => {
    expect(fileSlug('Café Łódź — Flat 3', 'Main stair')).toBe('cafe-odz-flat-3-main-stair');
    expect(fileSlug(undefined, null)).toBe('');
    expect(fileSlug('x'.repeat(80)).length).toBe(60);
  });
});
