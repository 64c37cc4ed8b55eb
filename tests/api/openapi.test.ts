import { readFileSync } from 'node:fs';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openApiDocument } from '../../api/openapi/spec.js';
import { mountedRoutes } from '../support/mounted-routes.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

// Served by the docs router itself, or the console: not part of the API surface.
const NOT_DOCUMENTED = new Set(['GET /openapi.json', 'GET /docs', 'GET /{*splat}']);

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => t.close());

describe('the OpenAPI document', () => {
  it('is committed and up to date (run `npm run openapi` after changing a route or schema)', () => {
    const committed = JSON.parse(readFileSync(new URL('../../openapi/openapi.json', import.meta.url), 'utf8'));
    expect(committed).toEqual(JSON.parse(JSON.stringify(openApiDocument())));
  });

  it('documents every mounted route', () => {
    const documented = new Set(
      Object.entries(openApiDocument().paths ?? {}).flatMap(([path, item]) =>
        Object.keys(item as object).map((method) => `${method.toUpperCase()} ${path}`),
      ),
    );
    const mounted = mountedRoutes(t.app).filter((r) => !NOT_DOCUMENTED.has(r));
    expect(mounted.length).toBeGreaterThan(0);
    expect(mounted.filter((r) => !documented.has(r))).toEqual([]);
  });

  it('documents no route that is not mounted', () => {
    const mounted = new Set(mountedRoutes(t.app));
    const documented = Object.entries(openApiDocument().paths ?? {}).flatMap(([path, item]) =>
      Object.keys(item as object).map((method) => `${method.toUpperCase()} ${path}`),
    );
    expect(documented.filter((r) => !mounted.has(r))).toEqual([]);
  });

  it('is served at /openapi.json as OpenAPI 3.1 with a summary and description on every operation', async () => {
    const res = await request(t.app).get('/openapi.json').expect(200);
    expect(res.body.openapi).toBe('3.1.0');
    for (const [path, item] of Object.entries(res.body.paths as Record<string, Record<string, { summary?: string; description?: string }>>)) {
      for (const [method, op] of Object.entries(item)) {
        expect(op.summary, `${method} ${path}`).toBeTruthy();
        expect(op.description, `${method} ${path}`).toBeTruthy();
      }
    }
  });

  it('serves Swagger UI at /docs from local assets', async () => {
    const page = await request(t.app).get('/docs/').expect(200);
    expect(page.text).toContain('swagger-ui');
    expect(page.text).not.toMatch(/https?:\/\/(cdn|unpkg)/);
    await request(t.app).get('/docs/swagger-ui-bundle.js').expect(200);
  });
});
