import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { plans } from '../../api/db/schema.js';
import { offeredPlans, providerPrices } from '../../api/services/plans.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => t.close());

describe('plan prices', () => {
  it('offers free, shop and partner with their monthly prices, overage and grace, never the internal plan', async () => {
    const offers = await offeredPlans(t.database.db);
    expect(offers.map((o) => [o.id, o.price, o.providerPriceId])).toEqual([
      ['free', null, null],
      ['shop', { monthlyMinor: 2900, currency: 'eur' }, 'price_treadwise_shop_monthly'],
      ['partner', { monthlyMinor: 9900, currency: 'eur' }, 'price_treadwise_partner_monthly'],
    ]);
    expect(offers.map((o) => [o.id, o.overage, o.graceDays])).toEqual([
      ['free', null, 0],
      ['shop', null, 7],
      ['partner', { per1000Minor: 40 }, 7],
    ]);
    const [platform] = await t.database.db.select().from(plans).where(eq(plans.id, 'platform'));
    expect(platform).toMatchObject({ offered: false, monthlyPriceMinor: null, providerPriceId: null });
  });

  it('gives the simulation exactly the priced plans to sell, with the overage meter', async () => {
    expect((await providerPrices(t.database.db)).sort((a, b) => a.unitAmount - b.unitAmount)).toEqual([
      { id: 'price_treadwise_shop_monthly', name: 'Treadwise Shop plan', unitAmount: 2900, currency: 'eur' },
      { id: 'price_treadwise_partner_monthly', name: 'Treadwise Partner plan', unitAmount: 9900, currency: 'eur', meter: { eventName: 'treadwise_units', per1000Minor: 40 } },
    ]);
  });

  it('refuses a second plan sold under the same provider price', async () => {
    await expect(t.database.db.insert(plans).values({ id: 'copy', name: 'Copy', monthlyQuota: 1, ratePerMinute: 1, providerPriceId: 'price_treadwise_shop_monthly' })).rejects.toThrow();
  });
});
