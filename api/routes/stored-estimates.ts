import { Router, type Request } from 'express';
import { z } from 'zod';
import { estimateParams, rerunEstimateSchema, runStairSchema, storedEstimateSchema } from '../../shared/schemas/projects.js';
import { organizationOf } from '../auth/principal.js';
import { validateBody } from '../middleware/validate.js';
import { problemResponse } from '../openapi/document.js';
import { costBudget } from '../middleware/cost-budget.js';
import { documentExports, mountExports } from './estimate-exports.js';
import { runStored } from './projects.js';
import type { RouteModule } from './route-module.js';

const estimateId = (req: Request) => String(req.params.estimateId);

/** Stored estimates by id: show one, re-run it, download its hand-over papers. (POST /v1/estimates itself is the stateless sizing call.) */
export const storedEstimateRoutes: RouteModule = {
  basePath: '/v1/estimates',

  router(deps, services) {
    const router = Router();
    const { storedEstimates } = services;

    router.get('/:estimateId', async (req, res) => {
      res.json(await storedEstimates.get(organizationOf(res), estimateId(req)));
    });

    router.post(
      '/:estimateId/rerun',
      validateBody(runStairSchema),
      ...runStored(deps, services, (req, res) => storedEstimates.prepareRerun(organizationOf(res), estimateId(req))),
    );

    mountExports(router, services, costBudget(services, deps.logger));
    return router;
  },

  docs(registry) {
    const security = [{ bearer: [] }];
    const tags = ['Projects'];
    const json = <T extends z.ZodType>(schema: T) => ({ 'application/json': { schema } });
    const notFound = { 404: problemResponse('No such stored estimate in this organisation (`estimate_not_found`).') };

    registry.registerPath({
      method: 'get',
      path: '/v1/estimates/{estimateId}',
      tags,
      operationId: 'getStoredEstimate',
      summary: 'Get a stored estimate',
      description: 'The estimate as it was run: input, the whole result, engine and catalog versions, who ran it, when, and which estimate it re-ran.',
      security,
      request: { params: estimateParams },
      responses: {
        200: { description: 'The stored estimate.', content: json(storedEstimateSchema) },
        401: problemResponse('No or invalid credentials.'),
        403: problemResponse('Needs the viewer role or the projects:read scope (embed keys: never).'),
        ...notFound,
      },
    });
    registry.registerPath({
      method: 'post',
      path: '/v1/estimates/{estimateId}/rerun',
      tags,
      operationId: 'rerunEstimate',
      summary: 'Re-run a stored estimate',
      description:
        'Runs the stored input again with the current engine and catalog, stores the new estimate (`rerunOf` names the old one) and answers it with `changes`: ' +
        'the headline figures old → new (total load, drivers, worst drop, reels, net and gross totals), the engine and catalog versions, and every check whose status changed. ' +
        'Metered and charged as POST /v1/estimates is. Send `Idempotency-Key` to retry safely.',
      security,
      request: {
        params: estimateParams,
        headers: z.object({ 'Idempotency-Key': z.string().max(255).optional().meta({ description: 'Retry safely: the first answer is replayed for 24 h.' }) }),
        body: { required: false, content: json(runStairSchema) },
      },
      responses: {
        201: { description: 'The new stored estimate with what changed; `Location` names it.', content: json(rerunEstimateSchema) },
        400: problemResponse('A body other than `{}` (`validation_failed`).'),
        401: problemResponse('No or invalid credentials.'),
        403: problemResponse('Needs the estimator role or the projects:write scope (embed keys: never).'),
        ...notFound,
        409: problemResponse('A request with this Idempotency-Key is still running.'),
        422: problemResponse('The stored input no longer passes today’s rules (`stored_input_invalid`), the answer would pass the size ceiling (`answer_too_large`), or the Idempotency-Key was reused with another body.'),
        429: problemResponse('Rate limit, cost budget or monthly quota reached (`rate_limited`, `cost_budget_exceeded`, `quota_exceeded`); see Retry-After.'),
      },
    });
    documentExports(registry);
  },
};
