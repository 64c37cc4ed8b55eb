/// <reference lib="dom" />
import { mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { EmbedManifest } from '../../api/embed/bundle.js';
import { startServerProcess, type ServerProcess } from './server-process.js';

const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
const SCREENSHOTS = path.resolve('tests/e2e/screenshots'); // git-ignored
// Another name for this machine: the same demo shop page from an origin the key does not allow.
const ELSEWHERE = 'shop.elsewhere.test';

const dataDir = mkdtempSync(path.join(tmpdir(), 'treadwise-e2e-embed-'));
const profileDir = mkdtempSync(path.join(tmpdir(), 'treadwise-chromium-'));
let server: ServerProcess;
let shopUrl: string;
let context: BrowserContext;
let hostPage: Server | undefined;
let strictKey = '';

interface CartLine {
  sku: string;
  quantity: number;
  unitPrice: number;
}

beforeAll(async () => {
  server = await startServerProcess({ DATA_DIR: dataDir });
  mkdirSync(SCREENSHOTS, { recursive: true });
  const shop = /Demo shop: (http:\/\/\S+?)\/?\s/.exec(server.stdout());
  expect(shop, server.stdout()).not.toBeNull();
  shopUrl = shop![1]!;
  context = await chromium.launchPersistentContext(profileDir, {
    executablePath: CHROMIUM,
    headless: true,
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync', `--host-resolver-rules=MAP ${ELSEWHERE} 127.0.0.1`],
  });
});

afterAll(async () => {
  await context?.close();
  hostPage?.close();
  await server?.stop();
  rmSync(dataDir, { recursive: true, force: true });
  rmSync(profileDir, { recursive: true, force: true });
});

/** A page that records every CSP violation, so "works under a strict CSP" is checked, not assumed. */
async function openPage(url: string, width: number): Promise<{ page: Page; violations: () => Promise<string[]> }> {
  const page = await context.newPage();
  await page.setViewportSize({ width, height: 900 });
  await page.addInitScript(() => {
    const seen: string[] = [];
    (window as unknown as { cspViolations: string[] }).cspViolations = seen;
    document.addEventListener('securitypolicyviolation', (e) => seen.push(`${e.violatedDirective} ${e.blockedURI}`));
  });
  await page.goto(url, { waitUntil: 'networkidle' });
  return { page, violations: () => page.evaluate(() => (window as unknown as { cspViolations: string[] }).cspViolations) };
}

/** demo-scenario.md: an Alder Row townhouse stair (14 treads, 900 mm wide, riser 185, going 250). */
async function fillAlderRow(page: Page): Promise<void> {
  await page.fill('treadwise-estimator input[data-field="treads"]', '14');
  await page.fill('treadwise-estimator input[data-field="treadWidthMm"]', '900');
  await page.fill('treadwise-estimator input[data-field="riserHeightMm"]', '185');
  await page.fill('treadwise-estimator input[data-field="goingMm"]', '250');
}

describe('the estimator on the Harbor Lane demo shop', () => {
  it('prices a stair as the shopper types and fills the shop’s basket from its event, on a phone-width page', async () => {
    const { page, violations } = await openPage(`${shopUrl}/`, 320);
    await fillAlderRow(page);
    const total = page.locator('treadwise-estimator [data-testid="total"]');
    await total.waitFor({ timeout: 30_000 });
    expect(await total.innerText()).toMatch(/^€\d{1,3}(,\d{3})*\.\d{2}$/); // locale="en-IE", catalog in EUR
    expect(await page.locator('treadwise-estimator [data-testid="checks"]').innerText()).toMatch(/checks pass/);
    expect(await page.locator('treadwise-estimator .cautions li').count()).toBeGreaterThan(0);
    // 320 px wide: nothing of the element sticks out sideways.
    expect(await page.evaluate(() => document.querySelector('treadwise-estimator')!.scrollWidth)).toBeLessThanOrEqual(320);

    const detail = page.evaluate(
      () => new Promise<{ lines: CartLine[]; currency: string }>((resolve) => document.addEventListener('treadwise-add-to-basket', (e) => resolve((e as CustomEvent).detail), { once: true })),
    );
    await page.click('treadwise-estimator [data-testid="add-to-basket"]');
    const { lines, currency } = await detail;
    expect(currency).toBe('EUR');
    expect(lines.length).toBeGreaterThan(2);
    expect(lines.some((l) => /^HL-S(24|12)-/.test(l.sku))).toBe(true); // a strip from Harbor Lane's catalog

    const rows = page.locator('[data-basket-lines] tr');
    await rows.first().waitFor();
    await page.screenshot({ path: path.join(SCREENSHOTS, 'embed-shop-phone.png'), fullPage: true });
    expect(await rows.evaluateAll((trs) => trs.map((tr) => (tr as HTMLElement).dataset.sku))).toEqual(lines.map((l) => l.sku));
    const net = lines.reduce((sum, l) => sum + Math.round(l.quantity * l.unitPrice * 100), 0) / 100;
    expect(await page.locator('[data-basket-total]').innerText()).toBe(new Intl.NumberFormat('en-IE', { style: 'currency', currency: 'EUR' }).format(net));
    expect(await violations()).toEqual([]); // the shop page's own CSP is strict (script-src self + API, style nonce)
    await page.close();
  });

  it('tells the shopper the estimator is not enabled when the same page is served from an origin the key does not allow', async () => {
    const port = new URL(shopUrl).port;
    const { page } = await openPage(`http://${ELSEWHERE}:${port}/`, 800);
    const alert = page.locator('treadwise-estimator [role="alert"]');
    await alert.waitFor({ timeout: 30_000 });
    expect(await alert.getAttribute('data-problem')).toBe('origin');
    expect(await alert.innerText()).toContain('not enabled for this website');
    await page.screenshot({ path: path.join(SCREENSHOTS, 'embed-refused-origin.png') });
    await page.close();
  });

  it('works on a host page whose CSP allows scripts only from the API, pinned by the SRI hash', async () => {
    const manifest = (await (await fetch(`${server.url}/embed/v1/manifest.json`)).json()) as EmbedManifest;
    const nonce = 'c3RyaWN0LWhvc3Q';
    hostPage = createServer((_req, res) => {
      res.setHeader(
        'Content-Security-Policy',
        `default-src 'none'; script-src ${server.url}; connect-src ${server.url}; style-src 'nonce-${nonce}'; base-uri 'none'; form-action 'none'`,
      );
      res.setHeader('Content-Type', 'text/html; charset=utf-8');
      res.end(readFileSync('tests/e2e/fixtures/strict-host.html', 'utf8')
        .replaceAll('%SCRIPT%', `${server.url}${manifest.url}`)
        .replaceAll('%INTEGRITY%', manifest.integrity)
        .replaceAll('%API%', server.url)
        .replaceAll('%KEY%', strictKey)
        .replaceAll('%NONCE%', nonce));
    });
    await new Promise<void>((resolve) => hostPage!.listen(0, '127.0.0.1', resolve));
    const origin = `http://127.0.0.1:${(hostPage.address() as AddressInfo).port}`;

    // Harbor Lane's admin makes a page key for this host, as a shop would for a new site.
    const signIn = await fetch(`${server.url}/v1/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: 'mira@harborlane.test', password: 'treadwise-demo' }) });
    const { accessToken } = (await signIn.json()) as { accessToken: string };
    const created = await fetch(`${server.url}/v1/keys`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', authorization: `Bearer ${accessToken}` },
      body: JSON.stringify({ name: 'Strict host page', kind: 'embed', scopes: ['sizing:run', 'catalog:read'], allowedOrigins: [origin] }),
    });
    expect(created.status).toBe(201);
    strictKey = ((await created.json()) as { token: string }).token;

    const { page, violations } = await openPage(`${origin}/`, 480);
    await fillAlderRow(page);
    await page.locator('treadwise-estimator [data-testid="total"]').waitFor({ timeout: 30_000 });
    // Our shadow-root styles carry the page's nonce: the button takes its accent colour.
    expect(await page.locator('treadwise-estimator [data-testid="add-to-basket"]').evaluate((b) => getComputedStyle(b).backgroundColor)).toBe('rgb(31, 95, 139)');
    expect(await violations()).toEqual([]);
    await page.close();
  });
});

