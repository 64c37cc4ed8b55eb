import request from 'supertest';
import { and, eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auditEvents, storedEstimates } from '../../api/db/schema.js';
import { estimateExamples } from '../../shared/schemas/estimate-examples.js';
import { ENGINE_VERSION } from '../../shared/sizing/version.js';
import { createMember, signIn } from '../support/accounts.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

let t: TestApp;
let orgA: { id: string };
let adminA: string;
let estimatorA: string;
let estimatorAUserId: string;
let viewerA: string;
let writerKeyA: string;
let writerKeyIdA: string;
let readerKeyA: string;
let sizingKeyA: string;
let embedKeyA: string;
let adminB: string;
const ORIGIN = 'https://shop.projects.test';
const STAIR_INPUT = estimateExamples.alderRowTownhouse;

beforeAll(async () => {
  t = await createTestApp();
  orgA = await createOrganization(t, 'projects-a');
  const orgB = await createOrganization(t, 'projects-b');
  adminA = (await signIn(t.app, (await createMember(t.app, orgA.id, 'admin')).email)).accessToken;
  const estimator = await createMember(t.app, orgA.id, 'estimator');
  estimatorAUserId = estimator.user.id;
  estimatorA = (await signIn(t.app, estimator.email)).accessToken;
  viewerA = (await signIn(t.app, (await createMember(t.app, orgA.id, 'viewer')).email)).accessToken;
  adminB = (await signIn(t.app, (await createMember(t.app, orgB.id, 'admin')).email)).accessToken;
  const writer = await createKey(t, orgA.id, { scopes: ['projects:read', 'projects:write'] });
  writerKeyA = writer.token;
  writerKeyIdA = writer.key.keyId;
  readerKeyA = (await createKey(t, orgA.id, { scopes: ['projects:read'] })).token;
  sizingKeyA = (await createKey(t, orgA.id, { scopes: ['sizing:run'] })).token;
  embedKeyA = (await createKey(t, orgA.id, { kind: 'embed', scopes: ['sizing:run', 'catalog:read'], allowedOrigins: [ORIGIN] })).token;
});
afterAll(() => t.close());

const as = (token: string, headers: Record<string, string> = {}) => {
  const auth = (r: request.Test) => r.set({ Authorization: `Bearer ${token}`, ...headers });
  return {
    get: (path: string) => auth(request(t.app).get(path)),
    post: (path: string, body: object = {}) => auth(request(t.app).post(path)).send(body),
    patch: (path: string, body: object) => auth(request(t.app).patch(path)).send(body),
    delete: (path: string) => auth(request(t.app).delete(path)),
  };
};

async function newProject(token = estimatorA, body: object = { name: 'Alder Row, house 7', clientName: 'Kestrel & Finch Builders', siteAddress: '7 Alder Row\nMillbrook' }) {
  return (await as(token).post('/v1/projects', body).expect(201)).body as { id: string; name: string };
}
async function newStair(projectId: string, token = estimatorA, input: object = STAIR_INPUT) {
  return (await as(token).post(`/v1/projects/${projectId}/stairs`, { name: 'Main stair', input }).expect(201)).body as { id: string; projectId: string };
}
async function auditActions(targetId: string): Promise<string[]> {
  const rows = await t.database.db.select().from(auditEvents).where(and(eq(auditEvents.organizationId, orgA.id), eq(auditEvents.targetId, targetId)));
  return rows.map((r) => r.action).sort();
}

describe('projects', () => {
  it('an estimator creates one; it answers who made it, when, and the request id', async () => {
    const res = await as(estimatorA).post('/v1/projects', { name: '  Alder Row, house 7 ', clientName: 'Kestrel & Finch Builders', siteAddress: '7 Alder Row\nMillbrook' }).expect(201);
    expect(res.body).toMatchObject({
      name: 'Alder Row, house 7',
      clientName: 'Kestrel & Finch Builders',
      siteAddress: '7 Alder Row\nMillbrook',
      notes: null,
      stairCount: 0,
      createdBy: { type: 'user', id: estimatorAUserId },
      requestId: res.headers['x-request-id'],
    });
    expect(res.headers.location).toBe(`/v1/projects/${res.body.id}`);
    const shown = (await as(viewerA).get(`/v1/projects/${res.body.id}`).expect(200)).body;
    expect(shown).toEqual({ ...res.body, requestId: undefined });
    expect(await auditActions(res.body.id)).toEqual(['project.created']);
  });

  it('a key with projects:write creates one in its name', async () => {
    const res = await as(writerKeyA).post('/v1/projects', { name: 'Quayside Studio corridor' }).expect(201);
    expect(res.body.createdBy).toEqual({ type: 'api_key', id: writerKeyIdA });
  });

  it('refuses unknown fields, multi-line names and control characters, naming each', async () => {
    const unknown = await as(estimatorA).post('/v1/projects', { name: 'X', colour: 'blue' }).expect(400);
    expect(unknown.body.errors).toEqual([{ path: 'colour', message: 'unknown field' }]);
    const twoLines = await as(estimatorA).post('/v1/projects', { name: 'A\nB' }).expect(400);
    expect(twoLines.body.errors[0].path).toBe('name');
    const control = await as(estimatorA).post('/v1/projects', { name: 'A', notes: 'bell \u0007' }).expect(400);
    expect(control.body.errors[0].path).toBe('notes');
    await as(estimatorA).post('/v1/projects', {}).expect(400);
  });

  it('PATCH changes the named fields; null removes an optional one', async () => {
    const project = await newProject();
    const res = await as(estimatorA).patch(`/v1/projects/${project.id}`, { notes: 'Warm white, 3000 K.', clientName: null }).expect(200);
    expect(res.body).toMatchObject({ name: project.name, notes: 'Warm white, 3000 K.', clientName: null, siteAddress: '7 Alder Row\nMillbrook' });
    await as(viewerA).patch(`/v1/projects/${project.id}`, { notes: 'x' }).expect(403);
  });

  it('viewers and projects:read keys read but do not write; deleting needs an admin', async () => {
    const project = await newProject();
    await as(viewerA).get('/v1/projects').expect(200);
    await as(readerKeyA).get(`/v1/projects/${project.id}`).expect(200);
    expect((await as(viewerA).post('/v1/projects', { name: 'No' }).expect(403)).body.code).toBe('insufficient_role');
    expect((await as(readerKeyA).post('/v1/projects', { name: 'No' }).expect(403)).body.code).toBe('insufficient_scope');
    expect((await as(sizingKeyA).get('/v1/projects').expect(403)).body.code).toBe('insufficient_scope');
    expect((await as(estimatorA).delete(`/v1/projects/${project.id}`).expect(403)).body.code).toBe('insufficient_role');
    await as(adminA).delete(`/v1/projects/${project.id}`).expect(204);
    await as(adminA).get(`/v1/projects/${project.id}`).expect(404);
    expect(await auditActions(project.id)).toEqual(['project.created', 'project.deleted']);
  });

  it('deleting a project deletes its stairs and stored estimates', async () => {
    const project = await newProject();
    const stair = await newStair(project.id);
    const run = (await as(estimatorA).post(`/v1/projects/${project.id}/stairs/${stair.id}/estimates`).expect(201)).body;
    await as(writerKeyA).delete(`/v1/projects/${project.id}`).expect(204);
    await as(adminA).get(`/v1/estimates/${run.id}`).expect(404);
    expect(await t.database.db.select().from(storedEstimates).where(eq(storedEstimates.id, run.id))).toEqual([]);
  });
});

describe('pagination', () => {
  it('pages by cursor, newest first, every project once, nextCursor null at the end', async () => {
    const org = await createOrganization(t, 'projects-pages');
    const token = (await createKey(t, org.id, { scopes: ['projects:read', 'projects:write'] })).token;
    const made: string[] = [];
    for (let i = 1; i <= 5; i++) made.push((await as(token).post('/v1/projects', { name: `Project ${i}` }).expect(201)).body.id);
    const seen: string[] = [];
    let cursor: string | null = null;
    let pages = 0;
    do {
      const page: { items: { id: string }[]; nextCursor: string | null } = (await as(token).get(`/v1/projects?limit=2${cursor ? `&cursor=${cursor}` : ''}`).expect(200)).body;
      expect(page.items.length).toBeLessThanOrEqual(2);
      seen.push(...page.items.map((p) => p.id));
      cursor = page.nextCursor;
      pages++;
    } while (cursor);
    expect(pages).toBe(3);
    expect(seen).toEqual([...made].reverse());
  });

  it('refuses a cursor it did not issue and a limit out of range', async () => {
    expect((await as(viewerA).get('/v1/projects?cursor=bm9wZQ').expect(400)).body.code).toBe('invalid_cursor');
    await as(viewerA).get('/v1/projects?limit=0').expect(400);
    await as(viewerA).get('/v1/projects?colour=blue').expect(400);
  });

  it('pages a project’s stairs and a stair’s estimates', async () => {
    const project = await newProject();
    const stairs = [await newStair(project.id), await newStair(project.id), await newStair(project.id)];
    const first = (await as(viewerA).get(`/v1/projects/${project.id}/stairs?limit=2`).expect(200)).body;
    const second = (await as(viewerA).get(`/v1/projects/${project.id}/stairs?limit=2&cursor=${first.nextCursor}`).expect(200)).body;
    expect([...first.items, ...second.items].map((s: { id: string }) => s.id)).toEqual(stairs.map((s) => s.id).reverse());
    expect(second.nextCursor).toBeNull();

    const path = `/v1/projects/${project.id}/stairs/${stairs[0]!.id}/estimates`;
    const runs = [(await as(estimatorA).post(path).expect(201)).body.id, (await as(estimatorA).post(path).expect(201)).body.id];
    const page1 = (await as(viewerA).get(`${path}?limit=1`).expect(200)).body;
    const page2 = (await as(viewerA).get(`${path}?limit=1&cursor=${page1.nextCursor}`).expect(200)).body;
    expect([page1.items[0].id, page2.items[0].id]).toEqual([...runs].reverse());
    expect(page2.nextCursor).toBeNull();
    expect((await as(viewerA).get(`/v1/projects/${project.id}`).expect(200)).body.stairCount).toBe(3);
  });
});

describe('idempotent creation', () => {
  it('replays the first answer byte for byte and creates one project', async () => {
    const key = { 'Idempotency-Key': 'project-create-1' };
    const body = { name: 'Alder Row, house 9' };
    const first = await as(estimatorA, key).post('/v1/projects', body).expect(201);
    const again = await as(estimatorA, key).post('/v1/projects', body).expect(201);
    expect(again.text).toBe(first.text);
    expect(again.body.requestId).toBe(first.body.requestId);
    expect(again.headers['x-request-id']).not.toBe(first.body.requestId);
    const all = (await as(viewerA).get('/v1/projects?limit=200').expect(200)).body.items.filter((p: { name: string }) => p.name === 'Alder Row, house 9');
    expect(all).toHaveLength(1);
    expect((await as(estimatorA, key).post('/v1/projects', { name: 'Another' }).expect(422)).body.code).toBe('idempotency_key_reused');
  });

  it('stairs and runs take the key too: a retried run stores one estimate', async () => {
    const project = await newProject();
    const stairKey = { 'Idempotency-Key': 'stair-create-1' };
    const stair = (await as(estimatorA, stairKey).post(`/v1/projects/${project.id}/stairs`, { name: 'Loft stair', input: STAIR_INPUT }).expect(201)).body;
    const replayed = (await as(estimatorA, stairKey).post(`/v1/projects/${project.id}/stairs`, { name: 'Loft stair', input: STAIR_INPUT }).expect(201)).body;
    expect(replayed.id).toBe(stair.id);

    const runKey = { 'Idempotency-Key': 'run-1' };
    const path = `/v1/projects/${project.id}/stairs/${stair.id}/estimates`;
    const first = await as(estimatorA, runKey).post(path).expect(201);
    const again = await as(estimatorA, runKey).post(path).expect(201);
    expect(again.text).toBe(first.text);
    expect((await as(viewerA).get(path).expect(200)).body.items).toHaveLength(1);
  });
});

describe('stairs', () => {
  it('stores the estimate request as sent, validated by the estimate schema', async () => {
    const project = await newProject();
    const res = await as(estimatorA).post(`/v1/projects/${project.id}/stairs`, { name: 'Main stair', notes: 'Oak treads', input: STAIR_INPUT }).expect(201);
    expect(res.body).toMatchObject({ projectId: project.id, name: 'Main stair', notes: 'Oak treads', input: STAIR_INPUT, requestId: res.headers['x-request-id'] });
    expect(res.headers.location).toBe(`/v1/projects/${project.id}/stairs/${res.body.id}`);
    expect((await as(viewerA).get(`/v1/projects/${project.id}/stairs/${res.body.id}`).expect(200)).body.input).toEqual(STAIR_INPUT);
    expect(await auditActions(res.body.id)).toEqual(['stair.created']);

    const bad = await as(estimatorA).post(`/v1/projects/${project.id}/stairs`, { name: 'Bad', input: { ...STAIR_INPUT, staircase: { ...STAIR_INPUT.staircase, treads: -3 } } }).expect(400);
    expect(bad.body.errors.map((e: { path: string }) => e.path)).toContain('input.staircase.treads');
    const typo = await as(estimatorA).post(`/v1/projects/${project.id}/stairs`, { name: 'Typo', input: { ...STAIR_INPUT, cable: { maxDropPercnt: 3 } } }).expect(400);
    expect(typo.body.errors).toContainEqual({ path: 'input.cable.maxDropPercnt', message: 'unknown field' });
  });

  it('PATCH renames or replaces the input; the estimates already stored keep theirs', async () => {
    const project = await newProject();
    const stair = await newStair(project.id);
    const path = `/v1/projects/${project.id}/stairs/${stair.id}`;
    const before = (await as(estimatorA).post(`${path}/estimates`).expect(201)).body;
    const wider = { ...STAIR_INPUT, staircase: { ...STAIR_INPUT.staircase, treadWidthMm: 1200 } };
    const patched = (await as(estimatorA).patch(path, { name: 'Main stair (wide)', input: wider }).expect(200)).body;
    expect(patched).toMatchObject({ name: 'Main stair (wide)', input: wider });
    const after = (await as(estimatorA).post(`${path}/estimates`).expect(201)).body;
    expect((await as(viewerA).get(`/v1/estimates/${before.id}`).expect(200)).body.input).toEqual(STAIR_INPUT);
    expect(after.input).toEqual(wider);
    expect(after.result.summary.totalLoadW).toBeGreaterThan(before.result.summary.totalLoadW);
  });

  it('deleting one needs an admin and takes its estimates with it', async () => {
    const project = await newProject();
    const stair = await newStair(project.id);
    const path = `/v1/projects/${project.id}/stairs/${stair.id}`;
    const run = (await as(estimatorA).post(`${path}/estimates`).expect(201)).body;
    await as(estimatorA).delete(path).expect(403);
    await as(adminA).delete(path).expect(204);
    await as(viewerA).get(path).expect(404);
    await as(viewerA).get(`/v1/estimates/${run.id}`).expect(404);
    expect(await auditActions(stair.id)).toEqual(['stair.created', 'stair.deleted']);
  });

  it('a stair is found only under its own project', async () => {
    const one = await newProject();
    const other = await newProject();
    const stair = await newStair(one.id);
    expect((await as(viewerA).get(`/v1/projects/${other.id}/stairs/${stair.id}`).expect(404)).body.code).toBe('stair_not_found');
  });
});

describe('running a stair', () => {
  it('stores input, result, engine version, who ran it and when, metered as sizing', async () => {
    const project = await newProject();
    const stair = await newStair(project.id);
    const res = await as(estimatorA).post(`/v1/projects/${project.id}/stairs/${stair.id}/estimates`).expect(201);
    const direct = (await request(t.app).post('/v1/estimates').set('Authorization', `Bearer ${sizingKeyA}`).send(STAIR_INPUT).expect(200)).body;
    expect(res.body).toMatchObject({
      projectId: project.id,
      stairId: stair.id,
      engineVersion: ENGINE_VERSION,
      ranBy: { type: 'user', id: estimatorAUserId },
      rerunOf: null,
      input: STAIR_INPUT,
      requestId: res.headers['x-request-id'],
    });
    // The same engine as POST /v1/estimates: the stored result is what the stateless call answers.
    expect(res.body.result.summary).toEqual(direct.summary);
    expect(res.body.result.checks).toEqual(direct.checks);
    expect(res.headers.location).toBe(`/v1/estimates/${res.body.id}`);
    // Charged against the cost budget as a sizing call is.
    expect(String(res.headers.ratelimit)).toContain('"cost"');

    const shown = (await as(readerKeyA).get(`/v1/estimates/${res.body.id}`).expect(200)).body;
    expect(shown).toEqual({ ...res.body, requestId: undefined });
    const listed = (await as(viewerA).get(`/v1/projects/${project.id}/stairs/${stair.id}/estimates`).expect(200)).body.items;
    expect(listed).toEqual([
      expect.objectContaining({ id: res.body.id, engineVersion: ENGINE_VERSION, summary: direct.summary, ranBy: { type: 'user', id: estimatorAUserId } }),
    ]);
    expect(listed[0].result).toBeUndefined();
  });

  it('a signed-in user’s run counts in the usage like sizing does', async () => {
    const project = await newProject();
    const stair = await newStair(project.id);
    await as(estimatorA).post(`/v1/projects/${project.id}/stairs/${stair.id}/estimates`).expect(201);
    await t.app.locals.services.usageMeter.flush();
    const usage = (await as(adminA).get('/v1/usage').expect(200)).body;
    expect(JSON.stringify(usage)).toContain('POST /v1/projects/:id/stairs/:stairId/estimates');
  });

  it('viewers and read keys cannot run; a key with projects:write can', async () => {
    const project = await newProject();
    const stair = await newStair(project.id);
    const path = `/v1/projects/${project.id}/stairs/${stair.id}/estimates`;
    await as(viewerA).post(path).expect(403);
    await as(readerKeyA).post(path).expect(403);
    await as(sizingKeyA).post(path).expect(403);
    const byKey = (await as(writerKeyA).post(path).expect(201)).body;
    expect(byKey.ranBy).toEqual({ type: 'api_key', id: writerKeyIdA });
    await as(estimatorA).post(path, { force: true }).expect(400);
  });

  it('re-runs the stored input: a new estimate naming the old one, nothing changed on the same engine', async () => {
    const project = await newProject();
    const stair = await newStair(project.id);
    const first = (await as(estimatorA).post(`/v1/projects/${project.id}/stairs/${stair.id}/estimates`).expect(201)).body;
    const again = await as(estimatorA).post(`/v1/estimates/${first.id}/rerun`).expect(201);
    expect(again.body).toMatchObject({ rerunOf: first.id, stairId: stair.id, input: STAIR_INPUT, engineVersion: ENGINE_VERSION });
    expect(again.body.id).not.toBe(first.id);
    expect(again.body.changes).toMatchObject({ changed: false, checks: [], figures: { totalLoadW: { old: first.result.summary.totalLoadW, new: first.result.summary.totalLoadW, changed: false } } });
    expect(again.headers.location).toBe(`/v1/estimates/${again.body.id}`);
    expect((await as(viewerA).get(`/v1/estimates/${again.body.id}`).expect(200)).body.rerunOf).toBe(first.id);
    await as(viewerA).post(`/v1/estimates/${first.id}/rerun`).expect(403);
  });
});

describe('other organisations', () => {
  it('get 404 on every project, stair and estimate of this one', async () => {
    const project = await newProject();
    const stair = await newStair(project.id);
    const estimate = (await as(estimatorA).post(`/v1/projects/${project.id}/stairs/${stair.id}/estimates`).expect(201)).body;
    const p = `/v1/projects/${project.id}`;
    const s = `${p}/stairs/${stair.id}`;
    const b = as(adminB);
    const calls: [string, request.Test][] = [
      ['GET project', b.get(p)],
      ['PATCH project', b.patch(p, { name: 'Mine now' })],
      ['DELETE project', b.delete(p)],
      ['GET stairs', b.get(`${p}/stairs`)],
      ['POST stair', b.post(`${p}/stairs`, { name: 'Mine', input: STAIR_INPUT })],
      ['GET stair', b.get(s)],
      ['PATCH stair', b.patch(s, { name: 'Mine' })],
      ['DELETE stair', b.delete(s)],
      ['GET estimates', b.get(`${s}/estimates`)],
      ['POST run', b.post(`${s}/estimates`)],
      ['GET estimate', b.get(`/v1/estimates/${estimate.id}`)],
      ['POST rerun', b.post(`/v1/estimates/${estimate.id}/rerun`)],
    ];
    const outcomes: string[] = [];
    for (const [name, call] of calls) {
      const res = await call;
      if (res.status !== 404) outcomes.push(`${name}: ${res.status}`);
      expect(res.headers['content-type']).toContain('application/problem+json');
    }
    expect(outcomes).toEqual([]);
    // Nothing of theirs changed.
    expect((await as(viewerA).get(p).expect(200)).body.name).toBe(project.name);
    expect((await as(viewerA).get(`${s}/estimates`).expect(200)).body.items).toHaveLength(1);
  });

  it('an id that is not a UUID is simply not found', async () => {
    expect((await as(viewerA).get('/v1/projects/not-a-uuid').expect(404)).body.code).toBe('project_not_found');
    expect((await as(viewerA).get('/v1/estimates/not-a-uuid').expect(404)).body.code).toBe('estimate_not_found');
  });
});

describe('embed keys', () => {
  it('get 403 on all of it', async () => {
    const project = await newProject();
    const e = as(embedKeyA, { Origin: ORIGIN });
    for (const call of [e.get('/v1/projects'), e.post('/v1/projects', { name: 'x' }), e.get(`/v1/projects/${project.id}`), e.get(`/v1/projects/${project.id}/stairs`), e.get('/v1/estimates/00000000-0000-4000-8000-000000000000')]) {
      const res = await call;
      expect(res.status).toBe(403);
      expect(res.body.code).toBe('embed_key_not_allowed');
    }
  });
});
