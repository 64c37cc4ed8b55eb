import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { problemSchema } from '../../shared/schemas/problem.js';
import { estimateExamples } from '../../shared/schemas/estimate-examples.js';
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

describe('issue 8 fields over HTTP', () => {
  it('a tread-width list of the wrong length is a 400 naming staircase.treadWidthsMm', async () => {
    const { alderRowTownhouse } = estimateExamples;
    await expectProblemAt('/v1/estimates', { ...alderRowTownhouse, staircase: { ...alderRowTownhouse.staircase, treadWidthsMm: [900] } }, 'staircase.treadWidthsMm');
  });

  it('a negative feed-point current is a 400 naming its field', async () => {
    const { quaysideCorridor } = estimateExamples;
    await expectProblemAt('/v1/estimates', { ...quaysideCorridor, railPixels: { ...quaysideCorridor.railPixels, maxFeedCurrentA: -1 } }, 'railPixels.maxFeedCurrentA');
  });

  it('a reel piece shorter than one cut pitch is a 400 at its index', async () => {
    // arithmetic: 30 mm < one 50 mm pitch
    await expectProblemAt('/v1/calculations/reels', { piecesMm: [850, 30], cutPitchMm: 50 }, 'piecesMm.1');
  });

  it('a design breaking the data-line limit is a 200 with a failing check and a suggestion', async () => {
    const res = await post('/v1/estimates', estimateExamples.quaysideCorridor).expect(200);
    const check = (res.body.checks as { id: string; status: string; suggestion?: string }[]).find((c) => c.id === 'data-line-length');
    // hand arithmetic: the second output's lead runs 540 / 60 + 0.5 = 9.5 m > 2 m (from memory)
    expect(check?.status).toBe('fail');
    expect(check?.suggestion).toContain('differential');
  });
});
