import type { Server } from 'node:http';
import fc from 'fast-check';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { z } from 'zod';
import { validateBody, validateQuery } from '../../api/middleware/validate.js';
import { HttpProblem } from '../../api/problem.js';
import {
  acceptInvitationRequestSchema,
  createInvitationRequestSchema,
  createOrganizationRequestSchema,
  passwordResetConfirmSchema,
  passwordResetRequestSchema,
  refreshRequestSchema,
  signInRequestSchema,
  switchOrganizationRequestSchema,
  updateMemberRequestSchema,
  updateOrganizationRequestSchema,
} from '../../shared/schemas/accounts.js';
import { createApiKeyRequestSchema, rotateApiKeyRequestSchema } from '../../shared/schemas/api-keys.js';
import { cableRequestSchema } from '../../shared/schemas/cable.js';
import { driverRequestSchema } from '../../shared/schemas/driver.js';
import { estimateRequestSchema } from '../../shared/schemas/estimate.js';
import { estimateBatchRequestSchema } from '../../shared/schemas/estimate-batch.js';
import { catalogImportQuerySchema, catalogItemQuerySchema, patchCatalogItemSchema, patchCatalogSchema, storedCatalogItemSchema } from '../../shared/schemas/catalog-store.js';
import { estimateExamples, harborLaneCatalog } from '../../shared/schemas/estimate-examples.js';
import { alderRowKitOptions, harborLaneKitOptions, kitOptionsRequestSchema } from '../../shared/schemas/estimate-options.js';
import { pageQuerySchema } from '../../shared/schemas/page.js';
import { createProjectSchema, createStairSchema, patchProjectSchema, patchStairSchema, runStairSchema } from '../../shared/schemas/projects.js';
import { pixelsRequestSchema } from '../../shared/schemas/pixels.js';
import { reelsRequestSchema } from '../../shared/schemas/reels.js';
import { usageQuerySchema } from '../../shared/schemas/usage.js';
import { voltageDropRequestSchema } from '../../shared/schemas/voltage-drop.js';
import { bearer, createMember, signIn } from '../support/accounts.js';
import { createKey } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';
import { organizations } from '../../api/db/schema.js';

// Malformed input must never be a server error: every refusal is a 4xx problem+json naming what
// is wrong. At least 10 000 malformed inputs per run: most straight through the validator
// middleware (cheap), a few thousand through HTTP on one in-memory app. Fixed seeds keep a run
// reproducible; a failure prints the counterexample.

const DIRECT_RUNS_PER_SCHEMA = 450; // × 27 schemas = 12 150
const HTTP_RUNS = 2_000;
let inputsSent = 0;

// ---- malformed values ---------------------------------------------------------------------------

const hugeOrOdd = fc.constantFrom(0, -0, -1, 1e308, -1e308, 5e-324, Number.MAX_SAFE_INTEGER + 2, Infinity, -Infinity, NaN, 2 ** 31, -(2 ** 53));
const oddString = fc.oneof(
  fc.constantFrom('', ' ', 'NaN', 'Infinity', '-1', '1e999', '0x10', 'null', 'true', '\u0000', '\u202e', '💡🪜', 'é'.normalize('NFD'), '__proto__'),
  fc.string({ unit: 'grapheme', maxLength: 40 }),
  fc.string({ unit: 'binary', maxLength: 40 }),
  fc.integer({ min: 1_000, max: 20_000 }).map((n) => 'x'.repeat(n)),
);
const oddKey = fc.oneof(fc.constantFrom('__proto__', 'constructor', 'prototype', '', ' ', 'toString', 'maxDropPercnt', 'treadz', '💡'), fc.string({ maxLength: 12 }));
/** Arrays or objects nested 20–400 deep. */
const deep = fc.tuple(fc.integer({ min: 20, max: 400 }), fc.boolean()).map(([depth, arrays]) => {
  let v: unknown = 1;
  for (let i = 0; i < depth; i++) v = arrays ? [v] : { a: v };
  return v;
});
const oddValue: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 3, arbitrary: hugeOrOdd },
  { weight: 3, arbitrary: oddString },
  { weight: 1, arbitrary: fc.constantFrom(null, true, false, [], {}) },
  { weight: 1, arbitrary: deep },
  { weight: 2, arbitrary: fc.jsonValue({ maxDepth: 3 }) },
  { weight: 1, arbitrary: fc.array(hugeOrOdd, { maxLength: 2_000 }) },
);

type Json = unknown;
/** Paths of every value inside a seed (objects and arrays too), the root included. */
function pathsOf(value: Json, path: (string | number)[] = [], out: (string | number)[][] = []): (string | number)[][] {
  out.push(path);
  if (Array.isArray(value)) value.forEach((v, i) => pathsOf(v, [...path, i], out));
  else if (value !== null && typeof value === 'object') for (const [k, v] of Object.entries(value)) pathsOf(v, [...path, k], out);
  return out;
}

type Mutation = { kind: 'replace' | 'delete' | 'add'; pick: number; key: string; value: unknown };
const mutation: fc.Arbitrary<Mutation> = fc.record({ kind: fc.constantFrom('replace', 'delete', 'add'), pick: fc.nat(), key: oddKey, value: oddValue });

/** The seed with 1–4 changes at random places: a value replaced, a field dropped or one added. */
function mutate(seed: Json, mutations: Mutation[]): Json {
  let body = structuredClone(seed);
  for (const generated of mutations) {
    // A copy: constants such as `{}` are shared between runs and must not grow into cycles.
    const m = { ...generated, value: structuredClone(generated.value) };
    const paths = pathsOf(body);
    const path = paths[m.pick % paths.length]!;
    if (path.length === 0) {
      if (m.kind === 'replace') body = m.value;
      else if (m.kind === 'add' && body !== null && typeof body === 'object' && !Array.isArray(body)) define(body as Record<string, unknown>, m.key, m.value);
      continue;
    }
    const parent = path.slice(0, -1).reduce<any>((v, k) => v[k], body);
    const last = path[path.length - 1]!;
    if (m.kind === 'replace') parent[last] = m.value;
    else if (m.kind === 'delete') Array.isArray(parent) ? parent.splice(Number(last), 1) : delete parent[last];
    else {
      const target = parent[last];
      if (target !== null && typeof target === 'object' && !Array.isArray(target)) define(target, m.key, m.value);
      else parent[last] = m.value;
    }
  }
  return body;
}
/** As JSON.parse does: `__proto__` becomes an own property, never the prototype. */
function define(target: Record<string, unknown>, key: string, value: unknown) {
  Object.defineProperty(target, key, { value, enumerable: true, writable: true, configurable: true });
}

/** Malformed bodies for one schema: its seeds mutated, or anything at all. */
function malformed(seeds: Json[]): fc.Arbitrary<Json> {
  return fc.oneof(
    { weight: 6, arbitrary: fc.tuple(fc.constantFrom(...seeds), fc.array(mutation, { minLength: 1, maxLength: 4 })).map(([seed, ms]) => mutate(seed, ms)) },
    { weight: 1, arbitrary: oddValue },
    { weight: 1, arbitrary: fc.dictionary(oddKey, oddValue, { maxKeys: 6 }) },
  );
}

// ---- the request schemas ------------------------------------------------------------------------

const seedOf = (schema: z.ZodType) => (schema.meta() as { example?: unknown } | undefined)?.example;
const bodySchemas: { name: string; schema: z.ZodType; seeds: Json[] }[] = [
  { name: 'voltage-drop', schema: voltageDropRequestSchema, seeds: [seedOf(voltageDropRequestSchema), { supplyVoltageV: 12, currentA: 3, lengthM: 8, conductor: { awg: 18 }, loadDistribution: 'uniform' }] },
  { name: 'cable', schema: cableRequestSchema, seeds: [seedOf(cableRequestSchema), { supplyVoltageV: 12, currentA: 40, lengthM: 30, conductorTable: 'awg-solid' }] },
  { name: 'driver', schema: driverRequestSchema, seeds: [{ loadW: 140, outputVoltageV: 24, availableRatingsW: [60, 100, 150], class2: true, efficiencyPercent: 90 }] },
  { name: 'pixels', schema: pixelsRequestSchema, seeds: [{ pixels: 1080, protocol: 'one-wire-800k', bitsPerPixel: 32 }, { pixels: 300, protocol: 'clocked', clockHz: 2_000_000 }] },
  { name: 'reels', schema: reelsRequestSchema, seeds: [{ piecesMm: [850, 850, 1200, 400], reelLengthMm: 5000, cutPitchMm: 50 }] },
  { name: 'estimate', schema: estimateRequestSchema, seeds: Object.values(estimateExamples) },
  { name: 'kit-options', schema: kitOptionsRequestSchema, seeds: [harborLaneKitOptions, alderRowKitOptions] },
  {
    name: 'estimate-batch',
    schema: estimateBatchRequestSchema,
    seeds: [seedOf(estimateBatchRequestSchema), { items: Object.values(estimateExamples).map((request, i) => ({ ref: `Stair ${i + 1}`, request })) }],
  },
  { name: 'sign-in', schema: signInRequestSchema, seeds: [seedOf(signInRequestSchema)] },
  { name: 'refresh', schema: refreshRequestSchema, seeds: [seedOf(refreshRequestSchema)] },
  { name: 'switch-organization', schema: switchOrganizationRequestSchema, seeds: [{ organization: 'harbor-lane' }] },
  { name: 'password-reset', schema: passwordResetRequestSchema, seeds: [seedOf(passwordResetRequestSchema)] },
  { name: 'password-reset-confirm', schema: passwordResetConfirmSchema, seeds: [seedOf(passwordResetConfirmSchema)] },
  { name: 'invitation', schema: createInvitationRequestSchema, seeds: [seedOf(createInvitationRequestSchema)] },
  { name: 'accept-invitation', schema: acceptInvitationRequestSchema, seeds: [seedOf(acceptInvitationRequestSchema)] },
  { name: 'update-member', schema: updateMemberRequestSchema, seeds: [seedOf(updateMemberRequestSchema)] },
  { name: 'create-organization', schema: createOrganizationRequestSchema, seeds: [seedOf(createOrganizationRequestSchema)] },
  { name: 'update-organization', schema: updateOrganizationRequestSchema, seeds: [seedOf(updateOrganizationRequestSchema)] },
  { name: 'create-key', schema: createApiKeyRequestSchema, seeds: [seedOf(createApiKeyRequestSchema), { name: 'Server', scopes: ['sizing:run', 'usage:read'], expiresAt: '2027-01-01T00:00:00Z' }] },
  { name: 'rotate-key', schema: rotateApiKeyRequestSchema, seeds: [{ overlapHours: 2 }] },
  { name: 'catalog-item', schema: storedCatalogItemSchema, seeds: harborLaneCatalog.items.map((item) => ({ ...item, active: true })) },
  { name: 'patch-catalog-item', schema: patchCatalogItemSchema, seeds: [{ unitPrice: 36, description: 'Driver 24 V', active: false }, { unitPrice: null }] },
  { name: 'patch-catalog', schema: patchCatalogSchema, seeds: [{ currency: 'EUR', taxRatePercent: 20 }] },
  { name: 'create-project', schema: createProjectSchema, seeds: [seedOf(createProjectSchema), { name: 'Quayside corridor', notes: 'Daylight cut-off at 40 lx.' }] },
  { name: 'patch-project', schema: patchProjectSchema, seeds: [{ name: 'Alder Row, house 8', clientName: null, siteAddress: '8 Alder Row', notes: null }] },
  { name: 'create-stair', schema: createStairSchema, seeds: Object.values(estimateExamples).map((input, i) => ({ name: `Stair ${i + 1}`, input })) },
  { name: 'patch-stair', schema: patchStairSchema, seeds: [{ name: 'Loft stair', notes: null, input: estimateExamples.alderRowCornerUnit }] },
  { name: 'run-stair', schema: runStairSchema, seeds: [{}] },
];
const querySchemas: { name: string; schema: z.ZodType; seeds: Json[] }[] = [
  { name: 'page', schema: pageQuerySchema, seeds: [{ limit: '20', cursor: 'eyJ4IjoxfQ' }] },
  { name: 'catalog-items', schema: catalogItemQuerySchema, seeds: [{ limit: '20', kind: 'driver', active: 'true' }] },
  { name: 'catalog-import', schema: catalogImportQuerySchema, seeds: [{ dryRun: 'true' }] },
  { name: 'usage', schema: usageQuerySchema, seeds: [{ from: '2026-11-01', to: '2026-11-30', keyId: 'h7kq2mzx4c5d', route: 'POST /v1/estimates' }] },
];

type Outcome = { error?: unknown; locals: Record<string, unknown> };
/** Runs a validator middleware as Express would, without HTTP. */
function runMiddleware(middleware: ReturnType<typeof validateBody>, req: object): Outcome {
  const res = { locals: {} as Record<string, unknown> };
  let outcome: Outcome | undefined;
  void middleware(req as never, res as never, (error?: unknown) => {
    outcome = { error, locals: res.locals };
  });
  if (!outcome) throw new Error('the validator neither passed nor refused');
  return outcome;
}

function expectRefusalOrPass(outcome: Outcome, key: 'body' | 'query') {
  if (outcome.error === undefined) {
    expect(outcome.locals[key]).toBeDefined();
    return;
  }
  expect(outcome.error).toBeInstanceOf(HttpProblem);
  const problem = outcome.error as HttpProblem;
  expect(problem.status).toBe(400);
  expect(problem.code).toBe('validation_failed');
  expect(problem.extra.errors?.length).toBeGreaterThan(0);
  expect(problem.extra.errors!.length).toBeLessThanOrEqual(20);
  for (const e of problem.extra.errors!) {
    expect(typeof e.path).toBe('string');
    expect(e.path.length).toBeGreaterThan(0);
  }
}

describe('the request schemas under malformed input', () => {
  for (const { name, schema, seeds } of bodySchemas) {
    it(`${name} body: refused with field errors or accepted, never a throw`, () => {
      for (const seed of seeds) expect(schema.safeParse(seed).success, `seed of ${name}`).toBe(true);
      const middleware = validateBody(schema);
      fc.assert(
        fc.property(malformed(seeds), (body) => {
          inputsSent++;
          expectRefusalOrPass(runMiddleware(middleware, { body }), 'body');
        }),
        { numRuns: DIRECT_RUNS_PER_SCHEMA, seed: 0x7e4d + name.length },
      );
    });
  }

  for (const { name, schema, seeds } of querySchemas) {
    it(`${name} query: refused with field errors or accepted, never a throw`, () => {
      const middleware = validateQuery(schema);
      // A query string is strings or arrays of strings (a repeated parameter).
      const queryValue = fc.oneof(oddString, fc.array(oddString, { maxLength: 3 }));
      const query = fc.oneof(
        fc.tuple(fc.constantFrom(...seeds), fc.dictionary(oddKey, queryValue, { maxKeys: 3 })).map(([seed, extra]) => ({ ...(seed as object), ...extra })),
        fc.dictionary(fc.constantFrom('limit', 'cursor', 'from', 'to', 'keyId', 'route'), queryValue),
      );
      fc.assert(
        fc.property(query, (q) => {
          inputsSent++;
          expectRefusalOrPass(runMiddleware(middleware, { query: q }), 'query');
        }),
        { numRuns: DIRECT_RUNS_PER_SCHEMA, seed: 0x51ce + name.length },
      );
    });
  }
});

// ---- through HTTP -------------------------------------------------------------------------------

let t: TestApp;
let server: Server;
let sizing: string;
let admin: string;

beforeAll(async () => {
  t = await createTestApp();
  // The partner plan's rate (3000 a minute) leaves room for every call of this file.
  const [org] = await t.database.db.insert(organizations).values({ slug: 'fuzz', name: 'Fuzz', planId: 'partner' }).returning();
  ({ token: sizing } = await createKey(t, org!.id, { scopes: ['sizing:run', 'usage:read', 'batches:write'] }));
  admin = (await signIn(t.app, (await createMember(t.app, org!.id, 'admin')).email)).accessToken;
  server = t.app.listen(0);
});
afterAll(async () => {
  await new Promise((resolve) => server.close(resolve));
  await t.close();
});

const routes: { method: 'post' | 'patch'; path: string; schema: string; token?: () => string }[] = [
  { method: 'post', path: '/v1/calculations/voltage-drop', schema: 'voltage-drop', token: () => sizing },
  { method: 'post', path: '/v1/calculations/cable', schema: 'cable', token: () => sizing },
  { method: 'post', path: '/v1/calculations/driver', schema: 'driver', token: () => sizing },
  { method: 'post', path: '/v1/calculations/pixels', schema: 'pixels', token: () => sizing },
  { method: 'post', path: '/v1/calculations/reels', schema: 'reels', token: () => sizing },
  { method: 'post', path: '/v1/estimates', schema: 'estimate', token: () => sizing },
  { method: 'post', path: '/v1/estimates', schema: 'estimate', token: () => sizing },
  { method: 'post', path: '/v1/estimates/options', schema: 'kit-options', token: () => sizing },
  { method: 'post', path: '/v1/estimates/batch', schema: 'estimate-batch', token: () => sizing },
  { method: 'post', path: '/v1/auth/sign-in', schema: 'sign-in' },
  { method: 'post', path: '/v1/auth/refresh', schema: 'refresh' },
  { method: 'post', path: '/v1/auth/invitations/accept', schema: 'accept-invitation' },
  { method: 'post', path: '/v1/members/invitations', schema: 'invitation', token: () => admin },
  { method: 'post', path: '/v1/keys', schema: 'create-key', token: () => admin },
  { method: 'post', path: '/v1/projects', schema: 'create-project', token: () => admin },
];

/** A body as raw JSON text, sometimes spelt the ways JSON.stringify never does. */
const rawJson = (body: unknown) =>
  fc.constantFrom('plain', 'big-exponent', 'broken').map((how) => {
    const text = JSON.stringify(body) ?? 'null';
    if (how === 'big-exponent') return text.replace(/(?<=[:[,])(\d+(\.\d+)?)(?=[,}\]])/, '1e999');
    if (how === 'broken') return text.slice(0, Math.max(1, text.length - 1));
    return text;
  });

describe('the routes under malformed input', () => {
  it('answer no 5xx, and every 4xx is problem+json with a code', async () => {
    const call = fc
      .tuple(fc.constantFrom(...routes), fc.nat())
      .chain(([route]) => malformed(bodySchemas.find((s) => s.name === route.schema)!.seeds).chain((body) => rawJson(body).map((text) => ({ route, text }))));
    const statuses = new Map<number, number>();
    await fc.assert(
      fc.asyncProperty(call, async ({ route, text }) => {
        inputsSent++;
        let req = request(server)[route.method](route.path).set('Content-Type', 'application/json');
        if (route.token) req = req.set(bearer(route.token()));
        const res = await req.send(text);
        statuses.set(res.status, (statuses.get(res.status) ?? 0) + 1);
        expect(res.status, `${route.path} ${text.slice(0, 300)}`).toBeLessThan(500);
        if (res.status >= 400) {
          expect(res.headers['content-type']).toContain('application/problem+json');
          expect(res.body.status).toBe(res.status);
          expect(res.body.code).toMatch(/^[a-z_]+$/);
        }
      }),
      { numRuns: HTTP_RUNS, seed: 0x3a11 },
    );
    // Most are refused as invalid input, not by a rate limit: the validator is what is tested.
    expect(statuses.get(400) ?? 0).toBeGreaterThan(HTTP_RUNS / 2);
  }, 120_000);

  it('sent at least 10 000 malformed inputs in all', () => {
    expect(inputsSent).toBeGreaterThanOrEqual(10_000);
  });
});
