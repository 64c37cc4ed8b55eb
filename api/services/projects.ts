import { and, desc, eq, lt, or, sql } from 'drizzle-orm';
import type { AnyPgColumn } from 'drizzle-orm/pg-core';
import { z } from 'zod';
import type { Actor, CreateProject, PatchProject, Project } from '../../shared/schemas/projects.js';
import type { Principal } from '../auth/principal.js';
import type { Db } from '../db/client.js';
import { projects } from '../db/schema.js';
import { HttpProblem } from '../problem.js';
import { decodeCursor, toPage, type Page, type PageQuery } from './pagination.js';

type ProjectRow = typeof projects.$inferSelect;

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
/** Ids arrive from the path: one that is not a UUID names nothing (a 404, not a database error). */
export const isUuid = (id: string) => UUID.test(id);

export const projectNotFound = (id: string) => new HttpProblem(404, 'project_not_found', 'Not found', `No project ${id} in this organisation.`);

/** Who acts: a user by id, an API key by its public key id. */
export function actorOf(p: Principal): Actor {
  if (p.type === 'user') return { type: 'user', id: p.userId };
  if (p.type === 'api_key') return { type: 'api_key', id: p.keyId };
  throw new Error('an anonymous caller cannot act on projects');
}

/** Newest first, ties by id: the cursor is the last row's `[createdAt, id]`. */
export const newestFirstCursor = z.tuple([z.iso.datetime(), z.uuid()]);

/** Rows after the cursor in newest-first order. */
export function afterCursor(createdAt: AnyPgColumn, id: AnyPgColumn, cursor: [string, string] | undefined) {
  if (!cursor) return undefined;
  const at = new Date(cursor[0]);
  return or(lt(createdAt, at), and(eq(createdAt, at), lt(id, cursor[1])));
}

// Spelt out: drizzle writes columns unqualified in a one-table select, which inside the subquery
// would compare project_stairs' own columns.
const stairCount = sql<number>`(select count(*) from "project_stairs" as "s" where "s"."project_id" = "projects"."id")`.mapWith(Number);

function view(row: ProjectRow, stairs: number): Project {
  return {
    id: row.id,
    name: row.name,
    clientName: row.clientName,
    siteAddress: row.siteAddress,
    notes: row.notes,
    stairCount: stairs,
    createdBy: { type: row.createdByType, id: row.createdById },
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  };
}

/** An organisation's projects. Every query filters by organisation: another one's project is a 404. */
export function createProjectService({ db, clock }: { db: Db; clock: () => Date }) {
  async function row(organizationId: string, id: string): Promise<ProjectRow> {
    if (!isUuid(id)) throw projectNotFound(id);
    const [found] = await db.select().from(projects).where(and(eq(projects.organizationId, organizationId), eq(projects.id, id)));
    if (!found) throw projectNotFound(id);
    return found;
  }

  async function get(organizationId: string, id: string): Promise<Project> {
    if (!isUuid(id)) throw projectNotFound(id);
    const [found] = await db
      .select({ project: projects, stairs: stairCount })
      .from(projects)
      .where(and(eq(projects.organizationId, organizationId), eq(projects.id, id)));
    if (!found) throw projectNotFound(id);
    return view(found.project, found.stairs);
  }

  return {
    row,
    get,

    async create(organizationId: string, actor: Actor, body: CreateProject): Promise<Project> {
      const now = clock();
      const [created] = await db
        .insert(projects)
        .values({
          organizationId,
          name: body.name,
          clientName: body.clientName ?? null,
          siteAddress: body.siteAddress ?? null,
          notes: body.notes ?? null,
          createdByType: actor.type,
          createdById: actor.id,
          createdAt: now,
          updatedAt: now,
        })
        .returning();
      return view(created, 0);
    },

    async list(organizationId: string, page: PageQuery): Promise<Page<Project>> {
      const cursor = decodeCursor(page.cursor, newestFirstCursor);
      const rows = await db
        .select({ project: projects, stairs: stairCount })
        .from(projects)
        .where(and(eq(projects.organizationId, organizationId), afterCursor(projects.createdAt, projects.id, cursor)))
        .orderBy(desc(projects.createdAt), desc(projects.id))
        .limit(page.limit + 1);
      return toPage(rows, page.limit, (r) => view(r.project, r.stairs), (r) => [r.project.createdAt.toISOString(), r.project.id]);
    },

    async update(organizationId: string, id: string, patch: PatchProject): Promise<{ project: Project; changed: boolean }> {
      const existing = await row(organizationId, id);
      const set: Partial<ProjectRow> = {};
      for (const field of ['name', 'clientName', 'siteAddress', 'notes'] as const) {
        const value = patch[field];
        if (value !== undefined && value !== existing[field]) (set as Record<string, string | null>)[field] = value;
      }
      if (Object.keys(set).length === 0) return { project: await get(organizationId, id), changed: false };
      await db
        .update(projects)
        .set({ ...set, updatedAt: clock() })
        .where(and(eq(projects.organizationId, organizationId), eq(projects.id, id)));
      return { project: await get(organizationId, id), changed: true };
    },

    /** Deletes the project with its stairs and their stored estimates (foreign keys cascade). */
    async remove(organizationId: string, id: string): Promise<Project> {
      const project = await get(organizationId, id);
      await db.delete(projects).where(and(eq(projects.organizationId, organizationId), eq(projects.id, id)));
      return project;
    },
  };
}

export type ProjectService = ReturnType<typeof createProjectService>;
