import { z } from 'zod';

export const SCOPE_VALUES = [
  'sizing:run',
  'projects:read',
  'projects:write',
  'catalog:read',
  'catalog:write',
  'batches:write',
  'usage:read',
  'keys:manage',
] as const;

export const scopeSchema = z.enum(SCOPE_VALUES).meta({ id: 'Scope', description: 'What a key may do.' });

const originPattern = z
  .string()
  .max(253)
  .regex(/^https?:\/\/(\*\.)?[a-z0-9-]+(\.[a-z0-9-]+)*(:\d{1,5})?$/, 'an origin like https://shop.example.test or https://*.example.test')
  // A wildcard needs a registrable domain under it: https://*.test would open the key to a whole TLD.
  .refine((o) => !o.includes('*.') || /^https?:\/\/\*\.[a-z0-9-]+\.[a-z0-9-]+/.test(o), 'a wildcard needs at least two labels after "*." (https://*.example.test)')
  .meta({ example: 'https://shop.harborlane.test' });

export const createApiKeyRequestSchema = z
  .object({
    name: z.string().trim().min(1).max(100).meta({ description: 'What the key is for.', example: 'Product pages' }),
    kind: z.enum(['secret', 'publishable']).default('secret').meta({
      description: '`secret` (tw_sec_…) for servers; `publishable` (tw_pub_…) for browser pages, sizing only, from its allowed origins.',
    }),
    scopes: z.array(scopeSchema).min(1).max(8).optional().meta({
      description: 'Defaults to ["sizing:run"]. Never more than the creator holds; publishable keys get only sizing:run.',
    }),
    allowedOrigins: z.array(originPattern).max(20).optional().meta({
      description: 'Publishable keys only (required there): page origins allowed to use the key; one leading `*.` label matches sub-domains.',
    }),
    expiresAt: z.iso.datetime({ offset: true }).nullable().optional().meta({ description: 'When the key stops working; none by default.' }),
  })
  .superRefine((v, ctx) => {
    if (v.kind === 'publishable') {
      if (!v.allowedOrigins?.length) ctx.addIssue({ code: 'custom', path: ['allowedOrigins'], message: 'a publishable key needs at least one allowed origin' });
      if (v.scopes && v.scopes.some((s) => s !== 'sizing:run')) ctx.addIssue({ code: 'custom', path: ['scopes'], message: 'publishable keys may only have sizing:run' });
    } else if (v.allowedOrigins?.length) {
      ctx.addIssue({ code: 'custom', path: ['allowedOrigins'], message: 'only publishable keys have allowed origins' });
    }
  })
  .meta({
    id: 'CreateApiKeyRequest',
    example: { name: 'Product pages', kind: 'publishable', allowedOrigins: ['https://shop.harborlane.test'] },
  });

export const rollApiKeyRequestSchema = z
  .object({
    gracePeriodSeconds: z
      .int()
      .min(0)
      .max(7 * 24 * 3600)
      .default(24 * 3600)
      .meta({ description: 'How long the old secret keeps working (0 to 7 days; default 1 day).', example: 3600 }),
  })
  .meta({ id: 'RollApiKeyRequest' });

export const apiKeySchema = z
  .object({
    id: z.uuid(),
    keyId: z.string().meta({ description: 'Public part of the key, shown in logs and usage.', example: 'q7m2x4kd9fhp' }),
    kind: z.enum(['secret', 'publishable']),
    name: z.string(),
    scopes: z.array(z.string()),
    allowedOrigins: z.array(z.string()),
    expiresAt: z.string().nullable(),
    lastUsedAt: z.string().nullable(),
    revokedAt: z.string().nullable(),
    previousSecretValidUntil: z.string().nullable().meta({ description: 'After a roll: until when the old secret still works.' }),
    createdAt: z.string(),
    status: z.enum(['active', 'expired', 'revoked']),
  })
  .meta({ id: 'ApiKey', description: 'An API key as listed; the secret is never shown again after creation or roll.' });

export const apiKeyWithTokenSchema = z
  .object({
    key: apiKeySchema,
    token: z.string().meta({
      description: 'The whole key — shown only in this response. Store it now.',
      example: 'tw_pub_q7m2x4kd9fhp_3d7Kc0yZ1rT9bQw2aXv8nLm4pE6sH5uJ',
    }),
  })
  .meta({ id: 'ApiKeyWithToken' });

export const apiKeyPageSchema = z
  .object({ data: z.array(apiKeySchema), hasMore: z.boolean(), nextCursor: z.string().nullable() })
  .meta({ id: 'ApiKeyPage' });

export type CreateApiKeyRequest = z.output<typeof createApiKeyRequestSchema>;
