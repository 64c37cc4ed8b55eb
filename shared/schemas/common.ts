import { z } from 'zod';

export const traceEntrySchema = z
  .object({
    quantity: z.string(),
    value: z.union([z.number(), z.string(), z.boolean()]),
    unit: z.string(),
    formula: z.string(),
    inputs: z.record(z.string(), z.union([z.number(), z.string(), z.boolean(), z.null()])),
    reference: z.string(),
  })
  .meta({ id: 'TraceEntry', description: 'How one headline number was derived.' });

export const warningSchema = z
  .object({ code: z.string(), message: z.string() })
  .meta({ id: 'Warning', description: 'A limit reached or a default assumed.' });

export const engineVersionSchema = z.string().meta({ description: 'Semver of the sizing engine that produced the result.' });

/**
 * On answers of creating POSTs: the request that made the thing. A replay of an
 * `Idempotency-Key` request answers the first response byte for byte, so it carries the first
 * call's id, which tells a client it got a replay.
 */
export const createdByRequestIdSchema = z
  .string()
  .meta({ description: 'The X-Request-Id of the request that created this; on an Idempotency-Key replay, the first call’s.', example: '5f0c9a1e-2b7d-4c3e-9a51-0d8e6f4b2a10' });

/**
 * `?trace=false` on the sizing routes: the answer's `trace` comes back empty. For callers that only
 * want the figures (a checkout re-pricing a basket); the figures themselves are the same.
 */
export const traceQuerySchema = z
  .strictObject({
    trace: z
      .enum(['true', 'false'])
      .default('true')
      .meta({ description: '`false`: answer with an empty `trace` (the figures are unchanged), a smaller and quicker answer. Default `true`.' }),
  })
  .meta({ id: 'TraceQuery' });
export type TraceQuery = z.output<typeof traceQuerySchema>;
