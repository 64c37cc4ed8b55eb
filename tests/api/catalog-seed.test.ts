import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo, type DemoKey } from '../../api/db/seed.js';
import { DEMO_PASSWORD } from '../../api/db/demo-data.js';
import { harborLaneCatalog } from '../../shared/schemas/estimate-examples.js';
import { signIn } from '../support/accounts.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

let t: TestApp;
let keys: DemoKey[];
beforeAll(async () => {
  t = await createTestApp();
  keys = (await seedDemo(t.database, true, t.secrets.pepper)).keys;
});
afterAll(() => t.close());

describe('the demo catalog', () => {
  it('Harbor Lane has its catalog stored: every example item, EUR, version 1', async () => {
    const { accessToken } = await signIn(t.app, 'ines@harborlane.test', DEMO_PASSWORD); // the shop's viewer
    const catalog = await request(t.app).get('/v1/catalog').set('Authorization', `Bearer ${accessToken}`).expect(200);
    expect(catalog.body).toMatchObject({ currency: 'EUR', taxRatePercent: 20, version: 1, itemCount: harborLaneCatalog.items.length });
    const items = await request(t.app).get('/v1/catalog/items?limit=200').set('Authorization', `Bearer ${accessToken}`).expect(200);
    const bySku = new Map(items.body.items.map((i: { sku: string }) => [i.sku, i]));
    for (const item of harborLaneCatalog.items) expect(bySku.get(item.sku)).toEqual({ ...item, active: true });
  });

  it('the shop’s page key lists the catalog; the other organisations have none', async () => {
    const page = keys.find((k) => k.organization === 'harbor-lane' && k.kind === 'embed')!;
    const res = await request(t.app).get('/v1/catalog/items?kind=driver').set('Authorization', `Bearer ${page.token}`).set('Origin', page.allowedOrigins[0]).expect(200);
    expect(res.body.items.map((i: { sku: string }) => i.sku)).toEqual(['HL-D05-200', 'HL-D12-100', 'HL-D24-060', 'HL-D24-100', 'HL-D24-150', 'HL-D24-240']);
    const builder = keys.find((k) => k.organization === 'kestrel-finch' && k.kind === 'server')!;
    expect((await request(t.app).get('/v1/catalog/items').set('Authorization', `Bearer ${builder.token}`).expect(200)).body.items).toEqual([]);
  });
});
