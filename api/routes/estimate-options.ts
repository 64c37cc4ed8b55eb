import { Router, type RequestHandler, type Response } from 'express';
import type { Catalog } from '../../shared/schemas/catalog.js';
import { kitOptionsRequestSchema, kitOptionsResponseSchema, type KitOptionsInput } from '../../shared/schemas/estimate-options.js';
import { planCandidates, rankKitOptions } from '../../shared/sizing/options/options.js';
import type { PricingSource } from '../../shared/sizing/options/pricing.js';
import { MAX_ANSWER_BYTES } from '../../shared/tables/limits.js';
import { MAX_OPTION_CANDIDATES } from '../../shared/tables/option-limits.js';
import { organizationOf } from '../auth/principal.js';
import { costBudget } from '../middleware/cost-budget.js';
import { validateBody } from '../middleware/validate.js';
import { problemResponse } from '../openapi/document.js';
import { HttpProblem } from '../problem.js';
import type { Services } from '../services/container.js';
import { serializeAnswer } from './calculation-route.js';
import type { RouteModule } from './route-module.js';
import { CATALOG_ITEMS_PER_UNIT } from './sizing-costs.js';

const PATH = '/v1/estimates/options';

interface OptionsLocals {
  body: KitOptionsInput;
  optionsCatalog: { catalog: Catalog; source: PricingSource };
}
const locals = (res: Response) => res.locals as unknown as OptionsLocals;

/**
 * The catalog the kits come from: the request's inline one, else the organisation's stored one
 * (its active items only: a retired SKU is never picked).
 */
async function catalogFor(services: Services, res: Response): Promise<OptionsLocals['optionsCatalog']> {
  const body = locals(res).body;
  if (body.catalog) return { catalog: body.catalog, source: { source: 'inline', catalogVersion: null } };
  const stored = await services.catalog.pricingCatalog(organizationOf(res));
  if (!stored) {
    throw new HttpProblem(
      422,
      'catalog_empty',
      'No catalog to build kits from',
      'The organisation’s catalog has no active items. Import one (POST /v1/catalog/imports) or send an inline `catalog` with the request.',
    );
  }
  return { catalog: stored.catalog, source: { source: 'stored', catalogVersion: stored.version } };
}

/**
 * Work units of one search: 1 per call and per 10 catalog items read, and for every candidate
 * sized what an estimate of the stair costs without its catalog (1 + treads + lit landings).
 */
export function kitOptionsCost(input: KitOptionsInput, catalog: Catalog): number {
  const perCandidate = 1 + input.staircase.treads + (input.staircase.litLandings?.length ?? 0);
  const candidates = Math.min(planCandidates(input, catalog).candidates.length, MAX_OPTION_CANDIDATES);
  return 1 + Math.ceil(catalog.items.length / CATALOG_ITEMS_PER_UNIT) + candidates * perCandidate;
}

export const estimateOptionRoutes: RouteModule = {
  basePath: PATH,
  router(deps, services) {
    const router = Router();
    const charge = costBudget(services, deps.logger);
    const loadCatalog: RequestHandler = async (_req, res, next) => {
      locals(res).optionsCatalog = await catalogFor(services, res);
      next();
    };
    // The cost is known only once the catalog is: charged per request, before any candidate runs.
    const chargeCandidates: RequestHandler = (req, res, next) => {
      const { catalog } = locals(res).optionsCatalog;
      return charge(() => kitOptionsCost(locals(res).body, catalog))(req, res, next);
    };
    router.post('/', validateBody(kitOptionsRequestSchema), loadCatalog, chargeCandidates, (_req, res) => {
      const { catalog, source } = locals(res).optionsCatalog;
      res.type('application/json').send(serializeAnswer(rankKitOptions(locals(res).body, catalog, source)));
    });
    return router;
  },
  docs(registry) {
    registry.registerPath({
      method: 'post',
      path: PATH,
      tags: ['Calculations'],
      operationId: 'rankKitOptions',
      security: [{ bearer: [] }],
      summary: 'Rank priced kits for a stair from the catalog',
      description:
        'Tries the catalog’s compatible choices for a stair — every active CV strip the constraints allow (SKUs, voltages, power per metre), ' +
        'every controller with CV outputs, the controller at the bottom, middle or top and the drivers at the bottom, middle or top — ' +
        'sizes each as a full estimate and answers the cheapest designs that pass every check (`limit`, default 3), each with its ' +
        'pricing (net, tax, gross), summary, cart, warnings and the `estimateRequest` that sizes it in full. Also answers how many ' +
        'candidates were sized, how many failed and on which checks (`failuresByCheck`), how many passed but cost more than the ' +
        '`budget`, and the catalog items left out before sizing (`pruned`: no cut pitch, no driver at the strip’s voltage).\n\n' +
        'Prices come from the inline `catalog`, else from the organisation’s stored catalog (active items; `catalogVersion` says which). ' +
        `At most ${MAX_OPTION_CANDIDATES} candidates are sized, the cheapest parts first (\`capped\` says when more were possible). ` +
        'Each call costs, against the per-key cost budget, 1 + 1 per 10 catalog items + (1 + treads + lit landings) per candidate sized. ' +
        'Every kit is an estimate from nominal data: mains work is for a licensed electrician, and local codes prevail.',
      request: { body: { required: true, content: { 'application/json': { schema: kitOptionsRequestSchema } } } },
      responses: {
        200: { description: 'The ranked designs, and what the other candidates failed on.', content: { 'application/json': { schema: kitOptionsResponseSchema } } },
        400: problemResponse('Malformed JSON or input outside the schema (`code: validation_failed`, with `errors[].path`).'),
        401: problemResponse('No or invalid credentials.'),
        403: problemResponse('The key lacks sizing:run, its origin is not allowed, or the user is not an estimator.'),
        422: problemResponse(
          `No inline catalog and no active item in the stored one (\`catalog_empty\`), or an answer over the ${MAX_ANSWER_BYTES}-byte ceiling (\`answer_too_large\`).`,
        ),
        429: problemResponse('Rate limit, cost budget or monthly quota reached (`rate_limited`, `cost_budget_exceeded`, `quota_exceeded`); see Retry-After.'),
      },
    });
  },
};
