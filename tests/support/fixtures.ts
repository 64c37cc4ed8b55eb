import { randomBytes } from 'node:crypto';
import type { Scope } from '../../api/auth/scopes.js';
import type { KeyKind } from '../../api/auth/key-format.js';
import { organizations } from '../../api/db/schema.js';
import type { TestApp } from './test-app.js';

export async function createOrganization(t: TestApp, slug = `org-${randomBytes(3).toString('hex')}`) {
  const [org] = await t.database.db.insert(organizations).values({ slug, name: `Test ${slug}` }).returning();
  return org;
}

/** An API key made through the key service, as an admin would; returns the one-time token. */
export async function createKey(
  t: TestApp,
  organizationId: string,
  options: { kind?: KeyKind; scopes?: Scope[]; allowedOrigins?: string[]; expiresAt?: Date | null } = {},
) {
  const kind = options.kind ?? 'server';
  return t.app.locals.services.apiKeys.create({
    organizationId,
    kind,
    name: `${kind} test key`,
    scopes: options.scopes ?? (kind === 'embed' ? ['sizing:run'] : ['sizing:run', 'usage:read']),
    allowedOrigins: options.allowedOrigins ?? [],
    expiresAt: options.expiresAt ?? null,
    createdByUserId: null,
    createdByKeyId: null,
  });
}
