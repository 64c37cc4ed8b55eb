import { and, asc, eq, gt, inArray } from 'drizzle-orm';
import { z } from 'zod';
import type { CreateOrganizationRequest, OrganizationView, UpdateOrganizationRequest } from '../../shared/schemas/accounts.js';
import type { Db } from '../db/client.js';
import { memberships, organizations, plans } from '../db/schema.js';
import { HttpProblem, problems } from '../problem.js';
import { decodeCursor, toPage, type Page, type PageQuery } from './pagination.js';

export type OrganizationRow = typeof organizations.$inferSelect;

export function organizationView(row: OrganizationRow): OrganizationView {
  return {
    id: row.id,
    slug: row.slug,
    name: row.name,
    planId: row.planId,
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  };
}

/** Whose organisations a listing shows: every one (operator), a user's own, or one (an API key's). */
export type OrganizationScope = { all: true } | { userId: string } | { organizationId: string };

const unknownPlan = (planId: string) =>
  new HttpProblem(400, 'unknown_plan', 'Unknown plan', `There is no plan ${planId}.`, { errors: [{ path: 'planId', message: 'no such plan' }] });

export function createOrganizationService({ db, clock }: { db: Db; clock: () => Date }) {
  async function assertPlan(planId: string, tx: Db) {
    const [plan] = await tx.select({ id: plans.id }).from(plans).where(eq(plans.id, planId));
    if (!plan) throw unknownPlan(planId);
  }

  return {
    view: organizationView,

    /** A new organisation; a taken slug is a 409 `slug_taken`, an unknown plan a 400. */
    async create(input: CreateOrganizationRequest, tx: Db = db): Promise<OrganizationView> {
      if (input.planId) await assertPlan(input.planId, tx);
      const now = clock();
      const [row] = await tx
        .insert(organizations)
        .values({ slug: input.slug, name: input.name, ...(input.planId ? { planId: input.planId } : {}), createdAt: now, updatedAt: now })
        .onConflictDoNothing({ target: organizations.slug })
        .returning();
      if (!row) throw problems.conflict('slug_taken', `The slug ${input.slug} is taken.`);
      return organizationView(row);
    },

    /** Ordered by slug (unique, so the cursor is the last slug served). */
    async list(scope: OrganizationScope, page: PageQuery): Promise<Page<OrganizationView>> {
      const after = decodeCursor(page.cursor, z.string());
      const visible =
        'userId' in scope
          ? inArray(organizations.id, db.select({ id: memberships.organizationId }).from(memberships).where(eq(memberships.userId, scope.userId)))
          : 'organizationId' in scope
            ? eq(organizations.id, scope.organizationId)
            : undefined;
      const rows = await db
        .select()
        .from(organizations)
        .where(and(visible, after ? gt(organizations.slug, after) : undefined))
        .orderBy(asc(organizations.slug))
        .limit(page.limit + 1);
      return toPage(rows, page.limit, organizationView, (r) => r.slug);
    },

    async get(id: string): Promise<OrganizationView | undefined> {
      if (!z.uuid().safeParse(id).success) return undefined;
      const [row] = await db.select().from(organizations).where(eq(organizations.id, id));
      return row && organizationView(row);
    },

    /** Whether a user may see an organisation (is a member of it). */
    async isMember(organizationId: string, userId: string): Promise<boolean> {
      const [row] = await db
        .select({ id: memberships.id })
        .from(memberships)
        .where(and(eq(memberships.organizationId, organizationId), eq(memberships.userId, userId)));
      return row !== undefined;
    },

    /** Renames or changes the plan; returns what changed, from → to, for the audit trail. */
    async update(id: string, input: UpdateOrganizationRequest): Promise<{ organization: OrganizationView; changes: Record<string, { from: string; to: string }> }> {
      if (!z.uuid().safeParse(id).success) throw problems.notFound('No such organisation.');
      return db.transaction(async (tx) => {
        const [current] = await tx.select().from(organizations).where(eq(organizations.id, id)).for('update');
        if (!current) throw problems.notFound('No such organisation.');
        if (input.planId !== undefined && input.planId !== current.planId) await assertPlan(input.planId, tx);
        const changes: Record<string, { from: string; to: string }> = {};
        if (input.name !== undefined && input.name !== current.name) changes.name = { from: current.name, to: input.name };
        if (input.planId !== undefined && input.planId !== current.planId) changes.planId = { from: current.planId, to: input.planId };
        if (Object.keys(changes).length === 0) return { organization: organizationView(current), changes };
        const [row] = await tx
          .update(organizations)
          .set({ name: input.name ?? current.name, planId: input.planId ?? current.planId, updatedAt: clock() })
          .where(eq(organizations.id, id))
          .returning();
        return { organization: organizationView(row), changes };
      });
    },
  };
}

export type OrganizationService = ReturnType<typeof createOrganizationService>;
