import Ajv2020 from 'ajv/dist/2020.js';
import addFormats from 'ajv-formats';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openApiDocument } from '../../api/openapi/spec.js';
import { estimateExamples } from '../../shared/schemas/estimate-examples.js';
import { harborLaneKitOptions } from '../../shared/schemas/estimate-options.js';
import { bearer, createMember, createOperator, signIn, TEST_PASSWORD } from '../support/accounts.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

// The document once disagreed with the server (`bitsPerPixel` documented as only 24 while 32 was
// accepted; the invitation password described as ignored though an existing account needs it).
// Here every documented example, and real answers of the server, are validated against the
// document itself with a JSON Schema 2020-12 validator (the dialect of OpenAPI 3.1).

type Schema = Record<string, unknown>;
interface MediaType {
  schema?: Schema;
  example?: unknown;
  examples?: Record<string, { value?: unknown }>;
}
interface Operation {
  parameters?: { name: string; in: string; schema?: Schema; example?: unknown }[];
  requestBody?: { content: Record<string, MediaType> };
  responses: Record<string, { content?: Record<string, MediaType> }>;
}
const doc = openApiDocument() as unknown as { paths: Record<string, Record<string, Operation>>; components: { schemas: Record<string, Schema> } };

const DOC_ID = 'https://treadwise.test/openapi.json';
const ajv = new Ajv2020({ strict: false, allErrors: true, validateFormats: true });
addFormats(ajv);
ajv.addSchema({ $id: DOC_ID, components: doc.components });

/** A schema of the document, its local `$ref`s pointed at the document registered above. */
function resolvable(schema: Schema): Schema {
  return JSON.parse(JSON.stringify(schema).replaceAll('"#/components/', `"${DOC_ID}#/components/`)) as Schema;
}

const compiled = new Map<string, ReturnType<typeof ajv.compile>>();
function validate(schema: Schema, value: unknown): string[] {
  const key = JSON.stringify(schema);
  let check = compiled.get(key);
  if (!check) {
    check = ajv.compile(resolvable(schema));
    compiled.set(key, check);
  }
  return check(value) ? [] : (check.errors ?? []).map((e) => `${e.instancePath || '/'} ${e.message} ${JSON.stringify(e.params)}`);
}

/** Every `example` / `examples` in a schema tree, with the subschema it illustrates. */
function schemaExamples(schema: unknown, where: string, out: { where: string; schema: Schema; value: unknown }[] = []) {
  if (Array.isArray(schema)) schema.forEach((s, i) => schemaExamples(s, `${where}[${i}]`, out));
  if (schema === null || typeof schema !== 'object' || Array.isArray(schema)) return out;
  const s = schema as Schema;
  if ('example' in s) out.push({ where, schema: s, value: s.example });
  if (Array.isArray(s.examples)) s.examples.forEach((value, i) => out.push({ where: `${where}.examples[${i}]`, schema: s, value }));
  for (const [k, v] of Object.entries(s)) if (k !== 'example' && k !== 'examples') schemaExamples(v, `${where}.${k}`, out);
  return out;
}

function documentedExamples() {
  const out: { where: string; schema: Schema; value: unknown }[] = [];
  for (const [name, schema] of Object.entries(doc.components.schemas)) schemaExamples(schema, `components.schemas.${name}`, out);
  for (const [p, item] of Object.entries(doc.paths)) {
    for (const [method, op] of Object.entries(item)) {
      const at = `${method.toUpperCase()} ${p}`;
      for (const param of op.parameters ?? []) {
        if (param.schema) schemaExamples(param.schema, `${at} ${param.in} ${param.name}`, out);
        if (param.schema && 'example' in param) out.push({ where: `${at} ${param.in} ${param.name} example`, schema: param.schema, value: param.example });
      }
      const media = [
        ...Object.entries(op.requestBody?.content ?? {}).map(([type, m]) => ({ at: `${at} request ${type}`, m })),
        ...Object.entries(op.responses).flatMap(([status, r]) => Object.entries(r.content ?? {}).map(([type, m]) => ({ at: `${at} ${status} ${type}`, m }))),
      ];
      for (const { at: where, m } of media) {
        if (!m.schema) continue;
        if (!m.schema.$ref) schemaExamples(m.schema, where, out);
        if ('example' in m) out.push({ where: `${where} example`, schema: m.schema, value: m.example });
        for (const [name, ex] of Object.entries(m.examples ?? {})) out.push({ where: `${where} examples.${name}`, schema: m.schema, value: ex.value });
      }
    }
  }
  return out;
}

describe('documented examples', () => {
  const examples = documentedExamples();

  it('are many: requests, answers and problems all carry them', () => {
    expect(examples.length).toBeGreaterThan(50);
    expect(examples.some((e) => e.where.startsWith('components.schemas.EstimateRequest'))).toBe(true);
    expect(examples.some((e) => e.where.startsWith('components.schemas.Problem'))).toBe(true);
    expect(examples.some((e) => e.where.startsWith('components.schemas.EstimateResponse'))).toBe(true);
  });

  it('each validates against the schema it illustrates', () => {
    const failures = examples.flatMap((e) => validate(e.schema, e.value).map((err) => `${e.where}: ${err}`));
    expect(failures).toEqual([]);
  });
});

describe('documented answers', () => {
  it('include a 400 on every operation that takes a body or query parameters (each is validated)', () => {
    const missing = Object.entries(doc.paths).flatMap(([p, item]) =>
      Object.entries(item)
        .filter(([, op]) => op.requestBody || (op.parameters ?? []).some((param) => param.in === 'query'))
        .filter(([, op]) => !op.responses['400'])
        .map(([method]) => `${method.toUpperCase()} ${p}`),
    );
    expect(missing).toEqual([]);
  });
});

// ---- real answers -------------------------------------------------------------------------------

/** The documented schema of an answer: by operation (path template), status and media type. */
function documentedAnswer(method: string, template: string, status: number, contentType: string): Schema {
  const op = doc.paths[template]?.[method.toLowerCase()];
  if (!op) throw new Error(`${method} ${template} is not in the document`);
  const response = op.responses[String(status)] ?? op.responses.default;
  if (!response) throw new Error(`${method} ${template} does not document status ${status}`);
  const type = contentType.split(';')[0]!.trim();
  const media = response.content?.[type];
  if (!media?.schema) throw new Error(`${method} ${template} ${status} does not document ${type} (it documents ${Object.keys(response.content ?? {}).join(', ') || 'no body'})`);
  return media.schema;
}

/**
 * The answer matches the documented schema of its route and status; and a request body the
 * server accepted (2xx) is one the document says is valid, so the document is not narrower than
 * the server (`bitsPerPixel: 32` was accepted but documented as only 24).
 */
function expectConforms(res: request.Response, method: string, template: string, status?: number, sent?: object) {
  if (status !== undefined) expect(res.status, JSON.stringify(res.body)).toBe(status);
  const schema = documentedAnswer(method, template, res.status, res.headers['content-type'] ?? '');
  expect(validate(schema, res.body), `${method} ${template} ${res.status}`).toEqual([]);
  if (sent !== undefined && res.status < 300) {
    const body = doc.paths[template]?.[method.toLowerCase()]?.requestBody?.content['application/json']?.schema;
    if (!body) throw new Error(`${method} ${template} documents no JSON request body`);
    expect(validate(body, sent), `${method} ${template} request`).toEqual([]);
  }
}

async function invitationToken(email: string): Promise<string> {
  const message = (await t.app.locals.services.mailer.outbox({ limit: 100 })).items.find((m) => m.to === email);
  const match = /accept-invitation\?token=([A-Za-z0-9_%-]+)/.exec(message?.text ?? '');
  expect(match, `an invitation e-mail to ${email}`).not.toBeNull();
  return decodeURIComponent(match![1]!);
}

let t: TestApp;
let server: string;
let admin: string;
let ops: string;
let memberEmail: string;

beforeAll(async () => {
  t = await createTestApp();
  const org = await createOrganization(t, 'conformance');
  ({ token: server } = await createKey(t, org.id, { scopes: ['sizing:run', 'usage:read', 'batches:write'] }));
  memberEmail = (await createMember(t.app, org.id, 'admin')).email;
  admin = (await signIn(t.app, memberEmail)).accessToken;
  ops = (await signIn(t.app, (await createOperator(t.app)).email)).accessToken;
});
afterAll(() => t.close());

describe('real answers match the documented schema of their route and status', () => {
  it('every calculation endpoint', async () => {
    const calc = (name: string, body: object) => request(t.app).post(`/v1/calculations/${name}`).set(bearer(server)).send(body);
    const cases: [string, object][] = [
      ['voltage-drop', { supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 } }],
      ['voltage-drop', { supplyVoltageV: 12, currentA: 3, lengthM: 8, conductor: { awg: 18 }, loadDistribution: 'uniform' }],
      ['cable', { supplyVoltageV: 24, currentA: 4, lengthM: 12 }],
      ['cable', { supplyVoltageV: 12, currentA: 40, lengthM: 30, conductorTable: 'awg-solid' }],
      ['driver', { loadW: 140, outputVoltageV: 24, efficiencyPercent: 90, mainsVoltageV: 230 }],
      ['pixels', { pixels: 1080, protocol: 'one-wire-800k', bitsPerPixel: 32 }],
      ['pixels', { pixels: 300, protocol: 'clocked', clockHz: 2_000_000 }],
      ['reels', { piecesMm: [850, 850, 850, 1200, 400], reelLengthMm: 5000 }],
    ];
    for (const [name, body] of cases) expectConforms(await calc(name, body), 'POST', `/v1/calculations/${name}`, 200, body);
  });

  it('each estimate layout, the documented examples included', async () => {
    const layouts = new Set<string>();
    const rgbw = { ...estimateExamples.alderRowTreadPixels, treadPixels: { ...estimateExamples.alderRowTreadPixels.treadPixels, bitsPerPixel: 32 } };
    for (const example of [...Object.values(estimateExamples), rgbw]) {
      const res = await request(t.app).post('/v1/estimates').set(bearer(server)).send(example);
      expectConforms(res, 'POST', '/v1/estimates', 200, example);
      layouts.add(example.layout);
    }
    expect([...layouts].sort()).toEqual(['rail-pixels', 'tread-pixels', 'tread-strips', 'treads-and-rail']);
  });

  it('a synchronous batch: summary and full detail, good and bad items, its problems', async () => {
    const items = [
      ...Object.values(estimateExamples).map((example, i) => ({ ref: `Stair ${i + 1}`, request: example })),
      { ref: 'Broken', request: { layout: 'tread-strips' } },
    ];
    for (const query of ['', '?detail=full']) {
      const res = await request(t.app).post(`/v1/estimates/batch${query}`).set(bearer(server)).send({ items });
      expectConforms(res, 'POST', '/v1/estimates/batch', 200, { items });
      expect(res.body.summary).toMatchObject({ items: items.length, failed: 1 });
    }
    expectConforms(await request(t.app).post('/v1/estimates/batch').set(bearer(server)).send({ items: [] }), 'POST', '/v1/estimates/batch', 400);
    expectConforms(await request(t.app).post('/v1/estimates/batch').set(bearer(admin)).send({ items }), 'POST', '/v1/estimates/batch', 200, { items });
    const sizingOnly = (await createKey(t, (await createOrganization(t, 'conformance-batch')).id, { scopes: ['sizing:run'] })).token;
    expectConforms(await request(t.app).post('/v1/estimates/batch').set(bearer(sizingOnly)).send({ items }), 'POST', '/v1/estimates/batch', 403);
    // The template is CSV text (documented as a string); its refusals are problem+json.
    const template = await request(t.app).get('/v1/batches/template.csv').set(bearer(server)).expect(200);
    expect(validate(documentedAnswer('GET', '/v1/batches/template.csv', 200, template.headers['content-type']!), template.text)).toEqual([]);
    expectConforms(await request(t.app).get('/v1/batches/template.csv').set(bearer(sizingOnly)), 'GET', '/v1/batches/template.csv', 403);
  });

  it('batch jobs: created from JSON, read, listed, results and errors as NDJSON lines and CSV, cancelled, refused', async () => {
    const items = [
      { ref: 'Stair 1', request: Object.values(estimateExamples)[0] },
      { ref: 'Broken', request: { layout: 'tread-strips' } },
    ];
    const created = await request(t.app).post('/v1/batches').set(bearer(server)).send({ name: 'Conformance', items });
    expectConforms(created, 'POST', '/v1/batches', 202, { name: 'Conformance', items });
    await t.app.locals.services.batchJobs.drain();
    expectConforms(await request(t.app).get(`/v1/batches/${created.body.id}`).set(bearer(server)), 'GET', '/v1/batches/{id}', 200);
    expectConforms(await request(t.app).get('/v1/batches').set(bearer(admin)), 'GET', '/v1/batches', 200);
    const item = { oneOf: [{ $ref: '#/components/schemas/EstimateBatchOkItem' }, { $ref: '#/components/schemas/EstimateBatchErrorItem' }] };
    for (const path of ['results', 'errors']) {
      const lines = await request(t.app).get(`/v1/batches/${created.body.id}/${path}`).set(bearer(server)).expect(200);
      expect(validate(documentedAnswer('GET', `/v1/batches/{id}/${path}`, 200, lines.headers['content-type']!), lines.text)).toEqual([]);
      for (const line of lines.text.trim().split('\n')) expect(validate(item, JSON.parse(line))).toEqual([]);
      const csv = await request(t.app).get(`/v1/batches/${created.body.id}/${path}?format=csv`).set(bearer(server)).expect(200);
      expect(validate(documentedAnswer('GET', `/v1/batches/{id}/${path}`, 200, csv.headers['content-type']!), csv.text)).toEqual([]);
    }
    expectConforms(await request(t.app).post(`/v1/batches/${created.body.id}/cancel`).set(bearer(server)), 'POST', '/v1/batches/{id}/cancel', 409);
    const queued = await request(t.app).post('/v1/batches').set(bearer(server)).send({ items });
    expectConforms(await request(t.app).post(`/v1/batches/${queued.body.id}/cancel`).set(bearer(server)), 'POST', '/v1/batches/{id}/cancel', 200);
    expectConforms(await request(t.app).post('/v1/batches').set(bearer(server)).send({ items: [] }), 'POST', '/v1/batches', 400);
    expectConforms(await request(t.app).get('/v1/batches/3d1f7c2a-9b4e-4f60-8a2d-5c7e1b9f0a34').set(bearer(server)), 'GET', '/v1/batches/{id}', 404);
  });

  it('kit options: ranked designs and an empty stored catalog', async () => {
    const ranked = await request(t.app).post('/v1/estimates/options').set(bearer(server)).send(harborLaneKitOptions);
    expect(ranked.body.designs?.length).toBeGreaterThan(0);
    expectConforms(ranked, 'POST', '/v1/estimates/options', 200, harborLaneKitOptions);
    const { catalog: _inline, ...stored } = harborLaneKitOptions;
    expectConforms(await request(t.app).post('/v1/estimates/options').set(bearer(server)).send(stored), 'POST', '/v1/estimates/options', 422, stored);
  });

  it('keys: create, list, show, rotate, revoke', async () => {
    const newKey = { name: 'Shop pages', kind: 'embed', allowedOrigins: ['https://shop.conformance.test'] };
    const created = await request(t.app).post('/v1/keys').set(bearer(admin)).send(newKey);
    expectConforms(created, 'POST', '/v1/keys', 201, newKey);
    expectConforms(await request(t.app).get('/v1/keys?limit=5').set(bearer(admin)), 'GET', '/v1/keys', 200);
    const id = created.body.key.id as string;
    expectConforms(await request(t.app).get(`/v1/keys/${id}`).set(bearer(admin)), 'GET', '/v1/keys/{id}', 200);
    expectConforms(await request(t.app).post(`/v1/keys/${id}/rotate`).set(bearer(admin)).send({ overlapHours: 1 }), 'POST', '/v1/keys/{id}/rotate', 200);
    expectConforms(await request(t.app).post(`/v1/keys/${id}/revoke`).set(bearer(admin)).send({}), 'POST', '/v1/keys/{id}/revoke', 200);
  });

  it('projects: a project, a stair, a run, a re-run, their lists and problems', async () => {
    const as = (r: request.Test) => r.set(bearer(admin));
    const newProject = { name: 'Alder Row, house 7', clientName: 'Kestrel & Finch Builders', siteAddress: '7 Alder Row\nMillbrook' };
    const project = await as(request(t.app).post('/v1/projects')).send(newProject);
    expectConforms(project, 'POST', '/v1/projects', 201, newProject);
    const p = `/v1/projects/${project.body.id}`;
    expectConforms(await as(request(t.app).get('/v1/projects?limit=5')), 'GET', '/v1/projects', 200);
    expectConforms(await as(request(t.app).get(p)), 'GET', '/v1/projects/{id}', 200);
    expectConforms(await as(request(t.app).patch(p)).send({ notes: 'Warm white' }), 'PATCH', '/v1/projects/{id}', 200, { notes: 'Warm white' });
    const newStair = { name: 'Main stair', input: estimateExamples.harborLaneCheckout };
    const stair = await as(request(t.app).post(`${p}/stairs`)).send(newStair);
    expectConforms(stair, 'POST', '/v1/projects/{id}/stairs', 201, newStair);
    const s = `${p}/stairs/${stair.body.id}`;
    expectConforms(await as(request(t.app).get(`${p}/stairs`)), 'GET', '/v1/projects/{id}/stairs', 200);
    expectConforms(await as(request(t.app).get(s)), 'GET', '/v1/projects/{id}/stairs/{stairId}', 200);
    expectConforms(await as(request(t.app).patch(s)).send({ name: 'Stair to the loft' }), 'PATCH', '/v1/projects/{id}/stairs/{stairId}', 200, { name: 'Stair to the loft' });
    const run = await as(request(t.app).post(`${s}/estimates`)).send({});
    expectConforms(run, 'POST', '/v1/projects/{id}/stairs/{stairId}/estimates', 201, {});
    expectConforms(await as(request(t.app).get(`${s}/estimates`)), 'GET', '/v1/projects/{id}/stairs/{stairId}/estimates', 200);
    expectConforms(await as(request(t.app).get(`/v1/estimates/${run.body.id}`)), 'GET', '/v1/estimates/{estimateId}', 200);
    expectConforms(await as(request(t.app).post(`/v1/estimates/${run.body.id}/rerun`)).send({}), 'POST', '/v1/estimates/{estimateId}/rerun', 201, {});
    expectConforms(await as(request(t.app).post('/v1/projects')).send({ name: '' }), 'POST', '/v1/projects', 400);
    expectConforms(await as(request(t.app).get('/v1/estimates/00000000-0000-4000-8000-000000000000')), 'GET', '/v1/estimates/{estimateId}', 404);
    expectConforms(await request(t.app).get('/v1/projects').set(bearer(server)), 'GET', '/v1/projects', 403);
    // Deletions answer 204 without a body, as documented.
    expect((await as(request(t.app).delete(s))).status).toBe(204);
    expect((await as(request(t.app).delete(p))).status).toBe(204);
  });

  it('members, invitations, usage, audit, organisations and the session', async () => {
    expectConforms(await request(t.app).get('/v1/members').set(bearer(admin)), 'GET', '/v1/members', 200);
    expectConforms(await request(t.app).post('/v1/members/invitations').set(bearer(admin)).send({ email: 'ines@conformance.test', role: 'viewer' }), 'POST', '/v1/members/invitations', 201);
    expectConforms(await request(t.app).get('/v1/usage').set(bearer(server)), 'GET', '/v1/usage', 200);
    expectConforms(await request(t.app).get('/v1/usage?from=2026-11-01&to=2026-11-30').set(bearer(admin)), 'GET', '/v1/usage', 200);
    expectConforms(await request(t.app).get('/v1/audit-events').set(bearer(admin)), 'GET', '/v1/audit-events', 200);
    expectConforms(await request(t.app).get('/v1/organizations').set(bearer(ops)), 'GET', '/v1/organizations', 200);
    expectConforms(await request(t.app).get('/v1/auth/me').set(bearer(admin)), 'GET', '/v1/auth/me', 200);
    const credentials = { email: memberEmail, password: TEST_PASSWORD };
    expectConforms(await request(t.app).post('/v1/auth/sign-in').send(credentials), 'POST', '/v1/auth/sign-in', 200, credentials);
    expectConforms(await request(t.app).get('/v1/health'), 'GET', '/v1/health', 200);
  });

  it('accepting invitations: a new account, and an existing one confirmed by its own password', async () => {
    const invite = (email: string) => request(t.app).post('/v1/members/invitations').set(bearer(admin)).send({ email, role: 'estimator' }).expect(201);
    const accept = (body: object) => request(t.app).post('/v1/auth/invitations/accept').send(body);
    await invite('newcomer@conformance.test');
    const fresh = { token: await invitationToken('newcomer@conformance.test'), name: 'Newcomer', password: 'a-long-passphrase' };
    expectConforms(await accept(fresh), 'POST', '/v1/auth/invitations/accept', 200, fresh);

    const elsewhere = await createOrganization(t, 'conformance-other');
    const existing = (await createMember(t.app, elsewhere.id, 'viewer')).email;
    await invite(existing);
    const token = await invitationToken(existing);
    // The password is needed for an existing account (it was once documented as ignored there).
    expectConforms(await accept({ token }), 'POST', '/v1/auth/invitations/accept', 400);
    expectConforms(await accept({ token, password: 'not-the-right-password' }), 'POST', '/v1/auth/invitations/accept', 401);
    const confirmed = { token, password: TEST_PASSWORD };
    expectConforms(await accept(confirmed), 'POST', '/v1/auth/invitations/accept', 200, confirmed);
  });

  it('problem answers', async () => {
    // 400: bad input, an unknown field, a bad query
    expectConforms(await request(t.app).post('/v1/estimates').set(bearer(server)).send({ layout: 'tread-strips' }), 'POST', '/v1/estimates', 400);
    expectConforms(await request(t.app).post('/v1/calculations/cable').set(bearer(server)).send({ supplyVoltageV: 24, currentA: 2, lengthM: 5, maxDrop: 3 }), 'POST', '/v1/calculations/cable', 400);
    expectConforms(await request(t.app).get('/v1/keys?limit=0').set(bearer(admin)), 'GET', '/v1/keys', 400);
    expectConforms(await request(t.app).get('/v1/audit-events?action=nope').set(bearer(admin)), 'GET', '/v1/audit-events', 400);
    // 401 and 403: no credential, a key without the scope
    expectConforms(await request(t.app).post('/v1/calculations/reels').send({ piecesMm: [100] }), 'POST', '/v1/calculations/reels', 401);
    expectConforms(await request(t.app).get('/v1/keys').set(bearer(server)), 'GET', '/v1/keys', 403);
    // 404: another organisation's or no such key
    expectConforms(await request(t.app).get('/v1/keys/00000000-0000-4000-8000-000000000000').set(bearer(admin)), 'GET', '/v1/keys/{id}', 404);
    // 401 on accepting an invitation: an unknown token with a wrong-looking body is a 400, the documented one
    expectConforms(await request(t.app).post('/v1/auth/invitations/accept').send({ token: 'not-a-token', name: 'Ines', password: 'a-long-passphrase' }), 'POST', '/v1/auth/invitations/accept', 400);
  });
});
