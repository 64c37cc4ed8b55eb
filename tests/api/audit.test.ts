import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createMember, signIn } from '../support/accounts.js';
import { createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

let t: TestApp;
let adminA: string;
let adminB: string;
let viewerA: string;
beforeAll(async () => {
  t = await createTestApp();
  const a = await createOrganization(t, 'audit-a');
  const b = await createOrganization(t, 'audit-b');
  adminA = (await signIn(t.app, (await createMember(t.app, a.id, 'admin')).email)).accessToken;
  adminB = (await signIn(t.app, (await createMember(t.app, b.id, 'admin')).email)).accessToken;
  viewerA = (await signIn(t.app, (await createMember(t.app, a.id, 'viewer')).email)).accessToken;
  for (let i = 0; i < 3; i++) {
    await request(t.app).post('/v1/keys').set('Authorization', `Bearer ${adminA}`).send({ name: `A key ${i}` }).expect(201);
  }
  await request(t.app).post('/v1/keys').set('Authorization', `Bearer ${adminB}`).send({ name: 'B key' }).expect(201);
});
afterAll(() => t.close());

const list = (token: string, query = '') => request(t.app).get(`/v1/audit-events${query}`).set('Authorization', `Bearer ${token}`);

describe('GET /v1/audit-events', () => {
  it('shows an organisation only its own events, newest first, with actor, target and request id', async () => {
    const res = await list(adminB, '?action=api_key.created').expect(200);
    expect(res.body.items).toHaveLength(1);
    const [event] = res.body.items;
    expect(event).toMatchObject({ action: 'api_key.created', actor: { type: 'user' }, target: { type: 'api_key' } });
    expect(event.requestId).toBeTruthy();
    expect(event.data.name).toBe('B key');
  });

  it('pages with a cursor without repeating events', async () => {
    const first = await list(adminA, '?action=api_key.created&limit=2').expect(200);
    expect(first.body.nextCursor).not.toBeNull();
    const second = await list(adminA, `?action=api_key.created&limit=2&cursor=${first.body.nextCursor}`).expect(200);
    const names = [...first.body.items, ...second.body.items].map((e: { data: { name: string } }) => e.data.name);
    expect(names).toEqual(['A key 2', 'A key 1', 'A key 0']);
    expect(second.body.nextCursor).toBeNull();
  });

  it('is for admins only', async () => {
    expect((await list(viewerA).expect(403)).body.code).toBe('insufficient_role');
  });
});
