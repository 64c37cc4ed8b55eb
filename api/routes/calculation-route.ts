import type { OpenAPIRegistry } from '@asteasolutions/zod-to-openapi';
import type { Router } from 'express';
import type { z } from 'zod';
import { validateBody } from '../middleware/validate.js';
import { problemResponse } from '../openapi/document.js';

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

/** Mounts `POST <path>` on the router: parse → compute → answer. */
export function mountCalculation(router: Router, basePath: string, calc: AnyCalculation): void {
  router.post(calc.path.slice(basePath.length) || '/', validateBody(calc.request), (_req, res) => {
    res.json(calc.compute(res.locals.body));
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
      429: problemResponse('Rate limit or monthly quota reached (`rate_limited`, `quota_exceeded`); see Retry-After.'),
    },
  });
}
