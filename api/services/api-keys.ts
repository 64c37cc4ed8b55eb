import { and, count, desc, eq, gt, isNull, lt, or } from 'drizzle-orm';
import { z } from 'zod';
import type { Db } from '../db/client.js';
import { apiKeys, type OverlappingSecret } from '../db/schema.js';
import { formatKey, generateKey, hashSecret, newSecret, type KeyKind } from '../auth/key-format.js';
import type { Scope } from '../auth/scopes.js';
import { problems } from '../problem.js';
import { decodeCursor, toPage, type Page, type PageQuery } from './pagination.js';

export type ApiKeyRow = typeof apiKeys.$inferSelect;

/** What the API shows of a key: never the secret or its hash. */
export interface ApiKeyView {
  id: string;
  keyId: string;
  kind: KeyKind;
  name: string;
  scopes: string[];
  allowedOrigins: string[];
  expiresAt: string | null;
  lastUsedAt: string | null;
  revokedAt: string | null;
  previousSecretValidUntil: string | null;
  createdAt: string;
  status: 'active' | 'expired' | 'revoked';
}

export interface CreateKeyInput {
  organizationId: string;
  kind: KeyKind;
  name: string;
  scopes: readonly Scope[];
  allowedOrigins: readonly string[];
  expiresAt: Date | null;
  createdByUserId: string | null;
  createdByKeyId: string | null;
}

const iso = (d: Date | null) => (d ? d.toISOString() : null);

/** Older secrets a key may have in their overlap at once: enough for repeated rotations, bounded for the hot path. */
export const MAX_OVERLAPPING_SECRETS = 3;

function lastOverlapEnd(secrets: readonly OverlappingSecret[], now: Date): string | null {
  let last: string | null = null;
  for (const s of secrets) if (s.validUntil > now.toISOString() && (!last || s.validUntil > last)) last = s.validUntil;
  return last;
}
const cursorSchema = z.tuple([z.iso.datetime(), z.uuid()]);

export function createApiKeyService({ db, pepper, clock }: { db: Db; pepper: Buffer; clock: () => Date }) {
  const view = (row: ApiKeyRow): ApiKeyView => {
    const now = clock();
    const status = row.revokedAt ? 'revoked' : row.expiresAt && row.expiresAt <= now ? 'expired' : 'active';
    return {
      id: row.id,
      keyId: row.keyId,
      kind: row.kind,
      name: row.name,
      scopes: row.scopes,
      allowedOrigins: row.allowedOrigins,
      expiresAt: iso(row.expiresAt),
      lastUsedAt: iso(row.lastUsedAt),
      revokedAt: iso(row.revokedAt),
      previousSecretValidUntil: lastOverlapEnd(row.overlappingSecrets, now),
      createdAt: row.createdAt.toISOString(),
      status,
    };
  };

  /** Scoped to the organisation: another organisation's key is simply not found (404). */
  const find = async (organizationId: string, id: string): Promise<ApiKeyRow> => {
    if (!z.uuid().safeParse(id).success) throw problems.notFound('No such API key.');
    const [row] = await db
      .select()
      .from(apiKeys)
      .where(and(eq(apiKeys.id, id), eq(apiKeys.organizationId, organizationId)));
    if (!row) throw problems.notFound('No such API key.');
    return row;
  };

  const rotating = new Set<string>();
  const rotationInProgress = () => problems.conflict('rotation_in_progress', 'Another rotation of this key is running; try again when it has finished.');

  return {
    view,

    async create(input: CreateKeyInput): Promise<{ key: ApiKeyView; token: string }> {
      const generated = generateKey(input.kind);
      const [row] = await db
        .insert(apiKeys)
        .values({
          keyId: generated.keyId,
          organizationId: input.organizationId,
          kind: input.kind,
          name: input.name,
          scopes: [...input.scopes],
          allowedOrigins: [...input.allowedOrigins],
          secretHash: hashSecret(pepper, generated.keyId, generated.secret),
          expiresAt: input.expiresAt,
          createdByUserId: input.createdByUserId,
          createdByKeyId: input.createdByKeyId,
          createdAt: clock(),
        })
        .returning();
      return { key: view(row), token: generated.token };
    },

    async list(organizationId: string, page: PageQuery): Promise<Page<ApiKeyView>> {
      const after = decodeCursor(page.cursor, cursorSchema);
      const rows = await db
        .select()
        .from(apiKeys)
        .where(
          and(
            eq(apiKeys.organizationId, organizationId),
            after
              ? or(lt(apiKeys.createdAt, new Date(after[0])), and(eq(apiKeys.createdAt, new Date(after[0])), lt(apiKeys.id, after[1])))
              : undefined,
          ),
        )
        .orderBy(desc(apiKeys.createdAt), desc(apiKeys.id))
        .limit(page.limit + 1);
      return toPage(rows, page.limit, view, (r) => [r.createdAt.toISOString(), r.id]);
    },

    /** Keys that still work (not revoked, not expired): what the plan's key cap counts. */
    async countActive(organizationId: string): Promise<number> {
      const now = clock();
      const [row] = await db
        .select({ n: count() })
        .from(apiKeys)
        .where(and(eq(apiKeys.organizationId, organizationId), isNull(apiKeys.revokedAt), or(isNull(apiKeys.expiresAt), gt(apiKeys.expiresAt, now))));
      return row?.n ?? 0;
    },

    async get(organizationId: string, id: string): Promise<ApiKeyView> {
      return view(await find(organizationId, id));
    },

    /**
     * New secret; the old one keeps working for `overlapHours` (0 ends it at once). One rotation
     * of a key at a time: another arriving meanwhile is a 409, on this instance at once and across
     * instances through the conditional update below.
     */
    async rotate(organizationId: string, id: string, overlapHours: number): Promise<{ key: ApiKeyView; token: string; row: ApiKeyRow }> {
      if (rotating.has(id)) throw rotationInProgress();
      rotating.add(id);
      try {
        return await rotateOnce(organizationId, id, overlapHours);
      } finally {
        rotating.delete(id);
      }
    },

    async revoke(organizationId: string, id: string): Promise<{ key: ApiKeyView; row: ApiKeyRow; changed: boolean }> {
      const current = await find(organizationId, id);
      if (current.revokedAt) return { key: view(current), row: current, changed: false };
      const [row] = await db
        .update(apiKeys)
        .set({ revokedAt: clock(), overlappingSecrets: [] })
        .where(eq(apiKeys.id, current.id))
        .returning();
      return { key: view(row), row, changed: true };
    },

    /** The hot path's lookup by public key id (cached by the caller). */
    async byKeyId(keyId: string): Promise<ApiKeyRow | undefined> {
      const [row] = await db.select().from(apiKeys).where(eq(apiKeys.keyId, keyId));
      return row;
    },
  };

  async function rotateOnce(organizationId: string, id: string, overlapHours: number): Promise<{ key: ApiKeyView; token: string; row: ApiKeyRow }> {
    const current = await find(organizationId, id);
    const now = clock();
    if (current.revokedAt) throw problems.conflict('key_revoked', 'A revoked key cannot be rotated.');
    if (current.expiresAt && current.expiresAt <= now) throw problems.conflict('key_expired', 'An expired key cannot be rotated.');
    const live = current.overlappingSecrets.filter((s) => s.validUntil > now.toISOString());
    if (live.length >= MAX_OVERLAPPING_SECRETS) {
      throw problems.conflict('overlaps_exhausted', `This key already has ${live.length} older secrets in their overlap; wait until one ends (${live[0].validUntil}) or revoke the key.`);
    }
    const overlapMs = overlapHours * 3600 * 1000;
    const secret = newSecret();
    const [row] = await db
      .update(apiKeys)
      .set({
        secretHash: hashSecret(pepper, current.keyId, secret),
        // Every overlap granted earlier runs its course; only ended ones are dropped.
        overlappingSecrets: [
          ...current.overlappingSecrets.filter((s) => s.validUntil > now.toISOString()),
          ...(overlapMs > 0 ? [{ hash: current.secretHash, validUntil: new Date(now.getTime() + overlapMs).toISOString() }] : []),
        ],
      })
      // Only if nobody rotated it meanwhile: two rotations at once must not hand out a dead token.
      .where(and(eq(apiKeys.id, current.id), eq(apiKeys.secretHash, current.secretHash)))
      .returning();
    if (!row) throw rotationInProgress();
    return { key: view(row), token: formatKey(row.kind, row.keyId, secret), row };
  }
}

export type ApiKeyService = ReturnType<typeof createApiKeyService>;
