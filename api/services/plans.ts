import { eq } from 'drizzle-orm';
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
}

interface Entry {
  plan: Promise<Plan>;
  loadedAt: number;
}

/**
 * The plan of each organisation (plans are rows in `plans`, joined via organizations.plan_id),
 * cached so the rate limiter and the quota check never query on the hot path. A plan change
 * made on another instance is seen within `ttlMs`.
 */
export function createPlanService({ db, clock, ttlMs = 60_000 }: { db: Db; clock: () => Date; ttlMs?: number }) {
  const cache = new Map<string, Entry>();

  const load = async (organizationId: string): Promise<Plan> => {
    const [row] = await db
      .select({ id: plans.id, name: plans.name, monthlyQuota: plans.monthlyQuota, ratePerMinute: plans.ratePerMinute, maxApiKeys: plans.maxApiKeys, costPerMinute: plans.costPerMinute })
      .from(organizations)
      .innerJoin(plans, eq(plans.id, organizations.planId))
      .where(eq(organizations.id, organizationId));
    if (!row) throw new Error(`organisation ${organizationId} has no plan`);
    return row;
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

export type PlanService = ReturnType<typeof createPlanService>;
