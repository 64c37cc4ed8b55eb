import express from 'express';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { z } from 'zod';
import { errorHandler } from '../../api/middleware/error-handler.js';
import { validateBody, validateQuery } from '../../api/middleware/validate.js';
import { openApiDocument } from '../../api/openapi/spec.js';
import { alderRowTownhouse, harborLaneCheckout, quaysideCorridor } from '../../shared/schemas/estimate-examples.js';
import { bearer, createMember, createOperator, signIn } from '../support/accounts.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

// Unknown fields were once dropped silently: `maxDropPercnt: 1` ran with the default 5 % and
// `treadz` was ignored. Every request schema now refuses them with a 400 naming the field.
let t: TestApp;
let sizing: string;
let admin: string;
let ops: string;

beforeAll(async () => {
  t = await createTestApp();
  const org = await createOrganization(t, 'unknown-fields');
  ({ token: sizing } = await createKey(t, org.id, { scopes: ['sizing:run', 'usage:read'] }));
  admin = (await signIn(t.app, (await createMember(t.app, org.id, 'admin')).email)).accessToken;
  ops = (await signIn(t.app, (await createOperator(t.app)).email)).accessToken;
});
afterAll(() => t.close());

async function expectUnknown(res: request.Response, ...paths: string[]) {
  expect(res.status, JSON.stringify(res.body)).toBe(400);
  expect(res.headers['content-type']).toContain('application/problem+json');
  expect(res.body.code).toBe('validation_failed');
  const unknown = (res.body.errors as { path: string; message: string }[]).filter((e) => e.message === 'unknown field').map((e) => e.path);
  expect(unknown.sort()).toEqual([...paths].sort());
}

const estimate = (body: unknown) => request(t.app).post('/v1/estimates').set(bearer(sizing)).send(body as object);

describe('unknown fields in an estimate', () => {
  it('refuses a misspelt field in a nested block, naming its full path', async () => {
    await expectUnknown(await estimate({ ...alderRowTownhouse, cable: { maxDropPercnt: 1 } }), 'cable.maxDropPercnt');
    await expectUnknown(await estimate({ ...alderRowTownhouse, staircase: { ...alderRowTownhouse.staircase, treadz: 15 } }), 'staircase.treadz');
  });

  it('refuses unknown fields at the top, in flights, the controller profile, sensors and catalog items', async () => {
    await expectUnknown(await estimate({ ...alderRowTownhouse, colour: 'warm' }), 'colour');
    await expectUnknown(
      await estimate({ ...alderRowTownhouse, staircase: { ...alderRowTownhouse.staircase, treads: 14, flights: [{ treads: 7, landing: 900 }, { treads: 7 }] } }),
      'staircase.flights.0.landing',
    );
    await expectUnknown(
      await estimate({ ...alderRowTownhouse, controller: { profile: { ...alderRowTownhouse.controller.profile, output: 20 } } }),
      'controller.profile.output',
    );
    await expectUnknown(await estimate({ ...alderRowTownhouse, sensors: { motion: { ...alderRowTownhouse.sensors.motion, range: 5 } } }), 'sensors.motion.range');
    const items = harborLaneCheckout.catalog.items.map((item, i) => (i === 1 ? { ...item, colour: 'white' } : item));
    await expectUnknown(await estimate({ ...harborLaneCheckout, catalog: { ...harborLaneCheckout.catalog, items } }), 'catalog.items.1.colour');
    await expectUnknown(await estimate({ ...quaysideCorridor, railPixels: { ...quaysideCorridor.railPixels, pixelPerM: 30 } }), 'railPixels.pixelPerM');
  });

  it('refuses a block the layout does not use', async () => {
    await expectUnknown(await estimate({ ...alderRowTownhouse, railPixels: quaysideCorridor.railPixels }), 'railPixels');
  });

  it('lists every unknown key of one object', async () => {
    await expectUnknown(await estimate({ ...alderRowTownhouse, cable: { maxDropPercnt: 1, tempC: 30 } }), 'cable.maxDropPercnt', 'cable.tempC');
  });

  it('still sizes the same body without the typo', async () => {
    await estimate({ ...alderRowTownhouse, cable: { maxDropPercent: 1 } }).expect(200);
  });
});

describe('unknown fields elsewhere', () => {
  it('calculations', async () => {
    const calc = (path: string, body: object) => request(t.app).post(`/v1/calculations/${path}`).set(bearer(sizing)).send(body);
    await expectUnknown(await calc('voltage-drop', { supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 }, maxDropPercnt: 1 }), 'maxDropPercnt');
    await expectUnknown(await calc('voltage-drop', { supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75, cores: 2 } }), 'conductor.cores');
    await expectUnknown(await calc('cable', { supplyVoltageV: 24, currentA: 2, lengthM: 10, maxDrop: 3 }), 'maxDrop');
    await expectUnknown(await calc('driver', { loadW: 100, outputVoltageV: 24, loading: 80 }), 'loading');
    await expectUnknown(await calc('pixels', { pixels: 300, protocol: 'one-wire-800k', bpp: 32 }), 'bpp');
    await expectUnknown(await calc('reels', { piecesMm: [850, 850], note: 'x' }), 'note');
    // An empty key is named too (found by the fuzz test: it once gave a blank path).
    await expectUnknown(await calc('reels', { piecesMm: [850, 850], '': 1 }), '""');
  });

  it('keys, members, organisations and auth', async () => {
    await expectUnknown(await request(t.app).post('/v1/keys').set(bearer(admin)).send({ name: 'Shop', scope: ['sizing:run'] }), 'scope');
    await expectUnknown(await request(t.app).post('/v1/members/invitations').set(bearer(admin)).send({ email: 'ines@members.test', role: 'viewer', admin: true }), 'admin');
    await expectUnknown(await request(t.app).post('/v1/organizations').set(bearer(ops)).send({ slug: 'typo-org', name: 'Typo', plan: 'free' }), 'plan');
    await expectUnknown(await request(t.app).post('/v1/auth/sign-in').send({ email: 'a@b.test', password: 'whatever-pass', remember: true }), 'remember');
    await expectUnknown(await request(t.app).post('/v1/auth/invitations/accept').send({ token: 'abc', passwd: 'a-long-passphrase' }), 'passwd');
  });

  it('query strings', async () => {
    await expectUnknown(await request(t.app).get('/v1/keys?limit=5&sort=name').set(bearer(admin)), 'sort');
    await expectUnknown(await request(t.app).get('/v1/usage?form=2026-11-01').set(bearer(sizing)), 'form');
    await request(t.app).get('/v1/keys?limit=5').set(bearer(admin)).expect(200);
  });
});

describe('the safety net', () => {
  // A schema that forgets strictness (a plain z.object drops unknown keys) must still not run
  // with a silently dropped field: validateBody compares the input's keys with the parsed value's.
  const loose = z.object({ lengthM: z.number(), options: z.object({ maxDropPercent: z.number().default(5) }).optional() });
  const app = express();
  app.use(express.json());
  app.post('/loose', validateBody(loose), (_req, res) => {
    res.json(res.locals.body);
  });
  app.get('/loose', validateQuery(z.object({ limit: z.coerce.number().optional() })), (_req, res) => {
    res.json(res.locals.query);
  });
  app.use(errorHandler);

  it('refuses keys a loose schema would drop, naming their paths', async () => {
    await expectUnknown(await request(app).post('/loose').send({ lengthM: 2, options: { maxDropPercnt: 1 }, extra: 1 }), 'options.maxDropPercnt', 'extra');
    await expectUnknown(await request(app).get('/loose?limit=2&limt=3'), 'limt');
  });

  it('keeps defaults the schema adds', async () => {
    const res = await request(app).post('/loose').send({ lengthM: 2, options: {} }).expect(200);
    expect(res.body).toEqual({ lengthM: 2, options: { maxDropPercent: 5 } });
  });
});

describe('the OpenAPI document', () => {
  type Schema = Record<string, unknown>;
  const doc = openApiDocument() as unknown as { paths: Record<string, Record<string, { requestBody?: { content: Record<string, { schema: Schema }> } }>>; components: { schemas: Record<string, Schema> } };

  /** Object schemas reachable from a request body that allow properties they do not name. */
  function openObjects(schema: Schema, where: string, seen = new Set<string>(), found: string[] = []): string[] {
    const ref = schema.$ref as string | undefined;
    if (ref) {
      const name = ref.split('/').pop()!;
      if (!seen.has(name)) {
        seen.add(name);
        openObjects(doc.components.schemas[name]!, name, seen, found);
      }
      return found;
    }
    if (schema.type === 'object' && schema.properties && schema.additionalProperties !== false) found.push(where);
    for (const [k, v] of Object.entries((schema.properties as Record<string, Schema> | undefined) ?? {})) openObjects(v, `${where}.${k}`, seen, found);
    for (const key of ['oneOf', 'anyOf', 'allOf'] as const) ((schema[key] as Schema[] | undefined) ?? []).forEach((s, i) => openObjects(s, `${where}.${key}[${i}]`, seen, found));
    if (schema.items && typeof schema.items === 'object') openObjects(schema.items as Schema, `${where}[]`, seen, found);
    return found;
  }

  it('shows additionalProperties: false on every object of every request body', () => {
    const bodies = Object.entries(doc.paths).flatMap(([p, item]) =>
      Object.entries(item).flatMap(([method, op]) => Object.values(op.requestBody?.content ?? {}).map((c) => ({ where: `${method.toUpperCase()} ${p}`, schema: c.schema }))),
    );
    expect(bodies.length).toBeGreaterThan(15);
    // The one planned exception (see api/middleware/validate.ts): the payment provider's events come as
    // the provider sends them, verified by signature, not by our schema.
    const ours = bodies.filter((b) => b.where !== 'POST /v1/billing/webhook');
    expect(ours.length).toBe(bodies.length - 1);
    expect(ours.flatMap((b) => openObjects(b.schema, b.where))).toEqual([]);
  });
});
