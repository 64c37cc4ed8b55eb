import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { problemSchema } from '../../shared/schemas/problem.js';
import { estimateExamples } from '../../shared/schemas/estimate-examples.js';
import {
  MAX_ANSWER_BYTES,
  MAX_CURRENT_PER_PIXEL_MA,
  MAX_PIXELS_PER_M,
  MAX_PIXELS_PER_RUN,
  MAX_RAIL_LENGTH_M,
  MAX_REEL_PIECES,
  MIN_FEED_CURRENT_A,
  MIN_FEED_LENGTH_M,
  MIN_PIXELS_PER_DATA_OUTPUT,
} from '../../shared/tables/limits.js';
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

const post = (path: string, body: unknown) => request(t.app).post(path).set('Authorization', `Bearer ${token}`).send(body as object);

async function expectProblemAt(path: string, body: unknown, fieldPath: string) {
  const res = await post(path, body).expect(400);
  expect(res.headers['content-type']).toContain('application/problem+json');
  expect(problemSchema.parse(res.body).errors?.map((e) => e.path)).toContain(fieldPath);
}

const { quaysideCorridor, alderRowTreadPixels } = estimateExamples;
const rail = (fields: object) => ({ ...quaysideCorridor, railPixels: { ...quaysideCorridor.railPixels, ...fields } });
const profile = (fields: object) => ({ ...quaysideCorridor, controller: { profile: { outputs: 0, maxCurrentPerOutputA: 1, dataOutputs: 8, ...fields } } });

describe('every dimension that multiplies the answer is bounded (issue 9, item 2)', () => {
  it('the audit’s 217-byte body (a 500 m rail at 500 pixels/m, one pixel per output) is a 400 naming each field', async () => {
    const body = { ...profile({ maxPixelsPerOutput: 1 }), railPixels: { ...quaysideCorridor.railPixels, lengthM: 500, pixelsPerM: 500 } };
    const res = await post('/v1/estimates', body).expect(400);
    const paths = problemSchema.parse(res.body).errors?.map((e) => e.path);
    expect(paths).toEqual(expect.arrayContaining(['railPixels.lengthM', 'railPixels.pixelsPerM', 'controller.profile.maxPixelsPerOutput']));
  });

  it('a rail longer than the limit is a 400 at railPixels.lengthM', async () => {
    await expectProblemAt('/v1/estimates', rail({ lengthM: MAX_RAIL_LENGTH_M + 1 }), 'railPixels.lengthM');
  });

  it('a strip denser than the limit is a 400 at railPixels.pixelsPerM', async () => {
    await expectProblemAt('/v1/estimates', rail({ pixelsPerM: MAX_PIXELS_PER_M + 1 }), 'railPixels.pixelsPerM');
  });

  it('a rail holding more pixels than one run may is a 400 at railPixels.pixelsPerM, one pixel under it is sized', async () => {
    // arithmetic: 200 m × 100.01 pixels/m = 20 002 pixels > 20 000
    await expectProblemAt('/v1/estimates', rail({ lengthM: MAX_RAIL_LENGTH_M, pixelsPerM: MAX_PIXELS_PER_RUN / MAX_RAIL_LENGTH_M + 0.01 }), 'railPixels.pixelsPerM');
    const res = await post('/v1/estimates', rail({ lengthM: MAX_RAIL_LENGTH_M, pixelsPerM: MAX_PIXELS_PER_RUN / MAX_RAIL_LENGTH_M })).expect(200);
    expect(res.body.pixels.rail.pixels).toBe(MAX_PIXELS_PER_RUN);
  });

  it('tread segments holding more pixels than one run may are a 400 at treadPixels.pixelsPerM', async () => {
    // arithmetic: 200 treads × 1 m × 101 pixels/m = 20 200 pixels > 20 000
    const body = { ...alderRowTreadPixels, staircase: { treads: 200, treadWidthMm: 1000, riserHeightMm: 180, goingMm: 250 }, treadPixels: { ...alderRowTreadPixels.treadPixels, pixelsPerM: 101 } };
    await expectProblemAt('/v1/estimates', body, 'treadPixels.pixelsPerM');
  });

  it('a data output limited below any pixel controller’s is a 400 at controller.profile.maxPixelsPerOutput', async () => {
    await expectProblemAt('/v1/estimates', profile({ maxPixelsPerOutput: MIN_PIXELS_PER_DATA_OUTPUT - 1 }), 'controller.profile.maxPixelsPerOutput');
  });

  it('tiny feed lengths and currents (thousands of feed points) are 400s naming them', async () => {
    await expectProblemAt('/v1/estimates', rail({ maxFeedLengthM: MIN_FEED_LENGTH_M / 2 }), 'railPixels.maxFeedLengthM');
    await expectProblemAt('/v1/estimates', rail({ maxFeedCurrentA: MIN_FEED_CURRENT_A / 2 }), 'railPixels.maxFeedCurrentA');
    await expectProblemAt('/v1/estimates', rail({ currentPerPixelMa: MAX_CURRENT_PER_PIXEL_MA + 1 }), 'railPixels.currentPerPixelMa');
  });

  it('controller outputs beyond any real controller are 400s naming them', async () => {
    await expectProblemAt('/v1/estimates', profile({ dataOutputs: 65 }), 'controller.profile.dataOutputs');
    await expectProblemAt('/v1/estimates', profile({ outputs: 129 }), 'controller.profile.outputs');
  });

  it('more reel pieces than the limit is a 400 at piecesMm, and pixel runs beyond the limit at pixels', async () => {
    await expectProblemAt('/v1/calculations/reels', { piecesMm: Array.from({ length: MAX_REEL_PIECES + 1 }, () => 850) }, 'piecesMm');
    await expectProblemAt('/v1/calculations/pixels', { pixels: MAX_PIXELS_PER_RUN + 1, protocol: 'one-wire-800k' }, 'pixels');
  });

  it('the limits are documented in the OpenAPI document', async () => {
    const doc = (await request(t.app).get('/openapi.json').expect(200)).body;
    const railDoc = doc.components.schemas.RailPixels.properties;
    expect(railDoc.lengthM.maximum).toBe(MAX_RAIL_LENGTH_M);
    expect(railDoc.pixelsPerM.description).toContain(String(MAX_PIXELS_PER_RUN));
  });
});

describe('an answer over the ceiling is a 422 answer_too_large (issue 9, item 2)', () => {
  // The largest run the limits allow, fed at 1 A per feed point: 20 000 pixels × 300 mA = 6 000 A,
  // so 6 000 feed points, each a feeder row (arithmetic) — a valid design, but megabytes of answer.
  const hugeButValid = {
    layout: 'rail-pixels',
    railPixels: { lengthM: MAX_RAIL_LENGTH_M, pixelsPerM: 100, voltageV: 5, protocol: 'one-wire-800k', currentPerPixelMa: MAX_CURRENT_PER_PIXEL_MA, maxFeedCurrentA: MIN_FEED_CURRENT_A, maxFeedLengthM: 1 },
    controller: { profile: { outputs: 0, maxCurrentPerOutputA: 1, dataOutputs: 8, maxPixelsPerOutput: 1000 } },
  };

  it('is a 422 problem naming the size and the ceiling, with the request id', async () => {
    const res = await post('/v1/estimates', hugeButValid).expect(422);
    expect(res.headers['content-type']).toContain('application/problem+json');
    const problem = problemSchema.parse(res.body);
    expect(problem.code).toBe('answer_too_large');
    expect(problem.detail).toContain(String(MAX_ANSWER_BYTES));
    expect(problem.requestId).toBe(res.headers['x-request-id']);
  });

  it('a design that merely fails checks stays a 200', async () => {
    const res = await post('/v1/estimates', rail({ maxFeedCurrentA: MIN_FEED_CURRENT_A })).expect(200);
    expect((res.body.checks as { status: string }[]).some((c) => c.status === 'fail')).toBe(true);
    expect(res.headers['content-type']).toMatch(/^application\/json; charset=utf-8/);
  });
});
