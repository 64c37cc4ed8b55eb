import { and, desc, eq } from 'drizzle-orm';
import type { EstimateInput } from '../../shared/schemas/estimate.js';
import type { PatchStair, Stair } from '../../shared/schemas/projects.js';
import type { Db } from '../db/client.js';
import { projects, projectStairs } from '../db/schema.js';
import { HttpProblem } from '../problem.js';
import { decodeCursor, toPage, type Page, type PageQuery } from './pagination.js';
import { afterCursor, isUuid, newestFirstCursor, type ProjectService } from './projects.js';

type StairRow = typeof projectStairs.$inferSelect;

export const stairNotFound = (id: string) => new HttpProblem(404, 'stair_not_found', 'Not found', `No stair ${id} in this project.`);

/** What a stair stores: the request as the client sent it (validated), so it runs as asked. */
export interface StairFields {
  name: string;
  notes?: string | null;
  input: EstimateInput | Record<string, unknown>;
}

function view(row: StairRow): Stair {
  return {
    id: row.id,
    projectId: row.projectId,
    name: row.name,
    notes: row.notes,
    input: row.input as unknown as Stair['input'],
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  };
}

/** A project's named stairs. The project is looked up in the caller's organisation first. */
export function createStairService({ db, clock, projects: projectService }: { db: Db; clock: () => Date; projects: ProjectService }) {
  const where = (organizationId: string, projectId: string, stairId: string) =>
    and(eq(projectStairs.organizationId, organizationId), eq(projectStairs.projectId, projectId), eq(projectStairs.id, stairId));

  async function row(organizationId: string, projectId: string, stairId: string): Promise<StairRow> {
    await projectService.row(organizationId, projectId);
    if (!isUuid(stairId)) throw stairNotFound(stairId);
    const [found] = await db.select().from(projectStairs).where(where(organizationId, projectId, stairId));
    if (!found) throw stairNotFound(stairId);
    return found;
  }

  /** A change to a stair is a change to its project: the project's updatedAt moves too. */
  const touchProject = (tx: Db, projectId: string, at: Date) => tx.update(projects).set({ updatedAt: at }).where(eq(projects.id, projectId));

  return {
    row,

    async get(organizationId: string, projectId: string, stairId: string): Promise<Stair> {
      return view(await row(organizationId, projectId, stairId));
    },

    async create(organizationId: string, projectId: string, fields: StairFields): Promise<Stair> {
      await projectService.row(organizationId, projectId);
      const now = clock();
      return db.transaction(async (tx) => {
        const [created] = await tx
          .insert(projectStairs)
          .values({ organizationId, projectId, name: fields.name, notes: fields.notes ?? null, input: fields.input as Record<string, unknown>, createdAt: now, updatedAt: now })
          .returning();
        await touchProject(tx, projectId, now);
        return view(created);
      });
    },

    async list(organizationId: string, projectId: string, page: PageQuery): Promise<Page<Stair>> {
      await projectService.row(organizationId, projectId);
      const cursor = decodeCursor(page.cursor, newestFirstCursor);
      const rows = await db
        .select()
        .from(projectStairs)
        .where(and(eq(projectStairs.organizationId, organizationId), eq(projectStairs.projectId, projectId), afterCursor(projectStairs.createdAt, projectStairs.id, cursor)))
        .orderBy(desc(projectStairs.createdAt), desc(projectStairs.id))
        .limit(page.limit + 1);
      return toPage(rows, page.limit, view, (r) => [r.createdAt.toISOString(), r.id]);
    },

    async update(organizationId: string, projectId: string, stairId: string, patch: Omit<PatchStair, 'input'> & { input?: Record<string, unknown> }): Promise<{ stair: Stair; changed: boolean }> {
      const existing = await row(organizationId, projectId, stairId);
      const set: Partial<StairRow> = {};
      if (patch.name !== undefined && patch.name !== existing.name) set.name = patch.name;
      if (patch.notes !== undefined && patch.notes !== existing.notes) set.notes = patch.notes;
      if (patch.input !== undefined && JSON.stringify(patch.input) !== JSON.stringify(existing.input)) set.input = patch.input;
      if (Object.keys(set).length === 0) return { stair: view(existing), changed: false };
      const now = clock();
      return db.transaction(async (tx) => {
        const [updated] = await tx.update(projectStairs).set({ ...set, updatedAt: now }).where(where(organizationId, projectId, stairId)).returning();
        await touchProject(tx, projectId, now);
        return { stair: view(updated), changed: true };
      });
    },

    /** Deletes the stair with its stored estimates (foreign keys cascade). */
    async remove(organizationId: string, projectId: string, stairId: string): Promise<Stair> {
      const existing = await row(organizationId, projectId, stairId);
      await db.delete(projectStairs).where(where(organizationId, projectId, stairId));
      return view(existing);
    },
  };
}

export type StairService = ReturnType<typeof createStairService>;
