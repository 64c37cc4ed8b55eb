/// <reference lib="dom" />
import { mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BrowserProfiles } from './browser-profiles.js';
import { signIn } from './console-session.js';
import { freePort } from './free-port.js';
import { startServerProcess, type ServerProcess } from './server-process.js';

const SCREENSHOTS = path.resolve('tests/e2e/screenshots'); // git-ignored
const NEWCOMER = 'rowan@harborlane.test'; // invented, like demo-scenario.md's people

const dataDir = mkdtempSync(path.join(tmpdir(), 'treadwise-e2e-ops-'));
const profiles = new BrowserProfiles();
let server: ServerProcess;

beforeAll(async () => {
  const port = await freePort();
  // The invitation e-mail links to PUBLIC_URL: it must be the address the browser uses.
  server = await startServerProcess({ DATA_DIR: dataDir, PORT: String(port), PUBLIC_URL: `http://127.0.0.1:${port}` });
  mkdirSync(SCREENSHOTS, { recursive: true });
});

afterAll(async () => {
  await profiles.close();
  await server?.stop();
  rmSync(dataDir, { recursive: true, force: true });
});

async function sections(page: Page): Promise<string[]> {
  return (await page.locator('mat-nav-list a').allInnerTexts()).map((s) => s.trim());
}

async function choose(page: Page, select: string, option: string): Promise<void> {
  await page.click(select);
  await page.locator('mat-option', { hasText: option }).first().click();
}

describe('the traffic, bench, team, activity and operator screens in Chromium', () => {
  it('lets an admin size on the bench, read traffic, invite a newcomer; the operator moves a plan and hands over the invitation link', async () => {
    const admin = await profiles.page();
    await admin.goto(`${server.url}/bench`, { waitUntil: 'networkidle' });
    await signIn(admin, 'mira@harborlane.test'); // demo-scenario.md: Harbor Lane's admin
    expect(await sections(admin)).toEqual(expect.arrayContaining(['Keys', 'Traffic', 'Bench', 'Team', 'Activity']));
    expect(await sections(admin)).not.toContain('Mail outbox'); // operator only

    // Bench: the pre-filled voltage drop, then a value out of the schema's bounds stays beside its field.
    await admin.click('[data-calculator="voltage-drop"] [data-testid="bench-calculate"]');
    const answer = admin.locator('[data-calculator="voltage-drop"] [data-testid="bench-answer"]');
    await answer.waitFor({ timeout: 15_000 });
    expect(await answer.innerText()).toContain('Within the limit');
    await admin.fill('[data-calculator="voltage-drop"] [data-field="supplyVoltageV"] input', '2000');
    await admin.click('[data-calculator="voltage-drop"] [data-testid="bench-calculate"]');
    expect(await admin.locator('[data-field="supplyVoltageV"] [data-testid="field-error"]').innerText()).toContain('At most 1000');
    await admin.screenshot({ path: path.join(SCREENSHOTS, 'bench-desktop.png'), fullPage: true });

    // Traffic: the month's quota on the demo plan, and the CSV export.
    await admin.click('mat-nav-list a:has-text("Traffic")');
    await admin.waitForSelector('[data-testid="traffic-quota"]', { timeout: 15_000 });
    expect(await admin.locator('[data-testid="traffic-quota"]').innerText()).toContain('Shop plan'); // demo-data.ts: harbor-lane is on shop
    const [download] = await Promise.all([admin.waitForEvent('download'), admin.click('[data-testid="traffic-csv"]')]);
    expect(download.suggestedFilename()).toMatch(/^treadwise-usage-harbor-lane-\d{4}-\d{2}-\d{2}-to-\d{4}-\d{2}-\d{2}\.csv$/);
    const csv = readFileSync((await download.path())!, 'utf8');
    expect(csv.split('\r\n')[0]).toMatch(/^day,key_id,route,status_class,requests,limited,units/);
    await admin.screenshot({ path: path.join(SCREENSHOTS, 'traffic-desktop.png'), fullPage: true });

    // Team: the demo members, then an invitation that waits for an answer.
    await admin.click('mat-nav-list a:has-text("Team")');
    await admin.waitForSelector('[data-testid="member-table"]', { timeout: 15_000 });
    for (const email of ['mira@harborlane.test', 'theo@harborlane.test', 'ines@harborlane.test']) {
      expect(await admin.locator(`tr[data-member="${email}"]`).count()).toBe(1);
    }
    await admin.fill('[data-testid="invite-email"]', NEWCOMER);
    await choose(admin, '[data-testid="invite-role"]', 'estimator');
    await admin.click('[data-testid="invite-submit"]');
    await admin.locator(`[data-invitation="${NEWCOMER}"]`).waitFor({ timeout: 15_000 });
    await admin.screenshot({ path: path.join(SCREENSHOTS, 'team-desktop.png'), fullPage: true });

    // Activity: the invitation is on the record.
    await admin.click('mat-nav-list a:has-text("Activity")');
    await admin.waitForSelector('[data-testid="activity-list"]', { timeout: 15_000 });
    expect(await admin.locator('[data-action="member.invited"]').first().innerText()).toContain(NEWCOMER);
    await choose(admin, '[data-testid="activity-action"]', 'member invited');
    await expect.poll(() => admin.locator('[data-action]').evaluateAll((items) => items.map((i) => i.getAttribute('data-action'))), { timeout: 15_000 }).toEqual(['member.invited']);
    await admin.screenshot({ path: path.join(SCREENSHOTS, 'activity-desktop.png'), fullPage: true });

    // The operator: organisations and plans, then the outbox.
    const ops = await profiles.page();
    await ops.goto(`${server.url}/operator/organizations`, { waitUntil: 'networkidle' });
    await signIn(ops, 'ops@treadwise.test'); // demo-scenario.md: the demo operator
    expect(await sections(ops)).toEqual(expect.arrayContaining(['Organisations', 'Mail outbox']));
    await ops.waitForSelector('[data-testid="organization-table"]', { timeout: 15_000 });
    const quayside = ops.locator('tr[data-organization="quayside-studio"] [data-testid="organization-plan"]');
    expect(await quayside.innerText()).toContain('Free'); // demo-data.ts
    await choose(ops, 'tr[data-organization="quayside-studio"] [data-testid="organization-plan"]', 'Partner');
    await expect.poll(() => ops.locator('simple-snack-bar').innerText(), { timeout: 15_000 }).toContain('partner plan');
    await ops.reload({ waitUntil: 'networkidle' });
    await ops.waitForSelector('[data-testid="organization-table"]', { timeout: 15_000 });
    expect(await ops.locator('tr[data-organization="quayside-studio"] [data-testid="organization-plan"]').innerText()).toContain('Partner'); // stored
    await ops.screenshot({ path: path.join(SCREENSHOTS, 'operator-organizations-desktop.png'), fullPage: true });

    await ops.click('mat-nav-list a:has-text("Mail outbox")');
    const message = ops.locator(`[data-testid="outbox-message"][data-to="${NEWCOMER}"]`).first();
    await message.waitFor({ timeout: 15_000 });
    await message.click();
    const link = ops.locator('[data-testid="outbox-body"] [data-testid="outbox-link"]').first();
    expect(await link.getAttribute('href')).toMatch(new RegExp(`^${server.url}/accept-invitation\\?token=`));
    await ops.screenshot({ path: path.join(SCREENSHOTS, 'operator-outbox-desktop.png'), fullPage: true });
    const href = (await link.getAttribute('href'))!;

    // The newcomer follows the link in a browser of their own and joins as an estimator.
    const newcomer = await profiles.page(360);
    await newcomer.goto(href, { waitUntil: 'networkidle' });
    await newcomer.fill('input[formcontrolname="name"]', 'Rowan');
    await newcomer.fill('input[formcontrolname="password"]', 'a-long-stair-light-passphrase');
    await newcomer.click('button:has-text("Join")');
    await newcomer.waitForSelector('mat-toolbar [data-testid="role"]', { timeout: 15_000 });
    expect(await newcomer.locator('[data-testid="role"]').innerText()).toBe('estimator');
    await newcomer.click('button[aria-label="Toggle navigation"]');
    const newcomerSections = await sections(newcomer);
    expect(newcomerSections).toEqual(expect.arrayContaining(['Traffic', 'Bench']));
    expect(newcomerSections).not.toContain('Team');
    expect(newcomerSections).not.toContain('Keys');

    // Back on the team page the invitation is no longer waiting and Rowan is a member.
    await admin.click('mat-nav-list a:has-text("Team")');
    await admin.locator(`tr[data-member="${NEWCOMER}"]`).waitFor({ timeout: 15_000 });
    expect(await admin.locator(`[data-invitation="${NEWCOMER}"]`).count()).toBe(0);
  });

  it('shows a viewer traffic but no bench, team, activity or operator pages', async () => {
    const viewer = await profiles.page(360); // a phone's width
    await viewer.goto(`${server.url}/traffic`, { waitUntil: 'networkidle' });
    await signIn(viewer, 'ines@harborlane.test'); // demo-scenario.md: Harbor Lane's viewer
    await viewer.waitForSelector('[data-testid="traffic-quota"]', { timeout: 15_000 });
    await viewer.screenshot({ path: path.join(SCREENSHOTS, 'traffic-viewer-phone.png'), fullPage: true });
    await viewer.click('button[aria-label="Toggle navigation"]');
    const listed = await sections(viewer);
    expect(listed).toContain('Traffic');
    for (const hidden of ['Bench', 'Team', 'Activity', 'Organisations', 'Mail outbox']) expect(listed).not.toContain(hidden);
    for (const page of ['/bench', '/team', '/activity', '/operator/outbox']) {
      await viewer.goto(`${server.url}${page}`, { waitUntil: 'networkidle' });
      await viewer.waitForSelector('[data-testid="not-allowed"]', { timeout: 15_000 });
    }
  });
});
