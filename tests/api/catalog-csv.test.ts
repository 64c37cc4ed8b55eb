import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parse } from 'csv-parse/sync';
import { createMember, signIn } from '../support/accounts.js';
import { createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

let t: TestApp;
let admin: string;
let viewer: string;

beforeAll(async () => {
  t = await createTestApp();
  const org = await createOrganization(t, 'catalog-csv');
  admin = (await signIn(t.app, (await createMember(t.app, org.id, 'admin')).email)).accessToken;
  viewer = (await signIn(t.app, (await createMember(t.app, org.id, 'viewer')).email)).accessToken;
});
afterAll(() => t.close());

const get = (token: string, path: string) => request(t.app).get(path).set('Authorization', `Bearer ${token}`).buffer(true).parse((res, done) => {
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => done(null, Buffer.concat(chunks).toString('utf8')));
});
const upload = (token: string, csv: string | Buffer, { dryRun = false, filename = 'catalog.csv', contentType = 'text/csv' } = {}) =>
  request(t.app)
    .post(`/v1/catalog/imports${dryRun ? '?dryRun=true' : ''}`)
    .set('Authorization', `Bearer ${token}`)
    .attach('file', Buffer.isBuffer(csv) ? csv : Buffer.from(csv, 'utf8'), { filename, contentType });
const version = async () => (await request(t.app).get('/v1/catalog').set('Authorization', `Bearer ${viewer}`).expect(200)).body.version as number;
const items = async () => (await request(t.app).get('/v1/catalog/items?limit=200').set('Authorization', `Bearer ${viewer}`).expect(200)).body.items;

const HEADER = 'sku,kind,description,unitPrice,active,voltageV,ratingW,crossSectionMm2,powerWPerM';

describe('the catalog template', () => {
  it('is a CSV with a BOM, the documented header and one example row per kind, and imports as it is', async () => {
    const res = await get(viewer, '/v1/catalog/template').expect(200);
    expect(res.headers['content-type']).toContain('text/csv');
    expect(res.headers['content-disposition']).toContain('catalog-template.csv');
    const text = res.body as string;
    expect(text.startsWith('\uFEFF')).toBe(true);
    const rows: string[][] = parse(text, { bom: true });
    expect(rows[0].slice(0, 5)).toEqual(['sku', 'kind', 'description', 'unitPrice', 'active']);
    expect(rows[0]).toContain('profile.outputs');
    expect(new Set(rows.slice(1).map((r) => r[1]))).toEqual(
      new Set(['strip', 'pixel-strip', 'driver', 'cable', 'controller', 'motion-sensor', 'daylight-sensor', 'aluminium-profile', 'end-caps', 'fuse', 'data-line']),
    );
    const report = await upload(admin, text, { dryRun: true }).expect(200);
    expect(report.body).toMatchObject({ dryRun: true, imported: false, rows: 11, created: 11, updated: 0, errors: [] });
    expect(await version()).toBe(0); // a dry run writes nothing
    expect(await items()).toEqual([]);
  });
});

describe('importing', () => {
  it('creates new SKUs and updates existing ones in one go, bumping the version once', async () => {
    const first = [HEADER, 'TW-D24-100,driver,Driver 100 W,34,true,24,100,,', 'TW-C050,cable,,0.6,,,,0.5,'].join('\r\n');
    expect((await upload(admin, first).expect(200)).body).toMatchObject({ imported: true, created: 2, updated: 0, unchanged: 0, version: 1 });
    const second = [HEADER, 'TW-D24-100,driver,Driver 100 W,36,true,24,100,,', 'TW-C050,cable,,0.6,,,,0.5,', 'TW-S24-10,strip,,39,false,24,,,10'].join('\n');
    expect((await upload(admin, second).expect(200)).body).toMatchObject({ imported: true, created: 1, updated: 1, unchanged: 1, version: 2 });
    const byS = new Map((await items()).map((i: { sku: string }) => [i.sku, i]));
    expect(byS.get('TW-D24-100')).toEqual({ sku: 'TW-D24-100', kind: 'driver', description: 'Driver 100 W', unitPrice: 36, active: true, voltageV: 24, ratingW: 100 });
    expect(byS.get('TW-S24-10')).toMatchObject({ active: false, powerWPerM: 10 });
  });

  it('lists every bad row and column, and imports nothing when any row is bad', async () => {
    const before = await items();
    const bad = [
      HEADER,
      'TW-D24-150,driver,,46,true,24,150,,', // good, yet not imported because others are bad
      'TW-D24-200,driver,,abc,true,24,200,,', // wrong type
      'TW-D24-240,driver,,71,maybe,24,,,', // bad boolean
      'TW-X1,lamp,,1,,,,,', // unknown kind
      'TW-C075,cable,,0.8,,,100,0.75,', // ratingW is not a cable's field
      'TW-D24-150,driver,,46,true,24,150,,', // same SKU as row 2
      'TW-C100,cable,,1.005,,,,1,', // not whole cents
    ].join('\n');
    const dry = await upload(admin, bad, { dryRun: true }).expect(200);
    expect(dry.body.imported).toBe(false);
    expect(dry.body.errors).toEqual([
      { row: 3, column: 'unitPrice', message: 'not a number: "abc"' },
      { row: 4, column: 'active', message: 'must be true or false' },
      { row: 5, column: 'kind', message: expect.any(String) },
      { row: 6, column: 'ratingW', message: 'not a field of kind cable' },
      { row: 7, column: 'sku', message: 'SKU TW-D24-150 is also on row 2' },
      { row: 8, column: 'unitPrice', message: expect.stringContaining('whole minor units') },
    ]);
    const real = await upload(admin, bad).expect(400);
    expect(real.headers['content-type']).toContain('application/problem+json');
    expect(real.body.code).toBe('catalog_import_invalid');
    expect(real.body.errors.map((e: { path: string }) => e.path)).toEqual(['rows.3.unitPrice', 'rows.4.active', 'rows.5.kind', 'rows.6.ratingW', 'rows.7.sku', 'rows.8.unitPrice']);
    expect(await items()).toEqual(before);
  });

  it('names missing and unknown columns of the header', async () => {
    const res = await upload(admin, 'sku,price\nTW-1,3', { dryRun: true }).expect(200);
    expect(res.body.errors).toEqual([
      { row: 1, column: 'price', message: 'unknown column' },
      { row: 1, column: 'kind', message: 'missing column' },
    ]);
  });

  it('refuses what is not a CSV file, no file, an oversize file and viewers', async () => {
    const png = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0x00, 0x00, 0x00, 0x0d]);
    const binary = await upload(admin, png, { filename: 'catalog.csv' }).expect(400);
    expect(binary.body.code).toBe('not_csv');
    expect((await upload(admin, png, { filename: 'photo.png', contentType: 'image/png' }).expect(400)).body.code).toBe('not_csv');
    expect((await upload(admin, 'sku,kind\n"TW-1,driver\n').expect(400)).body.code).toBe('not_csv'); // an unclosed quote
    const none = await request(t.app).post('/v1/catalog/imports').set('Authorization', `Bearer ${admin}`).field('note', 'x').expect(400);
    expect(none.body.code).toBe('file_missing');
    const big = Buffer.alloc(5 * 1024 * 1024 + 1, 'a');
    const tooBig = await upload(admin, big).expect(413);
    expect(tooBig.headers['content-type']).toContain('application/problem+json');
    expect(tooBig.body.code).toBe('file_too_large');
    await upload(viewer, `${HEADER}\nTW-D1,driver,,1,true,24,60,,`).expect(403);
  });
});

describe('exporting', () => {
  it('guards text cells against formulas, never numbers, and export → import changes nothing', async () => {
    const risky = ['=SUM(A1:A9)', '+31 sensor', '-40 °C rated', '@driver', "'=already guarded", "'plain apostrophe"];
    for (const [i, description] of risky.entries()) {
      await request(t.app).post('/v1/catalog/items').set('Authorization', `Bearer ${admin}`).send({ sku: `TW-R${i}`, kind: 'end-caps', description, unitPrice: 0.9 }).expect(201);
    }
    const res = await get(viewer, '/v1/catalog/export').expect(200);
    expect(res.headers['content-type']).toContain('text/csv');
    const text = res.body as string;
    expect(text.startsWith('\uFEFF')).toBe(true);
    expect(text).toContain('\r\n');
    const rows: string[][] = parse(text, { bom: true });
    const header = rows[0];
    const col = (sku: string, name: string) => rows.find((r) => r[0] === sku)![header.indexOf(name)];
    expect(col('TW-R0', 'description')).toBe("'=SUM(A1:A9)");
    expect(col('TW-R1', 'description')).toBe("'+31 sensor");
    expect(col('TW-R2', 'description')).toBe("'-40 °C rated");
    expect(col('TW-R3', 'description')).toBe("'@driver");
    expect(col('TW-R4', 'description')).toBe("''=already guarded");
    expect(col('TW-R5', 'description')).toBe("'plain apostrophe");
    expect(col('TW-R0', 'unitPrice')).toBe('0.9'); // a number is written as it is
    expect(col('TW-S24-10', 'active')).toBe('false');

    const before = await items();
    const v = await version();
    const again = await upload(admin, text).expect(200);
    expect(again.body).toMatchObject({ imported: true, created: 0, updated: 0, unchanged: before.length, version: v, errors: [] });
    expect(await items()).toEqual(before);
    expect(await version()).toBe(v);
    expect(before.find((i: { sku: string }) => i.sku === 'TW-R0').description).toBe('=SUM(A1:A9)');
  });
});
