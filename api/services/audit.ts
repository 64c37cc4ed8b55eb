import { and, desc, eq, lt } from 'drizzle-orm';
import { z } from 'zod';
import type { Request, Response } from 'express';
import type { Db } from '../db/client.js';
import { auditEvents } from '../db/schema.js';
import { principalOf, type Principal } from '../auth/principal.js';
import { decodeCursor, toPage, type Page, type PageQuery } from './pagination.js';

export interface AuditEntry {
  action: string; // <resource>.<verb>, e.g. api_key.created
  organizationId: string | null;
  targetType?: string;
  targetId?: string;
  data?: Record<string, unknown>;
}

export interface AuditContext {
  principal: Principal;
  requestId: string | null;
  ip: string | null;
}

export interface AuditEventView {
  id: string;
  action: string;
  actor: { type: string; id: string | null };
  target: { type: string | null; id: string | null };
  requestId: string | null;
  ip: string | null;
  data: Record<string, unknown> | null;
  createdAt: string;
}

export function auditContext(req: Request, res: Response): AuditContext {
  return { principal: principalOf(res), requestId: String(req.id ?? ''), ip: req.ip ?? null };
}

function actorOf(p: Principal): { actorType: 'user' | 'api_key' | 'anonymous'; actorId: string | null } {
  if (p.type === 'user') return { actorType: 'user', actorId: p.userId };
  if (p.type === 'api_key') return { actorType: 'api_key', actorId: p.keyId };
  return { actorType: 'anonymous', actorId: null };
}

/** Who did what to what, when and from where. Secrets never go in `data`. */
export function createAuditService({ db, clock }: { db: Db; clock: () => Date }) {
  return {
    async record(ctx: AuditContext, entry: AuditEntry, tx: Db = db): Promise<void> {
      await tx.insert(auditEvents).values({
        organizationId: entry.organizationId,
        action: entry.action,
        ...actorOf(ctx.principal),
        targetType: entry.targetType ?? null,
        targetId: entry.targetId ?? null,
        requestId: ctx.requestId,
        ip: ctx.ip,
        data: entry.data ?? null,
        createdAt: clock(),
      });
    },

    /** Newest first; organisation-scoped (null: the operator's view of every organisation). */
    async list(organizationId: string | null, page: PageQuery & { action?: string }): Promise<Page<AuditEventView>> {
      const before = decodeCursor(page.cursor, z.number().int().positive());
      const rows = await db
        .select()
        .from(auditEvents)
        .where(
          and(
            organizationId ? eq(auditEvents.organizationId, organizationId) : undefined,
            page.action ? eq(auditEvents.action, page.action) : undefined,
            before ? lt(auditEvents.id, before) : undefined,
          ),
        )
        .orderBy(desc(auditEvents.id))
        .limit(page.limit + 1);
      return toPage(
        rows,
        page.limit,
        (r): AuditEventView => ({
          id: String(r.id),
          action: r.action,
          actor: { type: r.actorType, id: r.actorId },
          target: { type: r.targetType, id: r.targetId },
          requestId: r.requestId,
          ip: r.ip,
          data: r.data ?? null,
          createdAt: r.createdAt.toISOString(),
        }),
        (r) => r.id,
      );
    },
  };
}

export type AuditService = ReturnType<typeof createAuditService>;
