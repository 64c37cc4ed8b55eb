import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { estimateResponseSchema } from '../../shared/schemas/estimate.js';
import { alderRowTownhouse, estimateExamples, harborLaneCheckout, hlK20Profile } from '../../shared/schemas/estimate-examples.js';
import { ENGINE_VERSION } from '../../shared/sizing/version.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

let t: TestApp;
let token: string;
beforeAll(async () => {
  t = await createTestApp();
  const org = await createOrganization(t);
  ({ token } = await createKey(t, org.id, { scopes: ['sizing:run'] }));
});
afterAll(() => t.close());

const post = (body: unknown) => request(t.app).post('/v1/estimates').set('Authorization', `Bearer ${token}`).send(body as object);
type Check = { id: string; status: string; suggestion?: string };

describe('POST /v1/estimates', () => {
  it.each(Object.entries(estimateExamples))('sizes the demo scenario %s completely', async (_name, example) => {
    const res = await post(example).expect(200);
    const body = estimateResponseSchema.parse(res.body);
    expect(body.engineVersion).toBe(ENGINE_VERSION);
    expect(body.layout).toBe(example.layout);
    expect(body.checks.length).toBeGreaterThan(0);
    expect(body.bom.length).toBeGreaterThan(0);
    expect(body.cautions.length).toBeGreaterThan(0);
    expect(body.trace.length).toBeGreaterThan(0);
  });

  it('sizes the Alder Row stair tread by tread', async () => {
    const res = await post(estimateExamples.alderRowTownhouse).expect(200);
    expect(res.body.treads).toHaveLength(14);
    // domain.md: 900 mm tread − 2 × 20 mm clearance → 860 mm → 850 mm in 50 mm pitches; 0.85 m × 10 W/m = 8.5 W (hand arithmetic)
    expect(res.body.treads[0]).toMatchObject({ index: 1, stripLengthMm: 850 });
    expect(res.body.treads[0].powerW).toBeCloseTo(8.5, 6);
  });

  it('prices the bill of materials from an inline catalog', async () => {
    const res = await post(harborLaneCheckout).expect(200);
    expect(res.body.currency).toBe('EUR');
    const strip = res.body.bom.find((l: { sku?: string }) => l.sku === 'HL-S24-10');
    // demo-scenario.md: HL-S24-10 €39.00 per 5 m reel; 14 × 850 mm → 3 reels (5 pieces per reel, hand arithmetic)
    expect(strip).toMatchObject({ quantity: 3, unitPrice: 39, lineTotal: 117 });
    const priced = res.body.bom.filter((l: { lineTotal?: number }) => l.lineTotal !== undefined);
    const sumCents = priced.reduce((s: number, l: { lineTotal: number }) => s + Math.round(l.lineTotal * 100), 0);
    expect(Math.round(res.body.bomTotal * 100)).toBe(sumCents);
  });

  it('answers a design that overloads an output with 200 and a failing check with a suggestion', async () => {
    // 0.85 m × 60 W/m = 51 W → 2.125 A at 24 V, over the profile's 1.5 A per output (hand arithmetic)
    const overloaded = { ...estimateExamples.alderRowTownhouse, treadStrip: { voltageV: 24, powerWPerM: 60, cutPitchMm: 50 } };
    const res = await post(overloaded).expect(200);
    const check = (res.body.checks as Check[]).find((c) => c.id === 'output-current');
    expect(check?.status).toBe('fail');
    expect(check?.suggestion).toBeTruthy();
  });

  it('rejects a missing layout block with its path', async () => {
    const { treadStrip: _omit, ...withoutStrip } = estimateExamples.alderRowTownhouse;
    const res = await post(withoutStrip).expect(400);
    expect(res.headers['content-type']).toContain('application/problem+json');
    expect(res.body.errors.map((e: { path: string }) => e.path)).toContain('treadStrip');
  });

  it('rejects negative treads and an unknown layout with field paths', async () => {
    const negative = await post({ ...estimateExamples.alderRowTownhouse, staircase: { ...estimateExamples.alderRowTownhouse.staircase, treads: -3 } }).expect(400);
    expect(negative.body.errors.map((e: { path: string }) => e.path)).toContain('staircase.treads');
    const unknown = await post({ layout: 'spiral-glow', controller: { profile: hlK20Profile } }).expect(400);
    expect(unknown.body.errors.map((e: { path: string }) => e.path)).toContain('layout');
  });

  it('rejects a profile id no catalog holds, naming the field', async () => {
    const res = await post({ ...estimateExamples.alderRowTownhouse, controller: { profileId: 'HL-K99' } }).expect(400);
    expect(res.body.errors.map((e: { path: string }) => e.path)).toContain('controller.profileId');
  });
});

describe('POST /v1/estimates?trace=false', () => {
  it('answers the same estimate with an empty trace', async () => {
    const full = await request(t.app).post('/v1/estimates').set('Authorization', `Bearer ${token}`).send(alderRowTownhouse).expect(200);
    const lean = await request(t.app).post('/v1/estimates?trace=false').set('Authorization', `Bearer ${token}`).send(alderRowTownhouse).expect(200);
    expect(full.body.trace.length).toBeGreaterThan(0);
    expect(lean.body.trace).toEqual([]);
    expect({ ...lean.body, trace: [] }).toEqual({ ...full.body, trace: [] });
  });
});
