import { asc, eq, isNotNull } from 'drizzle-orm';
import type { Db } from '../db/client.js';
import { organizations, plans } from '../db/schema.js';

export interface Plan {
  id: string;
  name: string;
  monthlyQuota: number;
  ratePerMinute: number;
  maxApiKeys: number;
  /** Sizing work units one key may spend per minute (the cost budget). */
  costPerMinute: number;
  /** Set: calls beyond the monthly quota go on and are billed (never quota_exceeded). */
  overage: { per1000Minor: number; currency: string } | null;
}

interface Entry {
  plan: Promise<Plan>;
  loadedAt: number;
}

/**
 * The plan of each organisation (plans are rows in `plans`, joined via organizations.plan_id),
 * cached so the rate limiter and the quota check never query on the hot path. A plan change
 * reaches the other instances at once through the key-change channel (`plan:<id>`), and within
 * `ttlMs` if that channel is down.
 */
export function createPlanService({ db, clock, ttlMs = 60_000 }: { db: Db; clock: () => Date; ttlMs?: number }) {
  const cache = new Map<string, Entry>();

  const load = async (organizationId: string): Promise<Plan> => {
    const [row] = await db
      .select({
        id: plans.id,
        name: plans.name,
        monthlyQuota: plans.monthlyQuota,
        ratePerMinute: plans.ratePerMinute,
        maxApiKeys: plans.maxApiKeys,
        costPerMinute: plans.costPerMinute,
        overagePer1000Minor: plans.overagePer1000Minor,
        currency: plans.currency,
      })
      .from(organizations)
      .innerJoin(plans, eq(plans.id, organizations.planId))
      .where(eq(organizations.id, organizationId));
    if (!row) throw new Error(`organisation ${organizationId} has no plan`);
    const { overagePer1000Minor, currency, ...plan } = row;
    return { ...plan, overage: overagePer1000Minor !== null && currency ? { per1000Minor: overagePer1000Minor, currency } : null };
  };

  return {
    /** Concurrent callers share one query; a failed load is not cached. */
    forOrganization(organizationId: string): Promise<Plan> {
      const now = clock().getTime();
      const hit = cache.get(organizationId);
      if (hit && now - hit.loadedAt < ttlMs) return hit.plan;
      const plan = load(organizationId);
      if (cache.size >= 10_000) cache.clear();
      cache.set(organizationId, { plan, loadedAt: now });
      plan.catch(() => {
        if (cache.get(organizationId)?.plan === plan) cache.delete(organizationId);
      });
      return plan;
    },

    /** Call after changing an organisation's plan, so this instance applies it at once. */
    invalidate(organizationId: string): void {
      cache.delete(organizationId);
    },
  };
}

/** A plan as the billing page offers it; `price` is null for a plan that needs no payment. */
export interface PlanOffer {
  id: string;
  name: string;
  monthlyQuota: number;
  ratePerMinute: number;
  maxApiKeys: number;
  price: { monthlyMinor: number; currency: string } | null;
  overage: { per1000Minor: number } | null;
  graceDays: number;
  providerPriceId: string | null;
}

/** The plans organisations may choose (never the internal one), cheapest first. */
export async function offeredPlans(db: Db): Promise<PlanOffer[]> {
  const rows = await db.select().from(plans).where(eq(plans.offered, true)).orderBy(asc(plans.monthlyQuota));
  return rows.map((r) => ({
    id: r.id,
    name: r.name,
    monthlyQuota: r.monthlyQuota,
    ratePerMinute: r.ratePerMinute,
    maxApiKeys: r.maxApiKeys,
    price: r.monthlyPriceMinor !== null && r.currency !== null ? { monthlyMinor: r.monthlyPriceMinor, currency: r.currency } : null,
    overage: r.overagePer1000Minor !== null ? { per1000Minor: r.overagePer1000Minor } : null,
    graceDays: r.graceDays,
    providerPriceId: r.providerPriceId,
  }));
}

/** A price the provider sells, with the meter its overage is reported to (if any). */
export interface ProviderPrice {
  id: string;
  name: string;
  unitAmount: number;
  currency: string;
  meter?: { eventName: string; per1000Minor: number };
}

/** Every plan sold through the provider, for the local simulation's price list. */
export async function providerPrices(db: Db): Promise<ProviderPrice[]> {
  const rows = await db.select().from(plans).where(isNotNull(plans.providerPriceId));
  return rows.flatMap((r) =>
    r.providerPriceId && r.monthlyPriceMinor !== null && r.currency
      ? [
          {
            id: r.providerPriceId,
            name: `Treadwise ${r.name} plan`,
            unitAmount: r.monthlyPriceMinor,
            currency: r.currency,
            ...(r.overageMeter && r.overagePer1000Minor !== null && { meter: { eventName: r.overageMeter, per1000Minor: r.overagePer1000Minor } }),
          },
        ]
      : [],
  );
}

export type PlanService = ReturnType<typeof createPlanService>;
