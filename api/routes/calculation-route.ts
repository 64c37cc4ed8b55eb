import type { OpenAPIRegistry } from '@asteasolutions/zod-to-openapi';
import type { RequestHandler, Router } from 'express';
import type { z } from 'zod';
import { MAX_ANSWER_BYTES } from '../../shared/tables/limits.js';
import { serializeAnswer } from '../answer.js';
import { validateBody } from '../middleware/validate.js';
import { problemResponse } from '../openapi/document.js';

export { serializeAnswer };

/** One stateless sizing endpoint: a request schema, a pure engine function, a response schema. */
export interface Calculation<Req extends z.ZodType, Res extends z.ZodType> {
  path: string;
  /** camelCase name of the operation, for generated clients. */
  operationId: string;
  summary: string;
  description: string;
  request: Req;
  response: Res;
  compute(input: z.output<Req>): z.output<Res>;
  /** Work units the call costs against the per-key cost budget, from the validated body. Default 1. */
  cost?(input: z.output<Req>): number;
  /** Replaces the standard closing paragraph of the description. */
  notes?: string;
}

/** Type-checked at definition, erased for the list the router walks. */
export type AnyCalculation = Calculation<z.ZodType, z.ZodType>;
export function defineCalculation<Req extends z.ZodType, Res extends z.ZodType>(calc: Calculation<Req, Res>): AnyCalculation {
  return calc as unknown as AnyCalculation;
}

const CALCULATION_NOTES =
  '\n\nA design that breaks a limit is still a 200: the response says so in its flags and `warnings`. ' +
  'Only malformed or impossible input is a 400, with `errors[].path` naming each field. ' +
  'Every response carries `engineVersion` and a `trace` of how each headline number was derived.';

/** Charges a call's cost to the caller's budget before the engine runs (api/middleware/cost-budget.ts). */
export type CostCharger = (costOf: (body: never) => number) => RequestHandler;

const ONE_UNIT = () => 1;

/** Runs the engine and records its time (api/metrics); the identity when nothing records. */
export type EngineTimer = <T>(operation: string, work: () => T) => T;
const untimed: EngineTimer = (_operation, work) => work();

/** Mounts `POST <path>` on the router: parse → charge its cost → compute → answer. */
export function mountCalculation(router: Router, basePath: string, calc: AnyCalculation, charge: CostCharger, time: EngineTimer = untimed): void {
  router.post(calc.path.slice(basePath.length) || '/', validateBody(calc.request), charge(calc.cost ?? ONE_UNIT), (_req, res) => {
    res.type('application/json').send(serializeAnswer(time(calc.path.slice(calc.path.lastIndexOf('/') + 1), () => calc.compute(res.locals.body))));
  });
}

export function documentCalculation(registry: OpenAPIRegistry, calc: AnyCalculation): void {
  registry.registerPath({
    method: 'post',
    path: calc.path,
    tags: ['Calculations'],
    operationId: calc.operationId,
    security: [{ bearer: [] }],
    summary: calc.summary,
    description: calc.description + (calc.notes ?? CALCULATION_NOTES),
    request: { body: { required: true, content: { 'application/json': { schema: calc.request } } } },
    responses: {
      200: { description: 'The result, with warnings, engineVersion and trace.', content: { 'application/json': { schema: calc.response } } },
      400: problemResponse('Malformed JSON or input outside the schema (`code: validation_failed`, with `errors[].path`).'),
      401: problemResponse('No or invalid credentials.'),
      403: problemResponse('The key lacks sizing:run, its origin is not allowed, or the user is not an estimator.'),
      422: problemResponse(`A valid design whose answer would pass the ${MAX_ANSWER_BYTES}-byte ceiling (\`answer_too_large\`): size it in parts.`),
      429: problemResponse(
        'Rate limit, cost budget or monthly quota reached (`rate_limited`, `cost_budget_exceeded`, `quota_exceeded`); see Retry-After. ' +
          'The cost budget counts work units per key and minute: 1 per call, plus 1 per tread or lit landing, per 10 pixels, per 10 catalog items and per reel piece sized (the "cost" entry of RateLimit-Policy).',
      ),
    },
  });
}
