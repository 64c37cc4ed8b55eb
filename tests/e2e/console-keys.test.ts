/// <reference lib="dom" />
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { signIn } from './console-session.js';
import { startServerProcess, type ServerProcess } from './server-process.js';

const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
const SCREENSHOTS = path.resolve('tests/e2e/screenshots'); // git-ignored
const SHOP_ORIGIN = 'https://shop.harborlane.test'; // demo-scenario.md: Harbor Lane's shop

const dataDir = mkdtempSync(path.join(tmpdir(), 'treadwise-e2e-keys-'));
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
    viewport: { width, height: 800 },
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
  contexts.push(context);
  return context.newPage();
}

/** Calls the sizing API with a key as a shop page on SHOP_ORIGIN would. */
function sizeWith(key: string): Promise<Response> {
  return fetch(`${server.url}/v1/calculations/voltage-drop`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', authorization: `Bearer ${key}`, origin: SHOP_ORIGIN },
    body: JSON.stringify({ supplyVoltageV: 24, currentA: 2, lengthM: 8, conductor: { crossSectionMm2: 0.75 } }),
  });
}

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

describe('the keys screen in Chromium', () => {
  it('lets the demo admin create an embed key, see it once, and revoke it', async () => {
    const page = await freshPage();
    await page.goto(`${server.url}/keys`, { waitUntil: 'networkidle' });
    expect(new URL(page.url()).pathname).toBe('/sign-in'); // not signed in yet
    await page.screenshot({ path: path.join(SCREENSHOTS, 'sign-in-desktop.png') });
    await signIn(page, 'mira@harborlane.test'); // demo-scenario.md: Harbor Lane's admin
    await page.waitForSelector('[data-testid="key-table"]', { timeout: 15_000 });
    expect(new URL(page.url()).pathname).toBe('/keys'); // back where the visit began
    await page.screenshot({ path: path.join(SCREENSHOTS, 'keys-desktop.png'), fullPage: true });

    await page.click('[data-testid="create-key"]');
    await page.click('[data-testid="key-kind"] >> text=Embed');
    await page.fill('[data-testid="key-name"]', 'Stair pages');
    await page.fill('[data-testid="key-origins"]', SHOP_ORIGIN);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'key-create.png') });
    await page.click('[data-testid="create-key-submit"]');

    const tokenCell = page.locator('[data-testid="new-token"]');
    await tokenCell.waitFor({ timeout: 15_000 });
    const token = (await tokenCell.innerText()).trim();
    // api-contract.md: tw_embed_<keyId>_<secret>; the secret is 24 random bytes in base64url (api/auth/key-format.ts).
    const parts = /^tw_embed_([A-Za-z0-9]+)_([A-Za-z0-9_-]{32})$/.exec(token);
    expect(parts).not.toBeNull();
    const [, keyId, secret] = parts!;
    expect(await page.locator('[data-testid="once-warning"]').innerText()).toContain('shown only this once');
    await page.screenshot({ path: path.join(SCREENSHOTS, 'key-shown-once.png') });
    expect((await sizeWith(token)).status).toBe(200); // the key works from its origin
    // The page tags pin the script this server publishes, with its integrity hash and the new key.
    const manifest = (await (await fetch(`${server.url}/embed/v1/manifest.json`)).json()) as { url: string; integrity: string };
    const tags = page.locator('[data-testid="snippet-HTML"]');
    await expect.poll(() => tags.innerText(), { timeout: 15_000 }).toContain(`integrity="${manifest.integrity}"`);
    expect(await tags.innerText()).toContain(`${manifest.url}"`);
    expect(await tags.innerText()).toContain(`embed-key="${token}"`);

    await page.click('[data-testid="secret-done"]');
    await tokenCell.waitFor({ state: 'detached' });
    const row = page.locator(`tr[data-key-id="${keyId}"]`);
    await row.waitFor();
    expect(await row.locator('[data-testid="key-status"]').innerText()).toBe('active');
    expect(await page.content()).not.toContain(secret!); // the secret is nowhere on the page any more

    await row.locator('[data-testid="revoke-key"]').click();
    expect(await page.locator('[data-testid="revoke-title"]').innerText()).toContain('Stair pages');
    await page.click('[data-testid="revoke-confirm"]');
    await expect.poll(() => row.locator('[data-testid="key-status"]').innerText(), { timeout: 15_000 }).toBe('revoked');
    expect(await row.locator('[data-testid="revoke-key"]').count()).toBe(0);

    const refused = await sizeWith(token);
    expect(refused.status).toBe(401);
    expect((await refused.json()).code).toBe('credential_revoked'); // api-contract.md credential failure codes

    await page.click('[data-testid="account"]');
    await page.click('[data-testid="sign-out"]');
    await page.waitForURL((url) => url.pathname === '/sign-in');
    await page.goto(`${server.url}/keys`, { waitUntil: 'networkidle' });
    expect(new URL(page.url()).pathname).toBe('/sign-in'); // the stored sign-in is gone too
  });

  it('shows a viewer no keys and no create button', async () => {
    const page = await freshPage(360); // a phone's width
    await page.goto(server.url, { waitUntil: 'networkidle' });
    await signIn(page, 'ines@harborlane.test'); // demo-scenario.md: Harbor Lane's viewer
    expect(await page.locator('[data-testid="role"]').innerText()).toBe('viewer');
    await page.click('button[aria-label="Toggle navigation"]'); // the navigation slides in on a phone
    const sections = await page.locator('mat-nav-list a').allInnerTexts();
    expect(sections.map((s) => s.trim())).not.toContain('Keys');

    await page.goto(`${server.url}/keys`, { waitUntil: 'networkidle' });
    await page.waitForSelector('[data-testid="not-allowed"]', { timeout: 15_000 });
    expect(await page.locator('[data-testid="create-key"]').count()).toBe(0);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'viewer-phone.png'), fullPage: true });

    await page.click('[data-testid="account"]');
    const schemeItem = page.locator('[data-testid="color-scheme"]');
    await schemeItem.click(); // system → light
    await expect.poll(() => schemeItem.innerText()).toContain('light');
    await schemeItem.click(); // light → dark
    await expect.poll(() => schemeItem.innerText()).toContain('dark');
    expect(await page.evaluate(() => document.documentElement.style.colorScheme)).toBe('dark');
    await page.keyboard.press('Escape');
    await page.screenshot({ path: path.join(SCREENSHOTS, 'viewer-phone-dark.png'), fullPage: true });
  });
});
