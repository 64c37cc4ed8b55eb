import { z } from 'zod';
import { engineVersionSchema } from './common.js';
import { estimateResponseSchema, estimateSummarySchema } from './estimate.js';
import { alderRowCornerUnit, alderRowTownhouse, quaysideCorridor } from './estimate-examples.js';
import { nameText } from './text.js';

/**
 * A synchronous batch: up to MAX_BATCH_ITEMS estimate requests in one call, each validated and
 * sized on its own, so one bad item never fails the others. Bigger inputs go to batch jobs.
 */

/** Items in one synchronous batch (the API contract's fixed bound; larger sets are batch jobs). */
export const MAX_BATCH_ITEMS = 500;
/** Longest stair reference: a plot, flat or order number with a little text (common practice, no published source). */
export const MAX_BATCH_REF_LENGTH = 120;

export const BATCH_DETAILS = ['summary', 'full'] as const;
export type BatchDetail = (typeof BATCH_DETAILS)[number];

export const batchRefSchema = nameText(MAX_BATCH_REF_LENGTH).meta({
  description: 'Your reference for the stair (a plot or order number), echoed in its answer.',
  example: 'Plot 14',
});

export const estimateBatchItemSchema = z
  .strictObject({
    ref: batchRefSchema.optional(),
    // Checked item by item against EstimateRequest in the route, so a bad item is answered on its own.
    request: z.unknown().meta({
      description:
        'An estimate request exactly as `POST /v1/estimates` takes it (the `EstimateRequest` schema). It is validated on its own: ' +
        'an invalid one is answered as that item’s problem, never as a 400 for the batch.',
      example: alderRowTownhouse,
    }),
  })
  .meta({ id: 'EstimateBatchItem', description: 'One stair of a batch: your reference and its estimate request.' });

export const estimateBatchRequestSchema = z
  .strictObject({
    items: z
      .array(estimateBatchItemSchema)
      .min(1)
      .max(MAX_BATCH_ITEMS)
      .meta({ description: `1 to ${MAX_BATCH_ITEMS} stairs; each uses one unit of the monthly quota.` }),
  })
  .meta({
    id: 'EstimateBatchRequest',
    description: `Up to ${MAX_BATCH_ITEMS} estimate requests sized in one call.`,
    example: {
      items: [
        { ref: 'Plot 14', request: alderRowTownhouse },
        { ref: 'Plot 15', request: alderRowCornerUnit },
        { ref: 'Quayside corridor', request: quaysideCorridor },
      ],
    },
  });
export type EstimateBatchRequest = z.output<typeof estimateBatchRequestSchema>;

export const estimateBatchQuerySchema = z
  .strictObject({
    detail: z.enum(BATCH_DETAILS).default('summary').meta({
      description: '`summary` (default): per item its headline figures, failing checks and `bomTotal`; `full` adds the whole estimate as `result`.',
    }),
  })
  .meta({ id: 'EstimateBatchQuery' });

const itemProblemSchema = z
  .object({
    code: z.string().meta({ example: 'validation_failed' }),
    detail: z.string(),
    errors: z
      .array(z.object({ path: z.string(), message: z.string() }))
      .optional()
      .meta({ description: 'Field errors, paths relative to the item’s `request` (`staircase.treads`).' }),
  })
  .meta({ id: 'EstimateBatchItemProblem', description: 'Why one item was not sized: the problem a single `POST /v1/estimates` would have answered.' });

const itemBase = {
  index: z.int().min(0).meta({ description: 'Position of the item in the request, from 0.' }),
  ref: z.string().nullable().meta({ description: 'The item’s `ref`, or null when it sent none.' }),
};

export const estimateBatchOkItemSchema = z
  .object({
    ...itemBase,
    status: z.literal('ok'),
    layout: z.string(),
    summary: estimateSummarySchema,
    failingChecks: z.array(z.string()).meta({ description: 'Ids of the checks that fail (a design that breaks a limit is still `ok`).' }),
    warningChecks: z.array(z.string()).meta({ description: 'Ids of the checks that warn.' }),
    bomTotal: z.number().optional(),
    currency: z.string().optional(),
    result: estimateResponseSchema.optional().meta({ description: 'The whole estimate, with `detail=full` only.' }),
  })
  .meta({ id: 'EstimateBatchOkItem', description: 'A sized item.' });

export const estimateBatchErrorItemSchema = z
  .object({ ...itemBase, status: z.literal('error'), problem: itemProblemSchema })
  .meta({ id: 'EstimateBatchErrorItem', description: 'An item that could not be sized.' });

export const estimateBatchItemResultSchema = z.discriminatedUnion('status', [estimateBatchOkItemSchema, estimateBatchErrorItemSchema]);
export type EstimateBatchItemResult = z.output<typeof estimateBatchItemResultSchema>;

export const estimateBatchSummarySchema = z
  .object({
    items: z.int().min(0),
    ok: z.int().min(0).meta({ description: 'Items sized (their designs may still fail checks).' }),
    failed: z.int().min(0).meta({ description: 'Items answered with a problem.' }),
    withFailingChecks: z.int().min(0).meta({ description: 'Sized items with at least one failing check.' }),
    failingChecks: z
      .array(z.object({ id: z.string(), items: z.int().min(1) }))
      .meta({ description: 'For each check id that fails somewhere, how many items it fails in; most first.' }),
  })
  .meta({ id: 'EstimateBatchSummary', description: 'Counts over the whole batch.' });
export type EstimateBatchSummary = z.output<typeof estimateBatchSummarySchema>;

export const estimateBatchResponseSchema = z
  .object({
    engineVersion: engineVersionSchema,
    detail: z.enum(BATCH_DETAILS),
    summary: estimateBatchSummarySchema,
    items: z.array(estimateBatchItemResultSchema).meta({ description: 'One answer per item, in the order sent.' }),
  })
  .meta({ id: 'EstimateBatchResponse', description: 'Each item’s own result or problem, and counts over the batch.' });
