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
