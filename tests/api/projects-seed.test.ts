import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD, demoProjects } from '../../api/db/demo-data.js';
import { seedDemo } from '../../api/db/seed.js';
import { signIn } from '../support/accounts.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
  await seedDemo(t.database, true, t.secrets.pepper);
});
afterAll(() => t.close());

describe('the demo project', () => {
  it('Harbor Lane keeps one project with a stair its estimator can run; other organisations see none of it', async () => {
    const theo = (await signIn(t.app, 'theo@harborlane.test', DEMO_PASSWORD)).accessToken;
    const as = (token: string) => (path: string) => request(t.app).get(path).set('Authorization', `Bearer ${token}`);
    const projects = (await as(theo)('/v1/projects').expect(200)).body.items;
    const demo = demoProjects[0];
    expect(projects).toEqual([expect.objectContaining({ name: demo.name, clientName: demo.clientName, siteAddress: demo.siteAddress, stairCount: 1 })]);
    const [stair] = (await as(theo)(`/v1/projects/${projects[0].id}/stairs`).expect(200)).body.items;
    expect(stair).toMatchObject({ name: 'Main stair', input: demo.stairs[0].input });
    const run = await request(t.app).post(`/v1/projects/${projects[0].id}/stairs/${stair.id}/estimates`).set('Authorization', `Bearer ${theo}`).expect(201);
    expect(run.body.result.summary.treads).toBe(12);
    // Priced in full from the seeded catalog (version 1), the controller included.
    expect(run.body.result.pricing).toMatchObject({ source: 'stored', catalogVersion: 1, complete: true });
    expect(run.body.result.bom.map((l: { sku?: string }) => l.sku)).toContain('HL-K20');

    const ava = (await signIn(t.app, 'ava@kestrelfinch.test', DEMO_PASSWORD)).accessToken;
    expect((await as(ava)('/v1/projects').expect(200)).body.items).toEqual([]);
    await as(ava)(`/v1/projects/${projects[0].id}`).expect(404);
  });
});
