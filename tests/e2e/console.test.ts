/// <reference lib="dom" />
/// <reference lib="dom.iterable" />
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { chromium, type BrowserContext } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { signIn } from './console-session.js';
import { startServerProcess, type ServerProcess } from './server-process.js';

const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
const SCREENSHOTS = path.resolve('tests/e2e/screenshots'); // git-ignored

const dataDir = mkdtempSync(path.join(tmpdir(), 'treadwise-e2e-'));
const profileDir = mkdtempSync(path.join(tmpdir(), 'treadwise-chromium-'));
let server: ServerProcess;
let browser: BrowserContext;
const foreignRequests: string[] = [];

beforeAll(async () => {
  server = await startServerProcess({ DATA_DIR: dataDir });
  browser = await chromium.launchPersistentContext(profileDir, {
    executablePath: CHROMIUM,
    headless: true,
    viewport: { width: 1280, height: 800 },
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
  browser.on('request', (req) => {
    if (!req.url().startsWith(server.url) && !req.url().startsWith('data:')) foreignRequests.push(req.url());
  });
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
  rmSync(dataDir, { recursive: true, force: true });
  rmSync(profileDir, { recursive: true, force: true });
});

describe('the console in Chromium', () => {
  it('shows the API and the database as healthy on the status page, in Fira Sans', async () => {
    const page = await browser.newPage();
    await page.goto(server.url, { waitUntil: 'networkidle' });
    await signIn(page, 'theo@harborlane.test'); // demo-scenario.md: Harbor Lane's estimator

    await expect.poll(() => page.locator('[data-testid="api-status"]').innerText(), { timeout: 15_000 }).toContain('Healthy');
    await expect.poll(() => page.locator('[data-testid="db-status"]').innerText(), { timeout: 15_000 }).toContain('Healthy');
    expect(await page.locator('mat-toolbar').innerText()).toContain('Treadwise');

    const font = await page.evaluate(async () => {
      await document.fonts.ready;
      const faces = [...document.fonts].filter((f) => f.family.replace(/["']/g, '') === 'Fira Sans');
      return {
        bundledFaceLoaded: faces.some((f) => f.status === 'loaded'),
        check: document.fonts.check('16px "Fira Sans"'),
        bodyFamily: getComputedStyle(document.body).fontFamily,
      };
    });
    expect(font.bundledFaceLoaded).toBe(true);
    expect(font.check).toBe(true);
    expect(font.bodyFamily).toContain('Fira Sans');

    mkdirSync(SCREENSHOTS, { recursive: true });
    await page.screenshot({ path: path.join(SCREENSHOTS, 'status.png'), fullPage: true });
    await page.close();
  });

  it('serves a deep link through the SPA fallback, still signed in after a reload', async () => {
    const page = await browser.newPage();
    const res = await page.goto(`${server.url}/status`, { waitUntil: 'networkidle' });
    expect(res?.status()).toBe(200);
    // The profile kept the refresh token of the sign-in above; the new page restores the session from it.
    await expect.poll(() => page.locator('[data-testid="api-status"]').innerText(), { timeout: 15_000 }).toContain('Healthy');
    await page.close();
  });

  it('opens the API docs from local assets', async () => {
    const page = await browser.newPage();
    await page.goto(`${server.url}/docs/`, { waitUntil: 'networkidle' });
    await expect.poll(() => page.locator('.swagger-ui .title').first().innerText(), { timeout: 15_000 }).toContain('Treadwise API');
    await page.screenshot({ path: path.join(SCREENSHOTS, 'docs.png') });
    await page.close();
  });

  it('loaded nothing from the internet', () => {
    expect(foreignRequests).toEqual([]);
  });
});
