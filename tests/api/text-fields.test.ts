import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { bearer, createMember, createOperator, signIn } from '../support/accounts.js';
import { createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

// Control characters once reached PostgreSQL (a NUL in text is error 22021) and answered 500.
let t: TestApp;
let admin: string;
let ops: string;

beforeAll(async () => {
  t = await createTestApp();
  const org = await createOrganization(t, 'text-fields');
  admin = (await signIn(t.app, (await createMember(t.app, org.id, 'admin')).email)).accessToken;
  ops = (await signIn(t.app, (await createOperator(t.app)).email)).accessToken;
});
afterAll(() => t.close());

const expectRefused = (res: request.Response, path: string) => {
  expect(res.status).toBe(400);
  expect(res.body.code).toBe('validation_failed');
  expect(res.body.errors.map((e: { path: string }) => e.path)).toContain(path);
};

describe('text fields', () => {
  it('refuse a NUL or other control character with a 400 naming the field', async () => {
    for (const name of ['Product\u0000pages', 'Bell\u0007', 'Escape \u001b[31m']) {
      expectRefused(await request(t.app).post('/v1/keys').set(bearer(admin)).send({ name }), 'name');
    }
    expectRefused(await request(t.app).post('/v1/organizations').set(bearer(ops)).send({ slug: 'nul-org', name: 'Nul\u0000Org' }), 'name');
    expectRefused(await request(t.app).post('/v1/auth/invitations/accept').send({ token: 'abc', name: 'In\u0000es', password: 'a-long-passphrase' }), 'name');
  });

  it('keep line breaks and bidirectional overrides out of names', async () => {
    for (const name of ['Two\nlines', 'Carriage\rreturn', 'evil\u202egnp.exe', 'isolate\u2066x\u2069']) {
      expectRefused(await request(t.app).post('/v1/keys').set(bearer(admin)).send({ name }), 'name');
    }
    await request(t.app).post('/v1/keys').set(bearer(admin)).send({ name: 'Ünïcode names — fine' }).expect(201);
  });

  it('refuse control characters nested anywhere in a body, whatever its schema', async () => {
    const res = await request(t.app)
      .post('/v1/calculations/reels')
      .set(bearer(admin))
      .send({ piecesMm: [850, 850], reelLengthMm: 5000, note: 'x' });
    // an unknown field is refused on its own account; the point here is that no 500 results
    expect(res.status).toBeLessThan(500);
    const nested = await request(t.app).post('/v1/organizations').set(bearer(ops)).send({ slug: 'nested-org', name: 'Fine', planId: 'fr\u0000ee' });
    expectRefused(nested, 'planId');
  });
});
