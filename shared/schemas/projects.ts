import { z } from 'zod';
import { estimateRequestSchema, estimateResponseSchema, estimateSummarySchema, estimateCheckSchema } from './estimate.js';
import { alderRowTownhouse } from './estimate-examples.js';
import { pageOf } from './page.js';
import { hasControlCharacter, nameText } from './text.js';

/**
 * Projects keep an installer's work: a project (client, site, notes) holds named stairs, each a
 * stored estimate request; running a stair stores an estimate (input, result, engine and catalog
 * versions, who ran it and when), and a re-run says what a new engine or catalog changed.
 */

/** Free text that may span lines (an address, notes), without control characters. */
function freeText(maxLength: number) {
  return z
    .string()
    .trim()
    .min(1)
    .max(maxLength)
    .refine((v) => !hasControlCharacter(v), 'must not contain control characters');
}

const EXAMPLE_PROJECT_ID = '3b9d2f4e-6a1c-4e8b-9f2d-7c5a1e0b4d63';
const EXAMPLE_STAIR_ID = '8e2c6a1f-4b7d-4c3e-a9f0-1d5b8e2c7a94';
const EXAMPLE_ESTIMATE_ID = 'c4a7e1d9-2f6b-4a8c-b3e5-9d0f1a2b6c78';
const EXAMPLE_USER_ID = '1f6d4c2a-8b3e-4f71-9a0c-5e2b7d9c1a34';
const EXAMPLE_TIME = '2026-12-01T10:00:00.000Z';

// ---- projects -----------------------------------------------------------------------------------

export const createProjectSchema = z
  .strictObject({
    name: nameText(120).meta({ description: 'What the installer calls the job.', example: 'Alder Row, house 7' }),
    clientName: nameText(120).optional().meta({ description: 'Who the work is for.', example: 'Kestrel & Finch Builders' }),
    siteAddress: freeText(300).optional().meta({ description: 'Where the stair is; may span lines.', example: '7 Alder Row\nMillbrook' }),
    notes: freeText(4000).optional().meta({ description: 'Anything the installer wants to keep with the job.' }),
  })
  .meta({
    id: 'CreateProjectRequest',
    description: 'A new project: its name, and optionally the client, the site address and notes.',
    example: { name: 'Alder Row, house 7', clientName: 'Kestrel & Finch Builders', siteAddress: '7 Alder Row\nMillbrook' },
  });
export type CreateProject = z.output<typeof createProjectSchema>;

export const patchProjectSchema = z
  .strictObject({
    name: nameText(120).optional(),
    clientName: nameText(120).nullable().optional().meta({ description: 'null removes it.' }),
    siteAddress: freeText(300).nullable().optional().meta({ description: 'null removes it.' }),
    notes: freeText(4000).nullable().optional().meta({ description: 'null removes them.' }),
  })
  .meta({ id: 'PatchProjectRequest', description: 'Changes the named fields of a project; the others stay.', example: { notes: 'Client asked for warm white.' } });
export type PatchProject = z.output<typeof patchProjectSchema>;

export const actorSchema = z
  .object({
    type: z.enum(['user', 'api_key']),
    id: z.string().meta({ description: 'The user’s id, or the API key’s public key id.' }),
  })
  .meta({ id: 'Actor', description: 'Who did it: a signed-in user or an API key.', example: { type: 'user', id: EXAMPLE_USER_ID } });
export type Actor = z.output<typeof actorSchema>;

export const projectSchema = z
  .object({
    id: z.uuid(),
    name: z.string(),
    clientName: z.string().nullable(),
    siteAddress: z.string().nullable(),
    notes: z.string().nullable(),
    stairCount: z.int().meta({ description: 'Stairs the project holds.' }),
    requestId: z.string().optional().meta({ description: 'On the answer that created it: the request id (a replayed answer keeps the first one).' }),
    createdBy: actorSchema,
    createdAt: z.string(),
    updatedAt: z.string(),
  })
  .meta({
    id: 'Project',
    description: 'A job: client, site and notes, holding named stairs.',
    example: {
      id: EXAMPLE_PROJECT_ID,
      name: 'Alder Row, house 7',
      clientName: 'Kestrel & Finch Builders',
      siteAddress: '7 Alder Row\nMillbrook',
      notes: null,
      stairCount: 1,
      createdBy: { type: 'user', id: EXAMPLE_USER_ID },
      createdAt: EXAMPLE_TIME,
      updatedAt: EXAMPLE_TIME,
    },
  });
export type Project = z.output<typeof projectSchema>;
export const projectPageSchema = pageOf(projectSchema, 'ProjectPage');

// ---- stairs -------------------------------------------------------------------------------------

export const createStairSchema = z
  .strictObject({
    name: nameText(120).meta({ description: 'Which stair of the site this is.', example: 'Main stair' }),
    notes: freeText(4000).optional(),
    // The stored estimate request: layout, geometry and choices, exactly as POST /v1/estimates takes it.
    input: estimateRequestSchema,
  })
  .meta({ id: 'CreateStairRequest', description: 'A named stair of a project: the estimate request it runs.', example: { name: 'Main stair', input: alderRowTownhouse } });
export type CreateStair = z.output<typeof createStairSchema>;

export const patchStairSchema = z
  .strictObject({
    name: nameText(120).optional(),
    notes: freeText(4000).nullable().optional().meta({ description: 'null removes them.' }),
    // Replaces the stored request as a whole; estimates already stored keep the input they ran.
    input: estimateRequestSchema.optional(),
  })
  .meta({ id: 'PatchStairRequest', description: 'Changes the named fields of a stair.', example: { name: 'Stair to the loft' } });
export type PatchStair = z.output<typeof patchStairSchema>;

export const stairSchema = z
  .object({
    id: z.uuid(),
    projectId: z.uuid(),
    name: z.string(),
    notes: z.string().nullable(),
    input: estimateRequestSchema,
    createdAt: z.string(),
    updatedAt: z.string(),
    requestId: z.string().optional().meta({ description: 'On the answer that created it: the request id (a replayed answer keeps the first one).' }),
  })
  .meta({
    id: 'Stair',
    description: 'A named stair: the estimate request it runs.',
    example: { id: EXAMPLE_STAIR_ID, projectId: EXAMPLE_PROJECT_ID, name: 'Main stair', notes: null, input: alderRowTownhouse, createdAt: EXAMPLE_TIME, updatedAt: EXAMPLE_TIME },
  });
export type Stair = z.output<typeof stairSchema>;
export const stairPageSchema = pageOf(stairSchema, 'StairPage');

/** Running a stair takes no options: it runs what the stair stores. */
export const runStairSchema = z.strictObject({}).meta({ id: 'RunStairRequest', description: 'Empty: the stair’s stored request is run.', example: {} });

// ---- stored estimates ---------------------------------------------------------------------------

const storedEstimateFields = {
  id: z.uuid(),
  projectId: z.uuid(),
  stairId: z.uuid(),
  engineVersion: z.string().meta({ description: 'Semver of the sizing engine that ran it.', example: '2.1.0' }),
  catalogVersion: z.int().nullable().meta({ description: 'Version of the stored catalog that priced it; null when unpriced or priced by an inline catalog.' }),
  pricingSource: z.enum(['inline', 'stored']).nullable().meta({ description: 'Which catalog priced it; null when unpriced.' }),
  ranBy: actorSchema,
  createdAt: z.string(),
  rerunOf: z.uuid().nullable().meta({ description: 'The stored estimate this one re-ran; null for a first run.' }),
};

export const storedEstimateSchema = z
  .object({
    ...storedEstimateFields,
    input: estimateRequestSchema, // as it was run
    result: estimateResponseSchema,
    requestId: z.string().optional().meta({ description: 'On the answer that created it: the request id (a replayed answer keeps the first one).' }),
  })
  .meta({ id: 'StoredEstimate', description: 'An estimate as it was run and stored: input, result, engine and catalog versions, who ran it and when.' });
export type StoredEstimate = z.output<typeof storedEstimateSchema>;

export const storedEstimateSummarySchema = z
  .object({
    ...storedEstimateFields,
    summary: estimateSummarySchema,
    bomTotal: z.number().nullable().meta({ description: 'Net total of the priced lines; null when unpriced.' }),
    gross: z.number().nullable().meta({ description: 'Gross total (net + tax) when a catalog priced it.' }),
    currency: z.string().nullable(),
  })
  .meta({ id: 'StoredEstimateSummary', description: 'One stored estimate in a list: its headline figures (GET the estimate for the whole result).' });
export const storedEstimatePageSchema = pageOf(storedEstimateSummarySchema, 'StoredEstimatePage');

// ---- what a re-run changed ----------------------------------------------------------------------

function change<T extends z.ZodType>(value: T, description: string) {
  return z.object({ old: value, new: value, changed: z.boolean() }).meta({ description });
}
const num = z.number().nullable();

export const estimateChangesSchema = z
  .object({
    changed: z.boolean().meta({ description: 'True when any figure, version or check status differs.' }),
    engineVersion: change(z.string(), 'Engine version old → new.'),
    catalogVersion: change(z.int().nullable(), 'Stored catalog version old → new (null: unpriced or an inline catalog).'),
    currency: change(z.string().nullable(), 'Currency of the totals old → new.'),
    figures: z.object({
      totalLoadW: change(z.number(), 'Total load, W.'),
      driverCount: change(z.int(), 'Drivers.'),
      worstDropPercent: change(z.number(), 'Worst end-to-end voltage drop, %.'),
      reels: change(z.int(), 'Reels to buy.'),
      bomTotal: change(num, 'Net total of the priced lines (null: unpriced).'),
      gross: change(num, 'Gross total, net + tax (null: no tax figures).'),
    }),
    checks: z
      .array(
        z.object({
          id: estimateCheckSchema.shape.id,
          oldStatus: z.enum(['pass', 'warn', 'fail']).nullable().meta({ description: 'null: the check was not made before.' }),
          newStatus: z.enum(['pass', 'warn', 'fail']).nullable().meta({ description: 'null: the check is no longer made.' }),
          message: z.string().meta({ description: 'The new run’s message (the old one’s when the check is gone).' }),
        }),
      )
      .meta({ description: 'Every check whose status changed, in the new run’s order (then those gone).' }),
  })
  .meta({
    id: 'EstimateChanges',
    description: 'What a re-run changed: the headline figures, the versions and every check whose status changed.',
    example: {
      changed: true,
      engineVersion: { old: '2.1.0', new: '2.1.0', changed: false },
      catalogVersion: { old: 21, new: 22, changed: true },
      currency: { old: 'EUR', new: 'EUR', changed: false },
      figures: {
        totalLoadW: { old: 119, new: 119, changed: false },
        driverCount: { old: 1, new: 1, changed: false },
        worstDropPercent: { old: 2.399, new: 2.399, changed: false },
        reels: { old: 3, new: 3, changed: false },
        bomTotal: { old: 310.4, new: 316.4, changed: true },
        gross: { old: 372.48, new: 379.68, changed: true },
      },
      checks: [],
    },
  });
export type EstimateChanges = z.output<typeof estimateChangesSchema>;

export const rerunEstimateSchema = z
  .object({ ...storedEstimateSchema.shape, changes: estimateChangesSchema })
  .meta({ id: 'RerunEstimate', description: 'The new stored estimate (its `rerunOf` names the old one) and what changed.' });

/** Path parameters. An id that is not a UUID is simply not found (404). */
export const projectParams = z.object({ id: z.string().meta({ description: 'The project’s id.', example: EXAMPLE_PROJECT_ID }) });
export const stairParams = projectParams.extend({ stairId: z.string().meta({ description: 'The stair’s id.', example: EXAMPLE_STAIR_ID }) });
export const estimateParams = z.object({ estimateId: z.string().meta({ description: 'The stored estimate’s id.', example: EXAMPLE_ESTIMATE_ID }) });
