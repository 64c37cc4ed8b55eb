import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { problemSchema } from '../../shared/schemas/problem.js';
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

const post = (path: string, body: unknown) =>
  request(t.app).post(`/v1/calculations/${path}`).set('Authorization', `Bearer ${token}`).send(body as object);

async function expectValidationProblem(path: string, body: unknown, fieldPath: string) {
  const res = await post(path, body).expect(400);
  expect(res.headers['content-type']).toContain('application/problem+json');
  const problem = problemSchema.parse(res.body);
  expect(problem.code).toBe('validation_failed');
  expect(problem.errors?.map((e) => e.path)).toContain(fieldPath);
  return problem;
}

function expectEngineEnvelope(body: { engineVersion: string; trace: unknown[] }) {
  expect(body.engineVersion).toBe(ENGINE_VERSION);
  expect(body.trace.length).toBeGreaterThan(0);
}

describe('POST /v1/calculations/voltage-drop', () => {
  it('computes the loop drop of a run', async () => {
    const res = await post('voltage-drop', { supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 } }).expect(200);
    // domain.md worked example, IEC 60364-5-52 Annex G loop formula with IEC 60228 class 5 0.75 mm² (26.0 Ω/km): 1.04 V, 4.33 %
    expect(res.body.dropV).toBeCloseTo(1.04, 3);
    expect(res.body.dropPercent).toBeCloseTo(4.333, 2);
    expect(res.body.withinLimit).toBe(true);
    expectEngineEnvelope(res.body);
  });

  it('answers a run over the limit with 200 and withinLimit false', async () => {
    // domain.md worked example: 12 V, 5 A, 5 m, 1.5 mm² class 5 → 0.665 V, 5.54 % (> 5 % default)
    const res = await post('voltage-drop', { supplyVoltageV: 12, currentA: 5, lengthM: 5, conductor: { crossSectionMm2: 1.5 } }).expect(200);
    expect(res.body.dropPercent).toBeCloseTo(5.54, 2);
    expect(res.body.withinLimit).toBe(false);
    expect(res.body.warnings.length).toBeGreaterThan(0);
  });

  it('rejects a negative length with the field path', async () => {
    await expectValidationProblem('voltage-drop', { supplyVoltageV: 24, currentA: 2, lengthM: -3, conductor: { crossSectionMm2: 0.75 } }, 'lengthM');
  });

  it('rejects a metric size with an AWG table', async () => {
    await expectValidationProblem(
      'voltage-drop',
      { supplyVoltageV: 24, currentA: 2, lengthM: 3, conductor: { crossSectionMm2: 0.75 }, conductorTable: 'awg-solid' },
      'conductorTable',
    );
  });
});

describe('POST /v1/calculations/cable', () => {
  it('recommends the smallest size that meets drop and current', async () => {
    const res = await post('cable', { supplyVoltageV: 24, currentA: 2, lengthM: 10 }).expect(200);
    // IEC 60228 class 5: 0.5 mm² 39.0 Ω/km → 2·10·2·0.039 = 1.56 V (6.5 %) fails; 0.75 mm² → 4.33 % passes (hand arithmetic)
    expect(res.body.recommended).toEqual({ crossSectionMm2: 0.75 });
    expect(res.body.alternatives.length).toBeGreaterThan(1);
    expectEngineEnvelope(res.body);
  });

  it('answers a run no size can serve with recommended null and a warning', async () => {
    const res = await post('cable', { supplyVoltageV: 5, currentA: 40, lengthM: 60, maxDropPercent: 1 }).expect(200);
    expect(res.body.recommended).toBeNull();
    expect(res.body.warnings.map((w: { code: string }) => w.code)).toContain('no_suitable_size');
  });

  it('rejects a missing current with the field path', async () => {
    await expectValidationProblem('cable', { supplyVoltageV: 24, lengthM: 10 }, 'currentA');
  });
});

describe('POST /v1/calculations/driver', () => {
  it('chooses drivers from the available ratings', async () => {
    // domain.md: 216 W from [60, 100, 150, 240] at 80 % → 270 W needed → 2 × 150 W (common practice 80 % rule)
    const res = await post('driver', { loadW: 216, outputVoltageV: 24, availableRatingsW: [60, 100, 150, 240] }).expect(200);
    expect(res.body.requiredRatingW).toBeCloseTo(270, 6);
    expect(res.body.drivers).toEqual([expect.objectContaining({ ratingW: 150, count: 2 })]);
    expectEngineEnvelope(res.body);
  });

  it('reports a Class 2 design by its supply count', async () => {
    // domain.md: 216 W at 24 V, 80 % of 100 VA Class 2 supplies (NEC Ch. 9 Table 11) → 216 / 80 = 2.7 → 3
    const res = await post('driver', { loadW: 216, outputVoltageV: 24, class2: true, availableRatingsW: [100] }).expect(200);
    expect(res.body.drivers).toEqual([expect.objectContaining({ ratingW: 100, count: 3 })]);
  });

  it('rejects a zero load with the field path', async () => {
    await expectValidationProblem('driver', { loadW: 0, outputVoltageV: 24 }, 'loadW');
  });
});

describe('POST /v1/calculations/pixels', () => {
  it('computes one-wire frame time and refresh', async () => {
    // WS2812B datasheet: 300 × 24 × 1.25 µs + 280 µs = 9 280 µs → 107.76 Hz
    const res = await post('pixels', { pixels: 300, protocol: 'one-wire-800k' }).expect(200);
    expect(res.body.frameTimeUs).toBeCloseTo(9280, 6);
    expect(res.body.maxRefreshHz).toBeCloseTo(107.76, 1);
    expectEngineEnvelope(res.body);
  });

  it('flags a run longer than one output can drive', async () => {
    // Quayside Studio: 18 m × 60 px/m = 1 080 pixels on outputs of 800 → 2 outputs (ceil, hand arithmetic)
    const res = await post('pixels', { pixels: 1080, protocol: 'one-wire-800k', maxPixelsPerOutput: 800 }).expect(200);
    expect(res.body.outputsNeeded).toBe(2);
  });

  it('rejects an unknown protocol with the field path', async () => {
    await expectValidationProblem('pixels', { pixels: 300, protocol: 'smoke-signals' }, 'protocol');
  });
});

describe('POST /v1/calculations/reels', () => {
  it('cuts tread pieces from reels', async () => {
    // 14 × 850 mm from 5 m reels: 5 pieces per reel (4 250 mm, 750 mm waste) → 3 reels (hand arithmetic)
    const res = await post('reels', { piecesMm: Array(14).fill(850) }).expect(200);
    expect(res.body.reels).toBe(3);
    expect(res.body.plan.flatMap((r: { piecesMm: number[] }) => r.piecesMm)).toHaveLength(14);
    expectEngineEnvelope(res.body);
  });

  it('rejects a piece longer than a reel at that piece', async () => {
    await expectValidationProblem('reels', { piecesMm: [850, 6000], reelLengthMm: 5000 }, 'piecesMm.1');
  });
});

describe('?trace=false', () => {
  it('answers the same figures with an empty trace, and refuses other query values and unknown parameters', async () => {
    const body = { supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 } };
    const full = await post('voltage-drop', body).expect(200);
    const lean = await post('voltage-drop?trace=false', body).expect(200);
    expect(full.body.trace.length).toBeGreaterThan(0);
    expect(lean.body.trace).toEqual([]);
    expect({ ...lean.body, trace: undefined }).toEqual({ ...full.body, trace: undefined });
    expect((await post('voltage-drop?trace=true', body).expect(200)).body).toEqual(full.body);
    const bad = await post('voltage-drop?trace=no', body).expect(400);
    expect(bad.body.errors[0].path).toBe('trace');
    await post('voltage-drop?tracing=false', body).expect(400);
  });
});
