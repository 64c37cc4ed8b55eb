/// <reference lib="dom" />
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BrowserProfiles } from './browser-profiles.js';
import { signIn } from './console-session.js';
import { freePort } from './free-port.js';
import { startServerProcess, type ServerProcess } from './server-process.js';

const SCREENSHOTS = path.resolve('tests/e2e/screenshots'); // git-ignored

const dataDir = mkdtempSync(path.join(tmpdir(), 'treadwise-e2e-billing-'));
const profiles = new BrowserProfiles();
let server: ServerProcess;
let serverKey: string;

beforeAll(async () => {
  const port = await freePort();
  // The provider sends the browser back to PUBLIC_URL/billing: it must be the address the browser uses.
  server = await startServerProcess({ DATA_DIR: dataDir, PORT: String(port), PUBLIC_URL: `http://127.0.0.1:${port}` });
  expect(server.stdout()).toContain('Payments: SIMULATED'); // no PAYMENTS_* settings: the local stand-in
  serverKey = /harbor-lane\s+server\s+(tw_server_\S+)/.exec(server.stdout())![1]!; // printed at the first start
  mkdirSync(SCREENSHOTS, { recursive: true });
});

afterAll(async () => {
  await profiles.close();
  await server?.stop();
  rmSync(dataDir, { recursive: true, force: true });
});

/** The monthly quota in force for Harbor Lane, as a call with its demo server key advertises it. */
async function advertisedQuota(): Promise<number> {
  const res = await fetch(`${server.url}/v1/usage`, { headers: { authorization: `Bearer ${serverKey}` } });
  expect(res.status).toBe(200);
  const policy = res.headers.get('ratelimit-policy') ?? '';
  const quota = /"monthly-quota"; q=(\d+)/.exec(policy);
  expect(quota, policy).not.toBeNull();
  return Number(quota![1]);
}

describe('the billing screen in Chromium', () => {
  it('lets the Harbor Lane admin upgrade to Partner through the simulated checkout and see the new limits and the invoice', async () => {
    expect(await advertisedQuota()).toBe(50_000); // demo-data.ts: harbor-lane starts on shop

    const admin = await profiles.page();
    await admin.goto(`${server.url}/status`, { waitUntil: 'networkidle' });
    await signIn(admin, 'mira@harborlane.test'); // demo-scenario.md: Harbor Lane's admin
    await admin.click('mat-nav-list a:has-text("Billing")');
    await admin.waitForSelector('[data-testid="billing-plan"]', { timeout: 15_000 });
    expect(await admin.locator('[data-testid="billing-plan-name"]').innerText()).toBe('Shop');
    expect(await admin.locator('[data-testid="billing-simulated"]').innerText()).toContain('Payments are simulated on this server');
    expect(await admin.locator('[data-offer="partner"] [data-testid="offer-price"]').innerText()).toBe('€99.00 a month');
    expect(await admin.locator('[data-testid="invoices-empty"]').count()).toBe(1);
    await admin.screenshot({ path: path.join(SCREENSHOTS, 'billing-desktop.png'), fullPage: true });

    // Choose Partner: off to the provider's hosted checkout, which says it is a simulation.
    await admin.click('[data-offer="partner"] [data-testid="offer-choose"]');
    await admin.waitForURL((url) => url.pathname.startsWith('/checkout/'), { timeout: 15_000 });
    expect(new URL(admin.url()).origin).not.toBe(server.url); // the provider's own address
    expect(await admin.locator('[role="note"]').innerText()).toContain('Simulated payment provider');
    await admin.screenshot({ path: path.join(SCREENSHOTS, 'billing-checkout.png'), fullPage: true });

    // Pay: back on the billing page, which waits for the provider's webhook to change the plan.
    await admin.click('button:has-text("Pay")');
    await admin.waitForURL((url) => url.pathname === '/billing', { timeout: 15_000 });
    await expect
      .poll(() => admin.locator('[data-testid="billing-plan"]').getAttribute('data-plan').catch(() => null), { timeout: 30_000 })
      .toBe('partner');
    expect(await admin.locator('[data-testid="billing-plan"]').getAttribute('data-state')).toBe('active');
    expect(await admin.locator('[data-testid="billing-state"]').innerText()).toMatch(/^Your Partner plan is active and renews on /);
    expect(await admin.locator('[data-testid="billing-limits"]').innerText()).toContain('500,000 units a month');
    expect(await admin.locator('[data-testid="billing-limits"]').innerText()).toContain('3,000 requests a minute per key');
    expect(await admin.locator('[data-offer="partner"] [data-testid="offer-choose"]').innerText()).toBe('Current plan');
    expect(new URL(admin.url()).search).toBe(''); // a reload does not wait for the payment again

    // The invoice of the payment, with a link to its page at the provider.
    const invoice = admin.locator('[data-testid="invoice-table"] tbody tr').first();
    await invoice.waitFor({ timeout: 15_000 });
    expect(await invoice.innerText()).toContain('€99.00');
    expect(await invoice.locator('[data-testid="invoice-status"]').innerText()).toBe('Paid');
    const link = invoice.locator('[data-testid="invoice-link"]');
    expect(await link.getAttribute('target')).toBe('_blank');
    expect(await link.getAttribute('rel')).toBe('noopener');
    expect(await link.getAttribute('href')).toMatch(/\/invoices\/in_/);
    await admin.screenshot({ path: path.join(SCREENSHOTS, 'billing-partner-desktop.png'), fullPage: true });

    // The higher limit is in force for the organisation's keys, not only on the page.
    expect(await advertisedQuota()).toBe(500_000);
  });

  it('shows a viewer the plan without any way to change it, at a phone’s width', async () => {
    const viewer = await profiles.page(360);
    await viewer.goto(`${server.url}/billing`, { waitUntil: 'networkidle' });
    await signIn(viewer, 'ines@harborlane.test'); // demo-scenario.md: Harbor Lane's viewer
    await viewer.waitForSelector('[data-testid="billing-plan"]', { timeout: 15_000 });
    expect(await viewer.locator('[data-testid="billing-read-only"]').count()).toBe(1);
    expect(await viewer.locator('[data-testid="offer-choose"]').count()).toBe(0);
    expect(await viewer.locator('[data-testid="invoice-table"], [data-testid="invoices-empty"]').count()).toBe(0);
    // Nothing wider than the phone: the plan cards stack.
    expect(await viewer.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
    await viewer.screenshot({ path: path.join(SCREENSHOTS, 'billing-viewer-phone.png'), fullPage: true });
  });
});
