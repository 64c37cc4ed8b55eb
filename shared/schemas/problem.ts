import { z } from 'zod';

/** RFC 9457 problem details, with Treadwise's extension members. */
export const problemSchema = z
  .object({
    type: z.string().meta({ description: 'URI naming the kind of problem.' }),
    title: z.string(),
    status: z.number().int(),
    detail: z.string().optional(),
    instance: z.string().optional(),
    code: z.string().meta({ description: 'Stable snake_case code to branch on.', example: 'validation_failed' }),
    requestId: z.string().optional().meta({ description: 'Same as the X-Request-Id response header.' }),
    errors: z
      .array(z.object({ path: z.string(), message: z.string() }))
      .optional()
      .meta({ description: 'Field errors, for validation problems.' }),
  })
  .meta({
    id: 'Problem',
    description: 'RFC 9457 problem details (application/problem+json).',
    example: {
      type: 'https://treadwise.test/problems/validation-failed',
      title: 'Invalid request',
      status: 400,
      detail: 'The request does not match the schema.',
      instance: '/v1/calculations/voltage-drop',
      code: 'validation_failed',
      requestId: '5f0c9a1e-2b7d-4c3e-9a51-0d8e6f4b2a10',
      errors: [{ path: 'lengthM', message: 'Too small: expected number to be >0' }],
    },
  });

export type Problem = z.infer<typeof problemSchema>;
