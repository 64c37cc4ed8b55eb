import type { Page } from 'playwright-core';

/** The documented demo password (api/db/demo-data.ts, printed at the first start). */
export const DEMO_PASSWORD = 'treadwise-demo';

/** Fills the console's sign-in page, which any signed-in page sends a visitor to first. */
export async function signIn(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
  await page.waitForSelector('[data-testid="email"]', { timeout: 15_000 });
  await page.fill('[data-testid="email"]', email);
  await page.fill('[data-testid="password"]', password);
  await page.click('[data-testid="sign-in"]');
  await page.waitForSelector('mat-toolbar [data-testid="organization"]', { timeout: 15_000 });
}
