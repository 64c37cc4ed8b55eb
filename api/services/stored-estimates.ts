import { and, desc, eq, sql } from 'drizzle-orm';
import { estimateRequestSchema, type EstimateInput, type EstimatePricing, type EstimateResult } from '../../shared/schemas/estimate.js';

type EstimateSummary = EstimateResult['summary'];
import type { Actor, EstimateChanges, StoredEstimate } from '../../shared/schemas/projects.js';
import { catalogVersionOf, diffEstimates } from '../../shared/sizing/estimate-diff.js';
import type { Db } from '../db/client.js';
import { projects, projectStairs, storedEstimates } from '../db/schema.js';
import { zodFieldErrors } from '../middleware/validate.js';
import { HttpProblem } from '../problem.js';
import { serializeAnswer } from '../routes/calculation-route.js';
import { decodeCursor, toPage, type Page, type PageQuery } from './pagination.js';
import { afterCursor, isUuid, newestFirstCursor } from './projects.js';
import type { StairService } from './stairs.js';

type EstimateRow = typeof storedEstimates.$inferSelect;

/** Runs an estimate for an organisation: the engine, priced from the organisation's catalog when it has one. */
export type EstimateRunner = (organizationId: string, input: EstimateInput) => Promise<EstimateResult>;

export const estimateNotFound = (id: string) => new HttpProblem(404, 'estimate_not_found', 'Not found', `No stored estimate ${id} in this organisation.`);

/** A stored request parsed again before it runs: the schema may have grown stricter since it was kept. */
function parseStored(raw: unknown): EstimateInput {
  const parsed = estimateRequestSchema.safeParse(raw);
  if (parsed.success) return parsed.data;
  throw new HttpProblem(422, 'stored_input_invalid', 'Stored request no longer valid', 'The stored estimate request does not pass today’s rules; change the stair’s input (PATCH) and run it again.', {
    errors: zodFieldErrors(parsed.error).map((e) => ({ path: `input.${e.path}`, message: e.message })),
  });
}

export interface PreparedRun {
  organizationId: string;
  projectId: string;
  stairId: string;
  /** The request as the client sent it (stored as is). */
  raw: Record<string, unknown>;
  /** The same, parsed: what the engine runs. */
  input: EstimateInput;
  rerunOf: EstimateRow | null;
}

export interface StoredEstimateSummaryView {
  id: string;
  projectId: string;
  stairId: string;
  engineVersion: string;
  catalogVersion: number | null;
  pricingSource: 'inline' | 'stored' | null;
  ranBy: Actor;
  createdAt: string;
  rerunOf: string | null;
  summary: EstimateSummary;
  bomTotal: number | null;
  gross: number | null;
  currency: string | null;
}

function view(row: EstimateRow): StoredEstimate {
  return {
    id: row.id,
    projectId: row.projectId,
    stairId: row.stairId,
    engineVersion: row.engineVersion,
    catalogVersion: row.catalogVersion,
    pricingSource: row.pricingSource,
    ranBy: { type: row.ranByType, id: row.ranById },
    createdAt: row.createdAt.toISOString(),
    rerunOf: row.rerunOf,
    input: row.input as unknown as StoredEstimate['input'],
    result: row.result as unknown as EstimateResult,
  };
}

/** Stored estimates: a stair's runs and re-runs, each with what made it. */
export function createStoredEstimateService({ db, clock, stairs, runner }: { db: Db; clock: () => Date; stairs: StairService; runner: EstimateRunner }) {
  async function row(organizationId: string, estimateId: string): Promise<EstimateRow> {
    if (!isUuid(estimateId)) throw estimateNotFound(estimateId);
    const [found] = await db.select().from(storedEstimates).where(and(eq(storedEstimates.organizationId, organizationId), eq(storedEstimates.id, estimateId)));
    if (!found) throw estimateNotFound(estimateId);
    return found;
  }

  return {
    /** A stair's stored request, ready to run (404 for another organisation's project or stair). */
    async prepareRun(organizationId: string, projectId: string, stairId: string): Promise<PreparedRun> {
      const stair = await stairs.row(organizationId, projectId, stairId);
      return { organizationId, projectId, stairId, raw: stair.input, input: parseStored(stair.input), rerunOf: null };
    },

    /** A stored estimate's input, ready to run again. */
    async prepareRerun(organizationId: string, estimateId: string): Promise<PreparedRun> {
      const old = await row(organizationId, estimateId);
      return { organizationId, projectId: old.projectId, stairId: old.stairId, raw: old.input, input: parseStored(old.input), rerunOf: old };
    },

    /**
     * Runs with the current engine and catalog and stores the estimate. An answer over the size
     * ceiling is refused (422) before anything is stored. A re-run also says what changed.
     */
    async run(prepared: PreparedRun, actor: Actor): Promise<{ estimate: StoredEstimate; changes: EstimateChanges | null }> {
      const result = await runner(prepared.organizationId, prepared.input);
      serializeAnswer(result);
      const pricing: EstimatePricing | undefined = result.pricing;
      const [created] = await db
        .insert(storedEstimates)
        .values({
          organizationId: prepared.organizationId,
          projectId: prepared.projectId,
          stairId: prepared.stairId,
          input: prepared.raw,
          result: result as unknown as Record<string, unknown>,
          engineVersion: result.engineVersion,
          catalogVersion: catalogVersionOf(result),
          pricingSource: pricing?.source ?? (result.currency !== undefined ? 'inline' : null),
          ranByType: actor.type,
          ranById: actor.id,
          rerunOf: prepared.rerunOf?.id ?? null,
          createdAt: clock(),
        })
        .returning();
      const changes = prepared.rerunOf ? diffEstimates(prepared.rerunOf.result as unknown as EstimateResult, result) : null;
      return { estimate: view(created), changes };
    },

    async get(organizationId: string, estimateId: string): Promise<StoredEstimate> {
      return view(await row(organizationId, estimateId));
    },

    /** A stair's estimates, newest first, as headline figures (the results themselves stay in the database). */
    async list(organizationId: string, projectId: string, stairId: string, page: PageQuery): Promise<Page<StoredEstimateSummaryView>> {
      await stairs.row(organizationId, projectId, stairId);
      const cursor = decodeCursor(page.cursor, newestFirstCursor);
      const e = storedEstimates;
      const rows = await db
        .select({
          id: e.id,
          projectId: e.projectId,
          stairId: e.stairId,
          engineVersion: e.engineVersion,
          catalogVersion: e.catalogVersion,
          pricingSource: e.pricingSource,
          ranByType: e.ranByType,
          ranById: e.ranById,
          createdAt: e.createdAt,
          rerunOf: e.rerunOf,
          summary: sql<EstimateSummary>`${e.result} -> 'summary'`,
          bomTotal: sql<number | null>`${e.result} -> 'bomTotal'`,
          pricing: sql<EstimatePricing | null>`${e.result} -> 'pricing'`,
          currency: sql<string | null>`${e.result} -> 'currency'`,
        })
        .from(e)
        .where(and(eq(e.organizationId, organizationId), eq(e.stairId, stairId), afterCursor(e.createdAt, e.id, cursor)))
        .orderBy(desc(e.createdAt), desc(e.id))
        .limit(page.limit + 1);
      return toPage(
        rows,
        page.limit,
        (r): StoredEstimateSummaryView => ({
          id: r.id,
          projectId: r.projectId,
          stairId: r.stairId,
          engineVersion: r.engineVersion,
          catalogVersion: r.catalogVersion,
          pricingSource: r.pricingSource,
          ranBy: { type: r.ranByType, id: r.ranById },
          createdAt: r.createdAt.toISOString(),
          rerunOf: r.rerunOf,
          summary: r.summary,
          bomTotal: r.pricing?.net ?? r.bomTotal ?? null,
          gross: r.pricing?.gross ?? null,
          currency: r.pricing?.currency ?? r.currency ?? null,
        }),
        (r) => [r.createdAt.toISOString(), r.id],
      );
    },

    /** What the hand-over papers name: the estimate with its project and stair. */
    async withContext(organizationId: string, estimateId: string) {
      const estimate = view(await row(organizationId, estimateId));
      const [names] = await db
        .select({ projectName: projects.name, clientName: projects.clientName, siteAddress: projects.siteAddress, stairName: projectStairs.name })
        .from(projectStairs)
        .innerJoin(projects, eq(projects.id, projectStairs.projectId))
        .where(and(eq(projectStairs.id, estimate.stairId), eq(projectStairs.organizationId, organizationId)));
      return { estimate, names };
    },
  };
}

export type StoredEstimateService = ReturnType<typeof createStoredEstimateService>;
