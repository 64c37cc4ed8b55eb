import { count } from 'drizzle-orm';
import { formatKey, generateKey, hashSecret, type KeyKind } from '../auth/key-format.js';
import type { Database } from './client.js';
import { apiKeys, catalogItems, catalogs, organizations, projects, projectStairs } from './schema.js';
import { itemColumns } from '../services/catalog.js';
import { storedCatalogItemSchema } from '../../shared/schemas/catalog-store.js';
import { estimateRequestSchema } from '../../shared/schemas/estimate.js';
import { addMember } from '../services/members.js';
import { createUserService } from '../services/users.js';
import { DEMO_PASSWORD, demoCatalogs, demoProjects, demoEmbedKeyScopes, demoMembers, demoOperator, demoOrganizations, demoServerKeyScopes } from './demo-data.js';

const SEED_LOCK = 740_312;

export interface DemoKey {
  organization: string;
  kind: KeyKind;
  token: string;
  allowedOrigins: string[];
}

export interface SeedResult {
  seeded: boolean;
  reason: 'seeded' | 'disabled' | 'not-empty';
  /** Whole demo keys, known only now: printed once at the first start. */
  keys: DemoKey[];
}

export interface SeedOptions {
  /** Origins added to an organisation's demo page key, by slug (the local demo shop's addresses). */
  extraEmbedOrigins?: Record<string, readonly string[]>;
}

/**
 * Seeds the demo scenario into an empty database only, so a restart never duplicates it and a
 * database holding real data is never touched.
 */
export async function seedDemo(database: Database, enabled: boolean, pepper: Buffer, options: SeedOptions = {}): Promise<SeedResult> {
  if (!enabled) return { seeded: false, reason: 'disabled', keys: [] };
  return database.withLock(SEED_LOCK, async (db) => {
    const [{ n }] = await db.select({ n: count() }).from(organizations);
    if (n > 0) return { seeded: false, reason: 'not-empty' as const, keys: [] };
    const keys: DemoKey[] = [];
    await db.transaction(async (tx) => {
      const users = createUserService({ db: tx, clock: () => new Date() });
      await users.createUser({ ...demoOperator, password: DEMO_PASSWORD, operator: true });
      for (const demo of demoOrganizations) {
        const [org] = await tx.insert(organizations).values({ slug: demo.slug, name: demo.name, planId: demo.planId }).returning();
        const userIds = new Map<string, string>();
        for (const person of demoMembers.filter((m) => m.organization === demo.slug)) {
          const user = await users.createUser({ email: person.email, name: person.name, password: DEMO_PASSWORD });
          userIds.set(person.email, user.id);
          await addMember(tx, { organizationId: org.id, userId: user.id, role: person.role });
        }
        for (const kind of ['server', 'embed'] as const) {
          const key = generateKey(kind);
          const allowedOrigins = kind === 'embed' ? [...demo.embedOrigins, ...(options.extraEmbedOrigins?.[demo.slug] ?? [])] : [];
          await tx.insert(apiKeys).values({
            keyId: key.keyId,
            organizationId: org.id,
            kind,
            name: kind === 'server' ? 'Demo server key' : 'Demo page key',
            scopes: kind === 'server' ? demoServerKeyScopes : demoEmbedKeyScopes,
            allowedOrigins,
            secretHash: hashSecret(pepper, key.keyId, key.secret),
          });
          keys.push({ organization: demo.slug, kind, token: formatKey(kind, key.keyId, key.secret), allowedOrigins });
        }
        for (const catalog of demoCatalogs.filter((c) => c.organization === demo.slug)) {
          // Version 1: the seeded catalog is its first state.
          await tx.insert(catalogs).values({ organizationId: org.id, currency: catalog.currency, taxRateBasisPoints: Math.round(catalog.taxRatePercent * 100), version: 1 });
          for (const item of catalog.items) {
            await tx.insert(catalogItems).values({ organizationId: org.id, ...itemColumns(storedCatalogItemSchema.parse(item), catalog.currency) });
          }
        }
        for (const demoProject of demoProjects.filter((p) => p.organization === demo.slug)) {
          const { stairs, organization: _, createdBy, ...fields } = demoProject;
          const [project] = await tx
            .insert(projects)
            .values({ organizationId: org.id, ...fields, createdByType: 'user', createdById: userIds.get(createdBy)! })
            .returning();
          for (const stair of stairs) {
            estimateRequestSchema.parse(stair.input); // the demo stair is a valid request
            await tx.insert(projectStairs).values({ projectId: project.id, organizationId: org.id, name: stair.name, input: stair.input });
          }
        }
      }
    });
    return { seeded: true, reason: 'seeded' as const, keys };
  });
}
