import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';

const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
const ARGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'];

/** Fresh Chromium profiles, one per user, so one user's stored sign-in never leaks into another's test. */
export class BrowserProfiles {
  private readonly contexts: BrowserContext[] = [];
  private readonly dirs: string[] = [];

  async page(width = 1280): Promise<Page> {
    const dir = mkdtempSync(path.join(tmpdir(), 'treadwise-chromium-'));
    this.dirs.push(dir);
    const context = await chromium.launchPersistentContext(dir, { executablePath: CHROMIUM, headless: true, viewport: { width, height: 800 }, acceptDownloads: true, args: ARGS });
    this.contexts.push(context);
    return context.newPage();
  }

  async close(): Promise<void> {
    for (const context of this.contexts) await context.close();
    for (const dir of this.dirs) rmSync(dir, { recursive: true, force: true });
  }
}
