import { createHash } from 'node:crypto';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { EmbedManifest } from '../../api/embed/bundle.js';
import { anotherInstance, closeTraffic } from '../support/app-instance.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

// A stand-in for the built element: the routes serve whatever `npm run build:embed` wrote.
const dir = mkdtempSync(path.join(tmpdir(), 'treadwise-embed-'));
const script = Buffer.from(`(()=>{/* ${'estimator '.repeat(200)} */})();\n`);
const integrity = `sha384-${createHash('sha384').update(script).digest('base64')}`;
const manifest: EmbedManifest = { version: '0.1.0-abc123def456', integrity, url: '/embed/v1/0.1.0-abc123def456/treadwise-estimator.js', bytes: script.length, gzipBytes: 100 };
writeFileSync(path.join(dir, 'treadwise-estimator.js'), script);
writeFileSync(path.join(dir, 'manifest.json'), JSON.stringify(manifest));

let t: TestApp;
let unbuilt: TestApp;
beforeAll(async () => {
  t = await createTestApp({ EMBED_DIR: dir });
  unbuilt = await createTestApp({ EMBED_DIR: path.join(dir, 'missing') });
});
afterAll(async () => {
  await t.close();
  await unbuilt.close();
  rmSync(dir, { recursive: true, force: true });
});

/** The body as bytes (supertest would otherwise drop a JavaScript body). */
function asBytes(res: request.Response, done: (err: Error | null, body: Buffer) => void) {
  const stream = res as unknown as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  stream.on('data', (c: Buffer) => chunks.push(c));
  stream.on('end', () => done(null, Buffer.concat(chunks)));
}

/** A shop's page loads the script cross-origin and checks it with SRI (a CORS fetch). */
function expectOpenToShops(res: request.Response) {
  expect(res.headers['cross-origin-resource-policy']).toBe('cross-origin');
  expect(res.headers['access-control-allow-origin']).toBe('*');
}

describe('the estimator script', () => {
  it('is served at the moving name with a short cache, open to every shop page', async () => {
    const res = await request(t.app).get('/embed/v1/treadwise-estimator.js').set('Origin', 'https://shop.harborlane.test').buffer(true).parse(asBytes);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('text/javascript; charset=utf-8');
    expect(res.headers['cache-control']).toBe('public, max-age=300, must-revalidate');
    expectOpenToShops(res);
    expect(Buffer.compare(res.body as Buffer, script)).toBe(0);
  });

  it('is served immutable under its version, and its bytes match the published SRI hash', async () => {
    const res = await request(t.app).get(manifest.url).buffer(true).parse(asBytes);
    expect(res.status).toBe(200);
    expect(res.headers['cache-control']).toBe('public, max-age=31536000, immutable');
    expectOpenToShops(res);
    expect(`sha384-${createHash('sha384').update(res.body as Buffer).digest('base64')}`).toBe(manifest.integrity);
  });

  it('publishes its version, path and SRI hash in the manifest', async () => {
    const res = await request(t.app).get('/embed/v1/manifest.json').expect(200);
    expect(res.body).toEqual(manifest);
    expectOpenToShops(res);
  });

  it('answers 304 to a browser that holds the current version', async () => {
    const first = await request(t.app).get('/embed/v1/treadwise-estimator.js').expect(200);
    await request(t.app).get('/embed/v1/treadwise-estimator.js').set('If-None-Match', first.headers['etag']!).expect(304);
  });

  it('is a 404 problem for another version, an unknown file, or when not built', async () => {
    const other = await request(t.app).get('/embed/v1/0.0.9-000000000000/treadwise-estimator.js').expect(404);
    expect(other.headers['content-type']).toContain('application/problem+json');
    expect(other.body.detail).toContain('0.1.0-abc123def456');
    await request(t.app).get('/embed/v1/other.js').expect(404);
    const missing = await request(unbuilt.app).get('/embed/v1/treadwise-estimator.js').expect(404);
    expect(missing.body.code).toBe('not_found');
  });

  it('keeps serving an earlier release’s versioned URL, byte for byte, after a new build is deployed', async () => {
    const nextDir = mkdtempSync(path.join(tmpdir(), 'treadwise-embed-next-'));
    const next = Buffer.from(`(()=>{/* ${'next release '.repeat(100)} */})();\n`);
    const nextManifest: EmbedManifest = { ...manifest, version: '0.2.0-fedcba987654', url: '/embed/v1/0.2.0-fedcba987654/treadwise-estimator.js', bytes: next.length };
    writeFileSync(path.join(nextDir, 'treadwise-estimator.js'), next);
    writeFileSync(path.join(nextDir, 'manifest.json'), JSON.stringify(nextManifest));
    const upgraded = anotherInstance(t, { EMBED_DIR: nextDir });
    try {
      // The earlier release stored its script when it started (asynchronously, so wait for it).
      await expect.poll(async () => (await request(upgraded).get(manifest.url)).status, { timeout: 5000, interval: 50 }).toBe(200);
      const old = await request(upgraded).get(manifest.url).buffer(true).parse(asBytes).expect(200);
      expect(old.headers['cache-control']).toBe('public, max-age=31536000, immutable');
      expectOpenToShops(old);
      // The shop's pinned integrity attribute still matches.
      expect(`sha384-${createHash('sha384').update(old.body as Buffer).digest('base64')}`).toBe(manifest.integrity);
      const moving = await request(upgraded).get('/embed/v1/treadwise-estimator.js').buffer(true).parse(asBytes).expect(200);
      expect(Buffer.compare(moving.body as Buffer, next)).toBe(0);
      await request(upgraded).get('/embed/v1/0.0.1-never/treadwise-estimator.js').expect(404);
    } finally {
      await closeTraffic(upgraded);
      rmSync(nextDir, { recursive: true, force: true });
    }
  });

  it('keeps helmet’s same-origin policy everywhere else', async () => {
    const res = await request(t.app).get('/v1/health').expect(200);
    expect(res.headers['cross-origin-resource-policy']).toBe('same-origin');
    expect(res.headers['access-control-allow-origin']).toBeUndefined();
  });
});
