import { and, eq, gte, inArray, isNotNull, isNull, lte, sql } from 'drizzle-orm';
import type { Logger } from 'pino';
import type Stripe from 'stripe';
import type { Db } from '../db/client.js';
import { billingAccounts, organizations, overageReports, plans, usageCounters } from '../db/schema.js';

const DAY_MS = 24 * 3600 * 1000;
/** A day is reported once it has been over this long: usage reaches the database in flushes a few seconds apart. */
export const OVERAGE_SETTLE_MS = 3600 * 1000;
/** Finished days looked back at; the provider takes meter events up to 35 days old. */
export const OVERAGE_LOOKBACK_DAYS = 30;

const isoDay = (at: Date) => at.toISOString().slice(0, 10);
const addDays = (day: string, n: number) => isoDay(new Date(Date.parse(`${day}T00:00:00Z`) + n * DAY_MS));

/**
 * Units beyond the monthly quota used on each day: the day's share of the month's running total
 * above the quota (the month's days add up to max(0, month total − quota)).
 */
export function overageByDay(days: { day: string; units: number }[], monthlyQuota: number): Map<string, number> {
  const out = new Map<string, number>();
  const byMonth = new Map<string, { day: string; units: number }[]>();
  for (const d of days) byMonth.set(d.day.slice(0, 7), [...(byMonth.get(d.day.slice(0, 7)) ?? []), d]);
  for (const list of byMonth.values()) {
    let total = 0;
    for (const d of list.sort((a, b) => a.day.localeCompare(b.day))) {
      const before = Math.max(0, total - monthlyQuota);
      total += d.units;
      const beyond = Math.max(0, total - monthlyQuota) - before;
      if (beyond > 0) out.set(d.day, beyond);
    }
  }
  return out;
}

/**
 * Reports to the provider, as meter events, the overage of every organisation on a plan with
 * overage, for each finished UTC day not yet reported. Exactly once per organisation and day:
 * the overage_reports row is written first (a second instance or run finds it), the event carries
 * the row's identifier (the provider drops a second event with it, so a crash between the call
 * and `reported_at` costs nothing), and rows left unreported are sent again on the next run. The
 * provider keeps identifiers (and idempotency keys) for at least 24 hours; the next run comes
 * within minutes, so only a crash followed by a day's downtime could bill a day twice.
 */
export async function reportOverage({ db, sdk, clock, logger }: { db: Db; sdk: Stripe; clock: () => Date; logger: Logger }): Promise<number> {
  const now = clock();
  const lastDay = addDays(isoDay(new Date(now.getTime() - OVERAGE_SETTLE_MS)), -1);
  const firstDay = addDays(lastDay, -(OVERAGE_LOOKBACK_DAYS - 1));
  const monthStart = `${firstDay.slice(0, 7)}-01`;

  const orgs = await db
    .select({ organizationId: organizations.id, monthlyQuota: plans.monthlyQuota, meter: plans.overageMeter, customerId: billingAccounts.customerId })
    .from(organizations)
    .innerJoin(plans, eq(plans.id, organizations.planId))
    .innerJoin(billingAccounts, eq(billingAccounts.organizationId, organizations.id))
    .where(isNotNull(plans.overageMeter));
  if (orgs.length > 0) {
    const usage = await db
      .select({ organizationId: usageCounters.organizationId, day: usageCounters.day, units: sql<string>`sum(${usageCounters.units})` })
      .from(usageCounters)
      .where(and(inArray(usageCounters.organizationId, orgs.map((o) => o.organizationId)), gte(usageCounters.day, monthStart), lte(usageCounters.day, lastDay)))
      .groupBy(usageCounters.organizationId, usageCounters.day);
    const rows: (typeof overageReports.$inferInsert)[] = [];
    for (const org of orgs) {
      const days = usage.filter((u) => u.organizationId === org.organizationId).map((u) => ({ day: u.day, units: Number(u.units) }));
      for (const [day, units] of overageByDay(days, org.monthlyQuota)) {
        if (day >= firstDay) rows.push({ organizationId: org.organizationId, day, units, identifier: `${org.organizationId}:${day}` });
      }
    }
    // A day already recorded keeps its first count: it is what the provider was (or will be) sent.
    if (rows.length > 0) await db.insert(overageReports).values(rows).onConflictDoNothing();
  }

  const pending = await db
    .select({ organizationId: overageReports.organizationId, day: overageReports.day, units: overageReports.units, identifier: overageReports.identifier, meter: plans.overageMeter, customerId: billingAccounts.customerId })
    .from(overageReports)
    .innerJoin(billingAccounts, eq(billingAccounts.organizationId, overageReports.organizationId))
    .innerJoin(organizations, eq(organizations.id, overageReports.organizationId))
    .innerJoin(plans, eq(plans.id, organizations.planId))
    .where(and(isNull(overageReports.reportedAt), isNotNull(plans.overageMeter), gte(overageReports.day, firstDay)));
  let sent = 0;
  for (const row of pending) {
    try {
      await sdk.billing.meterEvents.create({
        event_name: row.meter!,
        payload: { stripe_customer_id: row.customerId, value: String(row.units) },
        identifier: row.identifier,
        // The last second of the day the units were used on.
        timestamp: Math.floor(Date.parse(`${row.day}T23:59:59Z`) / 1000),
      }, { idempotencyKey: `overage:${row.identifier}` }); // a second guard: a retried request is answered from the first
    } catch (err) {
      // Left unreported: the next run sends it again under the same identifier.
      logger.warn({ err: { message: (err as Error).message }, organizationId: row.organizationId, day: row.day }, 'billing: overage not reported yet');
      continue;
    }
    await db.update(overageReports).set({ reportedAt: clock() }).where(eq(overageReports.identifier, row.identifier));
    sent += 1;
  }
  return sent;
}
