/// <reference lib="dom" />
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { type AxeFinding, seriousViolations } from './axe-scan.js';
import { BrowserProfiles } from './browser-profiles.js';
import { signIn } from './console-session.js';
import { startServerProcess, type ServerProcess } from './server-process.js';

const SCREENSHOTS = path.resolve('tests/e2e/screenshots'); // git-ignored
const WIDTHS = { desktop: 1280, phone: 360 } as const;

const dataDir = mkdtempSync(path.join(tmpdir(), 'treadwise-e2e-a11y-'));
const profiles = new BrowserProfiles();
let server: ServerProcess;

beforeAll(async () => {
  server = await startServerProcess({ DATA_DIR: dataDir });
  mkdirSync(SCREENSHOTS, { recursive: true });
});

afterAll(async () => {
  await profiles.close();
  await server?.stop();
  rmSync(dataDir, { recursive: true, force: true });
});

/** Opens a screen, waits for what shows it has loaded, and scans it at desktop and phone widths. */
async function scan(page: Page, name: string, url: string, ready: string): Promise<Record<string, AxeFinding[]>> {
  const found: Record<string, AxeFinding[]> = {};
  for (const [label, width] of Object.entries(WIDTHS)) {
    await page.setViewportSize({ width, height: 800 });
    await page.goto(`${server.url}${url}`, { waitUntil: 'networkidle' });
    await page.waitForSelector(ready, { timeout: 15_000 });
    await page.screenshot({ path: path.join(SCREENSHOTS, `a11y-${name}-${label}.png`), fullPage: true });
    const violations = await seriousViolations(page);
    if (violations.length) found[`${name} (${label})`] = violations;
  }
  return found;
}

describe('accessibility of the console (axe-core: no serious or critical violations)', () => {
  it('passes on the sign-in page', async () => {
    const page = await profiles.page();
    expect(await scan(page, 'sign-in', '/sign-in', '[data-testid="email"]')).toEqual({});
  });

  it('passes on the admin’s screens: keys, traffic, bench, team, activity, billing', async () => {
    const page = await profiles.page();
    await page.goto(`${server.url}/keys`, { waitUntil: 'networkidle' });
    await signIn(page, 'mira@harborlane.test'); // demo-scenario.md: Harbor Lane's admin
    const found = {
      ...(await scan(page, 'keys', '/keys', '[data-testid="key-table"], [data-testid="keys-empty"]')),
      ...(await scan(page, 'traffic', '/traffic', '[data-testid="traffic-quota"]')),
      ...(await scan(page, 'bench', '/bench', '[data-testid="bench-calculate"]')),
      ...(await scan(page, 'team', '/team', '[data-testid="member-table"]')),
      ...(await scan(page, 'activity', '/activity', '[data-testid="activity-list"], [data-testid="activity-empty"]')),
      ...(await scan(page, 'billing', '/billing', '[data-testid="invoice-table"], [data-testid="invoices-empty"]')),
    };
    // An answer and an error beside a field are part of the bench too.
    await page.setViewportSize({ width: WIDTHS.desktop, height: 800 });
    await page.goto(`${server.url}/bench`, { waitUntil: 'networkidle' });
    await page.click('[data-calculator="voltage-drop"] [data-testid="bench-calculate"]');
    await page.waitForSelector('[data-testid="bench-answer"]', { timeout: 15_000 });
    await page.fill('[data-calculator="voltage-drop"] [data-field="lengthM"] input', '-1');
    await page.click('[data-calculator="voltage-drop"] [data-testid="bench-calculate"]');
    await page.waitForSelector('[data-testid="field-error"]');
    // Scan the page at rest: the pointer off the button and its click ripple faded (a ripple
    // caught half-way is a colour the button never keeps).
    await page.mouse.move(0, 0);
    await page.waitForFunction(() => !document.querySelector('.mat-ripple-element'));
    const benchStates = await seriousViolations(page);
    if (benchStates.length) Object.assign(found, { 'bench with an error': benchStates });
    expect(found).toEqual({});
  });

  it('passes on the batches screens, and a job uploaded there is watched until it ends', async () => {
    const page = await profiles.page();
    await page.goto(`${server.url}/batches`, { waitUntil: 'networkidle' });
    await signIn(page, 'mira@harborlane.test');
    const found = await scan(page, 'batches', '/batches', '[data-testid="batches-empty"], [data-testid="batch-link"]');
    // Two stairs of docs/batch-rows.md's example, and a third whose tread count is not a number.
    const csv = [
      'ref,layout,staircase.treads,staircase.treadWidthMm,staircase.riserHeightMm,staircase.goingMm,treadStrip.voltageV,treadStrip.powerWPerM,treadStrip.cutPitchMm,controller.profileId',
      'Plot 14,tread-strips,14,900,185,250,24,10,50,HL-K20',
      'Plot 15,tread-strips,15,900,185,250,24,10,50,HL-K20',
      'Plot 16,tread-strips,fourteen,900,185,250,24,10,50,HL-K20',
    ].join('\r\n');
    await page.setViewportSize({ width: WIDTHS.desktop, height: 800 });
    await page.goto(`${server.url}/batches`, { waitUntil: 'networkidle' });
    await page.setInputFiles('[data-testid="batch-file"]', { name: 'alder-row.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) });
    await page.fill('[data-testid="batch-name"]', 'Alder Row, plots 14-16');
    await page.click('[data-testid="batch-start"]');
    await page.waitForURL(/\/batches\/[0-9a-f-]{36}$/, { timeout: 15_000 });
    // The page polls on its own until the job ends: no reload here.
    await page.waitForFunction(() => document.querySelector('[data-testid="batch-status"]')?.getAttribute('data-status') === 'succeeded', undefined, { timeout: 30_000 });
    expect(await page.textContent('[data-testid="batch-progress"]')).toContain('3 of 3 rows answered');
    expect(await page.textContent('[data-count="failed"]')).toBe('1');
    expect(await page.locator('[data-testid="batch-cancel"]').count()).toBe(0); // ended: nothing to cancel
    for (const [label, width] of Object.entries(WIDTHS)) {
      await page.setViewportSize({ width, height: 800 });
      await page.reload({ waitUntil: 'networkidle' }); // the shell lays out its navigation for the width at load
      await page.waitForSelector('[data-testid="batch-counts"]', { timeout: 15_000 });
      await page.screenshot({ path: path.join(SCREENSHOTS, `a11y-batch-job-${label}.png`), fullPage: true });
      const job = await seriousViolations(page);
      if (job.length) found[`batch job (${label})`] = job;
    }
    expect(found).toEqual({});
  });

  it('passes on the operator’s screens: organisations and plans, the mail outbox with a message open', async () => {
    // A message in the outbox: a password reset asked for one of the demo accounts (a public route).
    const reset = await fetch(`${server.url}/v1/auth/password-reset`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: 'theo@harborlane.test' }) });
    expect(reset.status).toBeLessThan(300);
    const page = await profiles.page();
    await page.goto(`${server.url}/operator/organizations`, { waitUntil: 'networkidle' });
    await signIn(page, 'ops@treadwise.test'); // demo-scenario.md: the demo operator
    const found = {
      ...(await scan(page, 'operator-organizations', '/operator/organizations', '[data-testid="organization-table"]')),
      ...(await scan(page, 'operator-outbox', '/operator/outbox', '[data-testid="outbox-list"]')),
    };
    await page.locator('[data-testid="outbox-message"]').first().click();
    await page.waitForSelector('[data-testid="outbox-body"]');
    const open = await seriousViolations(page);
    if (open.length) Object.assign(found, { 'outbox with a message open': open });
    expect(found).toEqual({});
  });
});
