/// <reference lib="dom" />
import { mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD, signIn } from './console-session.js';
import { startServerProcess, type ServerProcess } from './server-process.js';

const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
const SCREENSHOTS = path.resolve('tests/e2e/screenshots'); // git-ignored
const DEMO_PROJECT = 'Saltmarsh Cottage staircase'; // api/db/demo-data.ts

const dataDir = mkdtempSync(path.join(tmpdir(), 'treadwise-e2e-projects-'));
let server: ServerProcess;
const contexts: BrowserContext[] = [];
const profileDirs: string[] = [];

/** A fresh browser profile per user, so one user's stored sign-in never leaks into another's test. */
async function freshPage(width = 1280): Promise<Page> {
  const profileDir = mkdtempSync(path.join(tmpdir(), 'treadwise-chromium-'));
  profileDirs.push(profileDir);
  const context = await chromium.launchPersistentContext(profileDir, {
    executablePath: CHROMIUM,
    headless: true,
    acceptDownloads: true,
    viewport: { width, height: 800 },
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
  contexts.push(context);
  return context.newPage();
}

/** Opens the demo project's main stair from the projects list, as a user would. */
async function openDemoStair(page: Page): Promise<void> {
  await page.waitForSelector('[data-testid="project-list"]', { timeout: 15_000 });
  await page.fill('[data-testid="project-search"]', 'saltmarsh');
  await page.click(`[data-testid="project-link"]:has-text("${DEMO_PROJECT}")`);
  await page.waitForSelector('[data-testid="stair-list"]', { timeout: 15_000 });
  await page.click('[data-testid="stair-link"]:has-text("Main stair")');
  await page.waitForSelector('[data-testid="side-view"]', { timeout: 15_000 });
}

const checkStatus = (page: Page, id: string) => page.locator(`[data-testid="check"]:has(strong:text-is("${id}"))`).getAttribute('data-status');

beforeAll(async () => {
  server = await startServerProcess({ DATA_DIR: dataDir });
  mkdirSync(SCREENSHOTS, { recursive: true });
});

afterAll(async () => {
  for (const context of contexts) await context.close();
  await server?.stop();
  rmSync(dataDir, { recursive: true, force: true });
  for (const dir of profileDirs) rmSync(dir, { recursive: true, force: true });
});

describe('the projects screens in Chromium', () => {
  it('lets the estimator run the demo stair, read the estimate, re-run it, break and fix a check, and download the PDF', async () => {
    const page = await freshPage();
    await page.goto(`${server.url}/projects`, { waitUntil: 'networkidle' });
    await signIn(page, 'theo@harborlane.test'); // demo-scenario.md: Harbor Lane's estimator
    await openDemoStair(page);
    expect(await page.locator('[data-testid="lit-tread"]').count()).toBe(12); // the demo stair's 12 treads
    await page.screenshot({ path: path.join(SCREENSHOTS, 'stair-editor-desktop.png'), fullPage: true });

    await page.click('[data-testid="run-stair"]');
    await page.waitForSelector('[data-testid="totals"]', { timeout: 30_000 });
    expect(new URL(page.url()).pathname).toMatch(/^\/projects\/estimates\/[0-9a-f-]{36}$/);
    const totals = await page.locator('[data-testid="totals"]').innerText();
    expect(totals).toContain('12 of 12'); // lit treads
    expect(totals).toContain('EUR'); // priced from Harbor Lane's stored catalog
    expect(await page.locator('[data-testid="check"]').count()).toBeGreaterThan(5);
    expect(await checkStatus(page, 'strip-fits-tread')).toBe('pass');
    expect(await page.locator('[data-testid="cautions"] li').count()).toBeGreaterThan(0);
    expect(await page.locator('[data-testid="drop-chart"] [data-testid="bar"]').count()).toBe(12);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'estimate-desktop.png'), fullPage: true });
    await page.locator('.tw-charts').screenshot({ path: path.join(SCREENSHOTS, 'estimate-charts.png') });
    await page.locator('[data-testid="reel-plan"]').screenshot({ path: path.join(SCREENSHOTS, 'estimate-reels.png') });
    await page.locator('[data-testid="bom"]').screenshot({ path: path.join(SCREENSHOTS, 'estimate-bom.png') });
    const firstEstimate = page.url();

    await page.click('[data-testid="rerun"]');
    const changes = page.locator('[data-testid="rerun-changes"]');
    await changes.waitFor({ timeout: 30_000 });
    expect(await changes.innerText()).toContain('nothing changed'); // same engine, same catalog
    expect(page.url()).not.toBe(firstEstimate); // the address names the new estimate

    // A cut pitch longer than the tread leaves no whole piece to fit: the strip check fails.
    await page.click('a:has-text("The stair")');
    await page.waitForSelector('[data-testid="field-cutPitchMm"]', { timeout: 15_000 });
    await page.fill('[data-testid="field-cutPitchMm"]', '1000');
    await page.click('[data-testid="run-stair"]');
    await page.waitForSelector('[data-testid="totals"]', { timeout: 30_000 });
    expect(await checkStatus(page, 'strip-fits-tread')).toBe('fail');
    expect(await page.locator('[data-testid="check"][data-status="fail"] [data-testid="suggestion"]').count()).toBeGreaterThan(0);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'estimate-failed-check.png'), fullPage: true });

    await page.click('a:has-text("The stair")');
    await page.waitForSelector('[data-testid="field-cutPitchMm"]', { timeout: 15_000 });
    await page.fill('[data-testid="field-cutPitchMm"]', '50');
    await page.click('[data-testid="run-stair"]');
    await page.waitForSelector('[data-testid="totals"]', { timeout: 30_000 });
    expect(await checkStatus(page, 'strip-fits-tread')).toBe('pass');

    const [download] = await Promise.all([page.waitForEvent('download', { timeout: 30_000 }), page.click('[data-testid="download-document.pdf"]')]);
    expect(download.suggestedFilename()).toMatch(/^saltmarsh-cottage-staircase-main-stair-estimate-\d{4}-\d{2}-\d{2}\.pdf$/);
    const saved = await download.path();
    expect(readFileSync(saved!).subarray(0, 5).toString()).toBe('%PDF-');

    await page.setViewportSize({ width: 360, height: 800 }); // a phone: wide tables scroll inside their frames
    await page.waitForTimeout(300); // the layout settles after the resize (not a timed assertion)
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
    expect(overflow).toBeLessThanOrEqual(0);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'estimate-phone.png'), fullPage: true });
  });

  it('lets the estimator start a project, add a stair, compare kits and run it', async () => {
    const page = await freshPage();
    await page.goto(`${server.url}/projects`, { waitUntil: 'networkidle' });
    await signIn(page, 'theo@harborlane.test');
    await page.click('[data-testid="create-project"]');
    await page.fill('[data-testid="project-name"]', 'Alder Row, house 7'); // demo-scenario.md
    await page.click('[data-testid="project-create-submit"]');
    await page.waitForSelector('[data-testid="stairs-empty"]', { timeout: 15_000 });
    expect(await page.locator('[data-testid="project-title"]').innerText()).toBe('Alder Row, house 7');

    await page.click('[data-testid="create-stair"]');
    await page.waitForSelector('[data-testid="side-view"]', { timeout: 15_000 });
    await page.fill('[data-testid="stair-name"]', 'Townhouse stair');
    await page.click('[data-testid="save-stair"]');
    await page.waitForSelector('[data-testid="run-stair"]', { timeout: 15_000 }); // saved: now it can run
    expect(new URL(page.url()).pathname).toMatch(/^\/projects\/[0-9a-f-]{36}\/stairs\/[0-9a-f-]{36}$/);

    await page.click('[data-testid="show-options"]');
    await page.waitForSelector('[data-testid="kit"]', { timeout: 30_000 });
    expect(await page.locator('[data-testid="kit"]').count()).toBeGreaterThan(0);
    expect(await page.locator('[data-testid="kit"]').first().innerText()).toContain('€');
    await page.screenshot({ path: path.join(SCREENSHOTS, 'kit-options-desktop.png'), fullPage: true });

    await page.click('[data-testid="run-stair"]');
    await page.waitForSelector('[data-testid="totals"]', { timeout: 30_000 });
    expect(await page.locator('[data-testid="totals"]').innerText()).toContain('14 of 14'); // the new stair's 14 treads
  });

  it('shows a viewer the stair and its estimates on a phone, with no save or run', async () => {
    const page = await freshPage(360);
    await page.goto(`${server.url}/projects`, { waitUntil: 'networkidle' });
    await signIn(page, 'ines@harborlane.test'); // demo-scenario.md: Harbor Lane's viewer
    expect(await page.locator('[data-testid="create-project"]').count()).toBe(0);
    await openDemoStair(page);
    expect(await page.locator('[data-testid="save-stair"]').count()).toBe(0);
    expect(await page.locator('[data-testid="run-stair"]').count()).toBe(0);
    expect(await page.locator('[data-testid="field-treads"]').isDisabled()).toBe(true);
    expect(await page.locator('[data-testid="add-flight"]').count()).toBe(0);
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
    expect(overflow).toBeLessThanOrEqual(0); // nothing wider than the phone
    await page.screenshot({ path: path.join(SCREENSHOTS, 'stair-viewer-phone.png'), fullPage: true });
  });

  it('checks a catalog file with a bad row and imports nothing', async () => {
    const signedIn = await fetch(`${server.url}/v1/auth/sign-in`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ email: 'mira@harborlane.test', password: DEMO_PASSWORD }),
    });
    const { accessToken } = (await signedIn.json()) as { accessToken: string };
    const exported = await (await fetch(`${server.url}/v1/catalog/export`, { headers: { authorization: `Bearer ${accessToken}` } })).text();
    const header = exported.replace(/^\uFEFF/, '').split(/\r?\n/)[0]!.split(',');
    // A driver without its voltage or rating: the report names that line.
    const bad = header.map((column) => (column === 'sku' ? 'HL-D24-BAD' : column === 'kind' ? 'driver' : '')).join(',');
    const file = `${exported.trimEnd()}\r\n${bad}\r\n`;
    const badLine = file.replace(/^\uFEFF/, '').trimEnd().split(/\r?\n/).length;

    const page = await freshPage(360);
    await page.goto(`${server.url}/catalog`, { waitUntil: 'networkidle' });
    await signIn(page, 'mira@harborlane.test'); // demo-scenario.md: Harbor Lane's admin
    await page.waitForSelector('[data-testid="catalog-table"]', { timeout: 15_000 });
    await page.screenshot({ path: path.join(SCREENSHOTS, 'catalog-phone.png'), fullPage: true });
    await page.setInputFiles('[data-testid="catalog-file"]', { name: 'harbor-lane.csv', mimeType: 'text/csv', buffer: Buffer.from(file) });
    const errors = page.locator('[data-testid="import-errors"]');
    await errors.waitFor({ timeout: 15_000 });
    expect(await errors.locator('tbody tr').first().locator('td').first().innerText()).toBe(String(badLine));
    expect(await page.locator('[data-testid="import-confirm"]').count()).toBe(0);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'catalog-report-phone.png'), fullPage: true });
  });
});
