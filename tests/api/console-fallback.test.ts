import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeTraffic } from '../support/app-instance.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

// A console build in miniature: the page and one of its bundles.
const consoleDir = mkdtempSync(path.join(tmpdir(), 'treadwise-console-'));
writeFileSync(path.join(consoleDir, 'index.html'), '<!doctype html><title>Treadwise</title><app-root></app-root>');
writeFileSync(path.join(consoleDir, 'main-3f9a.js'), 'console.log("treadwise");');

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ CONSOLE_DIR: consoleDir });
});
afterAll(async () => {
  await closeTraffic(t.app);
  await t.close();
  rmSync(consoleDir, { recursive: true, force: true });
});

const browser = (p: string) => request(t.app).get(p).set('Accept', 'text/html,*/*;q=0.8');

describe('the console and its files', () => {
  it('serves real files and the page for deep links', async () => {
    const js = await browser('/main-3f9a.js').expect(200);
    expect(js.headers['content-type']).toMatch(/javascript/);
    for (const deepLink of ['/', '/status', '/status/whatever/deep']) {
      const page = await browser(deepLink).expect(200);
      expect(page.text).toContain('<app-root>');
    }
  });

  it('answers 404 problem+json, not the page, for a file that does not exist', async () => {
    for (const missing of ['/x.js', '/foo.css', '/assets/logo.png', '/main-3f9a.js.map', '/favicon.ico', '/.env']) {
      const res = await browser(missing);
      expect(res.status, missing).toBe(404);
      expect(res.headers['content-type'], missing).toMatch(/^application\/problem\+json/);
      expect(res.text, missing).not.toContain('<app-root>');
    }
  });
});
