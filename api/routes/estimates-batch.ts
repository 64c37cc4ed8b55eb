import { Router, type RequestHandler, type Response } from 'express';
import {
  estimateBatchQuerySchema,
  estimateBatchRequestSchema,
  estimateBatchResponseSchema,
  MAX_BATCH_ITEMS,
  type BatchDetail,
  type EstimateBatchRequest,
} from '../../shared/schemas/estimate-batch.js';
import { checkBatchItem } from '../../shared/sizing/batch/items.js';
import { MAX_ANSWER_BYTES } from '../../shared/tables/limits.js';
import { organizationOf } from '../auth/principal.js';
import { costBudget } from '../middleware/cost-budget.js';
import { enforceQuotaUnits } from '../middleware/metering.js';
import { validateBody, validateQuery } from '../middleware/validate.js';
import { problemResponse } from '../openapi/document.js';
import { HttpProblem } from '../problem.js';
import { runBatch, summarize, type CheckedItem } from '../services/estimate-batch.js';
import { ENGINE_VERSION } from '../../shared/sizing/version.js';
import type { RouteModule } from './route-module.js';
import { estimateCost } from './sizing-costs.js';

export const ESTIMATE_BATCH_PATH = '/v1/estimates/batch';
/** Body cap of this route alone: 500 stairs with inline catalogs pass the API's usual JSON limit. */
export const BATCH_JSON_BODY_LIMIT = '4mb';
/**
 * Largest batch answer, bytes. A summary item is about 0.5 kB, so a summary batch stays near
 * 0.25 MB; a full estimate is about 30 kB, so 500 ordinary stairs with `detail=full` fit
 * (about 15 MB) while 500 of the largest designs would not: those get a 422 naming `detail=summary`.
 */
export const MAX_BATCH_ANSWER_BYTES = 24 * 1024 * 1024;

interface BatchLocals {
  body: EstimateBatchRequest;
  query: { detail: BatchDetail };
  batchItems: CheckedItem[];
}
const locals = (res: Response) => res.locals as unknown as BatchLocals;

/** Validates each item on its own with the schema POST /v1/estimates uses; a bad one becomes its problem. */
export function checkItems(body: EstimateBatchRequest): CheckedItem[] {
  return body.items.map((item, index) => checkBatchItem(index, item.ref ?? null, item.request));
}

/** The cost-budget charge: each valid item what one estimate of it costs, 1 for each refused one. */
export function batchCost(items: CheckedItem[]): number {
  return items.reduce((sum, item) => sum + ('input' in item ? estimateCost(item.input) : 1), 0);
}

/** The answer built from each item's own JSON, measured once, against the batch ceiling. */
function serializeBatch(detail: BatchDetail, answers: Awaited<ReturnType<typeof runBatch>>): string {
  const head = JSON.stringify({ engineVersion: ENGINE_VERSION, detail, summary: summarize(answers) });
  let bytes = Buffer.byteLength(head);
  const parts: string[] = [];
  for (const answer of answers) {
    const part = JSON.stringify(answer);
    bytes += Buffer.byteLength(part) + 1;
    if (bytes > MAX_BATCH_ANSWER_BYTES) {
      throw new HttpProblem(
        422,
        'answer_too_large',
        'Answer too large',
        `The batch answer would pass the ${MAX_BATCH_ANSWER_BYTES}-byte ceiling. Ask for detail=summary (headline figures, failing checks and bomTotal per item), or send fewer items.`,
      );
    }
    parts.push(part);
  }
  return `${head.slice(0, -1)},"items":[${parts.join(',')}]}`;
}

export const estimateBatchRoutes: RouteModule = {
  basePath: ESTIMATE_BATCH_PATH,
  router(deps, services) {
    const router = Router();
    const charge = costBudget(services, deps.logger);
    const quotaUnits = enforceQuotaUnits(deps);
    const check: RequestHandler = (_req, res, next) => {
      locals(res).batchItems = checkItems(locals(res).body);
      next();
    };
    // The whole batch is charged before any item runs: all of it fits, or none of it is sized.
    const chargeItems: RequestHandler = (req, res, next) => charge(() => batchCost(locals(res).batchItems))(req, res, next);
    router.post(
      '/',
      validateQuery(estimateBatchQuerySchema),
      validateBody(estimateBatchRequestSchema),
      check,
      quotaUnits((body: EstimateBatchRequest) => body.items.length),
      chargeItems,
      async (req, res) => {
        const { detail } = locals(res).query;
        const answers = await runBatch({ catalog: services.catalog, logger: deps.logger }, organizationOf(res), locals(res).batchItems, detail, () => !req.socket.destroyed);
        res.type('application/json').send(serializeBatch(detail, answers));
      },
    );
    return router;
  },
  docs(registry) {
    registry.registerPath({
      method: 'post',
      path: ESTIMATE_BATCH_PATH,
      tags: ['Calculations'],
      operationId: 'createEstimateBatch',
      security: [{ bearer: [] }],
      summary: `Size up to ${MAX_BATCH_ITEMS} stairs in one call`,
      description:
        `Each item is an estimate request as \`POST /v1/estimates\` takes it, with your \`ref\`; up to ${MAX_BATCH_ITEMS} items, answered ` +
        'synchronously in the order sent. Every item is validated and sized on its own and answers its own result (`status: ok`) or ' +
        'its own problem (`status: error`, with the `code`, `detail` and `errors[].path` a single estimate would have answered): one bad ' +
        'item never fails the others. `summary` counts the items sized and failed, those whose design fails a check, and how often each ' +
        'check fails.\n\n' +
        'Answer size: by default (`detail=summary`) each sized item carries its headline figures, the ids of its failing and warning checks, ' +
        `and \`bomTotal\`; \`detail=full\` adds the whole estimate as \`result\`, up to a ${MAX_BATCH_ANSWER_BYTES}-byte answer (over it: 422 ` +
        '`answer_too_large`). Pricing is that of `POST /v1/estimates` (inline catalog, else the organisation’s stored one, read once per batch). ' +
        `The body may be up to ${BATCH_JSON_BODY_LIMIT}.\n\n` +
        'Limits: the batch uses one unit of the monthly quota per item, and is refused whole (429 `quota_exceeded`, nothing sized, no units ' +
        'used) when that is more than what is left. Against the per-key cost budget it costs the sum of its items’ costs (each as a single ' +
        'estimate; 1 for an item refused by validation), charged before any item runs. Larger sets go to batch jobs (`POST /v1/batches`). ' +
        'Every estimate is from nominal data: mains work is for a licensed electrician, and local codes prevail.',
      request: {
        query: estimateBatchQuerySchema,
        body: { required: true, content: { 'application/json': { schema: estimateBatchRequestSchema } } },
      },
      responses: {
        200: { description: 'One answer per item and the counts.', content: { 'application/json': { schema: estimateBatchResponseSchema } } },
        400: problemResponse(`Malformed JSON, no items or more than ${MAX_BATCH_ITEMS}, or an unknown field of the envelope (\`validation_failed\`); invalid items are answered one by one instead.`),
        401: problemResponse('No or invalid credentials.'),
        403: problemResponse('The key lacks batches:write (embed keys never have it), or the user is not an estimator.'),
        413: problemResponse(`A body over ${BATCH_JSON_BODY_LIMIT} (\`body_too_large\`).`),
        422: problemResponse(`A \`detail=full\` answer over the ${MAX_BATCH_ANSWER_BYTES}-byte ceiling (\`answer_too_large\`): ask for \`detail=summary\`.`),
        429: problemResponse(
          'Rate limit, cost budget or monthly quota reached (`rate_limited`, `cost_budget_exceeded`, `quota_exceeded` — the batch needs one quota unit per item); see Retry-After.',
        ),
      },
    });
  },
};
