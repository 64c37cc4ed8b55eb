import { Router } from 'express';
import { estimateRequestSchema, estimateResponseSchema } from '../../shared/schemas/estimate.js';
import { estimate } from '../../shared/sizing/estimate/estimate.js';
import { defineCalculation, documentCalculation, serializeAnswer, validateTraceQuery, withTrace } from './calculation-route.js';
import { validateBody } from '../middleware/validate.js';
import { organizationOf } from '../auth/principal.js';
import { estimateCost } from './sizing-costs.js';
import { costBudget } from '../middleware/cost-budget.js';
import type { RouteModule } from './route-module.js';

const BASE = '/v1/estimates';

const estimateCalculation = defineCalculation({
  path: BASE,
  operationId: 'createEstimate',
  summary: 'Size a whole stair or corridor',
  description:
    'The complete estimate for one of four layouts — `tread-strips` (a constant-voltage strip on each tread, ' +
    'one controller output per tread), `rail-pixels` (an addressable run along a handrail or wall), ' +
    '`treads-and-rail` (both, the rail grouped two pixel groups per tread) and `tread-pixels` (an addressable ' +
    'segment per tread, chained tread to tread). Returns per-tread rows (strip length, load, output, cable run, ' +
    'size and drop), outputs, drivers per rail voltage, the feeder, pixel data, reels, sensors, the bill of ' +
    'materials, `checks` with a concrete suggestion on every failure, and `cautions`.\n\n' +
    'Pricing: with an inline `catalog` the estimate is priced from it; without one, from the organisation’s stored catalog ' +
    '(its active items; `useStoredCatalog: false` opts out). A priced answer carries `pricing` (which catalog and version, ' +
    'net, tax and gross), `cart` (`[{ sku, quantity, unitPrice }]`, the lines a shop’s basket takes) and `currency`; ' +
    'a line the catalog cannot fill names the kind and fields it needs in `missing`. Drivers are picked one per circuit, ' +
    'the cheapest single active driver that meets the loading rule (and Class 2 when asked), never paralleled.',
  notes:
    '\n\nA design that breaks a limit is a 200 whose `checks` say what fails and what to change. Malformed or ' +
    'impossible input (negative treads, an unknown layout, a missing block) is a 400 with `errors[].path`. ' +
    'Every response carries `engineVersion` and a `trace` of how each headline number was derived.',
  request: estimateRequestSchema,
  response: estimateResponseSchema,
  compute: estimate,
  cost: estimateCost,
});

export const estimateRoutes: RouteModule = {
  basePath: BASE,
  router(deps, services) {
    const router = Router();
    const charge = costBudget(services, deps.logger);
    router.post('/', validateTraceQuery, validateBody(estimateRequestSchema), charge(estimateCost as (body: never) => number), async (_req, res) => {
      const result = await services.pricedEstimates.run(organizationOf(res), res.locals.body);
      res.type('application/json').send(serializeAnswer(withTrace(result, res)));
    });
    return router;
  },
  docs(registry) {
    documentCalculation(registry, estimateCalculation);
  },
};
